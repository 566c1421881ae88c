import { DEFAULT_DELIVERY_PROFILE } from '@psiform/contracts';
import { prettyLabel } from '@psiform/orbitals';
import { describe, expect, it } from 'vitest';
import { attachmentDisposition, FILE_NAME_MAX, fileFieldsFor, fileNameFor, slug } from '../src';

// The template language is the delivery profile's (libs/contracts print.ts FILE_NAME_TOKENS).
const FIGURE_LABEL_SIZE_DPI = '{figure}_{label}_{widthMm}x{heightMm}mm_{dpi}dpi';

describe('fileNameFor: files named from the figure through the delivery profile template', () => {
  it('a print PNG: figure title up to the colon, label, size and dpi', () => {
    expect(fileNameFor({ figure: 'Plate 4.7: the 3d_z² orbital', label: prettyLabel('3dz2'), format: 'png', widthMm: 180, heightMm: 120, dpi: 600 }, FIGURE_LABEL_SIZE_DPI)).toBe('plate-4-7_3dz2_180x120mm_600dpi.png');
  });
  it('the default template (delivery profile default) puts the publication first', () => {
    expect(DEFAULT_DELIVERY_PROFILE.fileNameTemplate).toContain('{publication}');
    expect(fileNameFor({ publication: 'Shells and Lobes', figure: 'Plate 4.7', label: '3d_z²', format: 'png', widthMm: 89, heightMm: 60, dpi: 300 })).toBe('shells-and-lobes_plate-4-7_3dz2_89x60mm_300dpi.png');
  });
  it('segments whose words have no value drop out with their separator: meshes have no size, vector files no dpi', () => {
    expect(fileNameFor({ figure: 'Plate 4.7', label: '2p_x', format: 'glb' }, FIGURE_LABEL_SIZE_DPI)).toBe('plate-4-7_2px.glb');
    expect(fileNameFor({ figure: 'Plate 4.7', label: '2p(m=+1)', format: 'svg', part: 'section xz', widthMm: 88.5, heightMm: 60 }, FIGURE_LABEL_SIZE_DPI)).toBe('plate-4-7_2p-mplus1_88.5x60mm_section-xz.svg');
    expect(fileNameFor({ figure: 'Plate 4.7', label: '2p(m=-1)', format: 'glb' }, FIGURE_LABEL_SIZE_DPI)).toBe('plate-4-7_2p-mminus1.glb');
    expect(fileNameFor({ figure: 'Plate 4.7', label: 'sp³ #2', format: 'bundle', part: 'bundle' }, FIGURE_LABEL_SIZE_DPI)).toBe('plate-4-7_sp3-2_bundle.zip');
  });
  it('two different files of one figure never share a name, whatever the template', () => {
    const base = { figure: 'Plate 4.7', label: '3d_z²', format: 'svg' as const, widthMm: 89, heightMm: 60 };
    expect(fileNameFor({ ...base, part: 'radial' }, '{figure}')).not.toBe(fileNameFor({ ...base, part: 'section-xz' }, '{figure}'));
  });
  it('a publication can bring its own template with {kind}, {version} and {colour}', () => {
    expect(fileNameFor({ figure: 'Fig. 12', label: '4f_xyz', format: 'png', widthMm: 85, heightMm: 60, dpi: 1200, version: 3, colour: 'rgb' }, 'ch04-{figure}-{version}_{dpi}dpi_{colour}')).toBe('ch04-fig-12-v3_1200dpi_rgb.png');
    expect(fileNameFor({ figure: 'Fig. 12', format: 'svg', part: 'radial' }, '{figure}_{kind}')).toBe('fig-12_radial.svg');
  });
  it('only safe characters, never a folder, bounded length', () => {
    const n = fileNameFor({ figure: 'Ångström scale / "quoted" \\ ../../etc', label: '3d_x²−y²', format: 'png', widthMm: 89, heightMm: 60, dpi: 300 }, FIGURE_LABEL_SIZE_DPI);
    expect(n).toMatch(/^[a-z0-9._-]+\.png$/);
    expect(n).toBe('angstrom-scale-quoted-etc_3dx2-y2_89x60mm_300dpi.png');
    const long = fileNameFor({ figure: 'x'.repeat(500), label: 'y'.repeat(500), format: 'png' }, '{figure}{figure}{figure}{label}{label}{label}');
    expect(long.length).toBeLessThanOrEqual(FILE_NAME_MAX + 4);
    expect(fileNameFor({ figure: '???', format: 'stl' }, '{figure}')).toBe('figure.stl');
  });
  it('unknown words are refused', () => {
    expect(() => fileNameFor({ figure: 'a', format: 'png' }, '{figure}_{nope}')).toThrow(/unknown words \{nope\}/);
  });
  it('slug folds accents and scripts to ASCII', () => {
    expect(slug('Li²⁺ Ångström')).toBe('li2-angstrom');
  });
  it('Content-Disposition: attachment with an ASCII name and the UTF-8 form (RFC 6266, RFC 8187)', () => {
    expect(attachmentDisposition('plate-4-7_3dz2.png')).toBe(`attachment; filename="plate-4-7_3dz2.png"; filename*=UTF-8''plate-4-7_3dz2.png`);
  });
});

describe('fileFieldsFor: the name fields of a stored file from its kind and stats', () => {
  const t = FIGURE_LABEL_SIZE_DPI;
  const fig = { figure: 'Plate 4.7: the 3d_z² orbital', label: '3d_z²' };
  it('a print PNG, a thumbnail, the two SVG companions, a bundle and meshes all get different, telling names', () => {
    const names = [
      fileNameFor({ ...fig, ...fileFieldsFor('png', { widthPx: 4252, heightPx: 2835, widthMm: 180, heightMm: 120, dpi: 600 }) }, t),
      fileNameFor({ ...fig, ...fileFieldsFor('png', { thumbnail: true, widthPx: 320, heightPx: 240, dpi: 96 }) }, t),
      fileNameFor({ ...fig, ...fileFieldsFor('svg', { svg: 'radial', widthMm: 89, heightMm: 60 }) }, t),
      fileNameFor({ ...fig, ...fileFieldsFor('svg', { svg: 'section', plane: 'xz', widthMm: 89, heightMm: 60 }) }, t),
      fileNameFor({ ...fig, ...fileFieldsFor('bundle', { files: [] }) }, t),
      fileNameFor({ ...fig, ...fileFieldsFor('glb', {}) }, t),
      fileNameFor({ ...fig, ...fileFieldsFor('stl', null) }, t),
    ];
    expect(names).toEqual([
      'plate-4-7_3dz2_180x120mm_600dpi.png',
      'plate-4-7_3dz2_thumbnail.png',
      'plate-4-7_3dz2_89x60mm_radial.svg',
      'plate-4-7_3dz2_89x60mm_section-xz.svg',
      'plate-4-7_3dz2_bundle.zip',
      'plate-4-7_3dz2.glb',
      'plate-4-7_3dz2.stl',
    ]);
    expect(() => fileFieldsFor('mystery', {})).toThrow(/kind "mystery"/);
  });
});
