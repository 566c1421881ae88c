import { prettyLabel } from '@psiform/orbitals';
import { describe, expect, it } from 'vitest';
import { attachmentDisposition, DEFAULT_FILE_NAME_TEMPLATE, FILE_NAME_MAX, fileNameFor, slug, templateProblem } from '../src';

describe('fileNameFor: files named from the figure through one template', () => {
  it('a print PNG: title up to the colon, label, size and dpi', () => {
    expect(fileNameFor({ title: 'Plate 4.7: the 3d_z² orbital', label: prettyLabel('3dz2'), format: 'png', widthMm: 180, heightMm: 120, dpi: 600 })).toBe('plate-4-7_3dz2_180x120mm_600dpi.png');
  });
  it('empty placeholders drop out with their separator: meshes have no size, vector files no dpi', () => {
    expect(fileNameFor({ title: 'Plate 4.7', label: '2p_x', format: 'glb' })).toBe('plate-4-7_2px.glb');
    expect(fileNameFor({ title: 'Plate 4.7', label: '2p(m=+1)', format: 'svg', part: 'section xz', widthMm: 88.5, heightMm: 60 })).toBe('plate-4-7_2p-mplus1_section-xz_88.5x60mm.svg');
    expect(fileNameFor({ title: 'Plate 4.7', label: '2p(m=-1)', format: 'glb' })).toBe('plate-4-7_2p-mminus1.glb');
    expect(fileNameFor({ title: 'Plate 4.7', label: 'sp³ #2', format: 'bundle', part: 'bundle' })).toBe('plate-4-7_sp3-2_bundle.zip');
  });
  it('a publication can bring its own template (a plain value)', () => {
    expect(fileNameFor({ title: 'Fig. 12', label: '4f_xyz', format: 'png', widthMm: 85, heightMm: 60, dpi: 1200, version: 3 }, 'ch04-{title}-{version}_{dpi}')).toBe('ch04-fig-12-v3_1200dpi.png');
  });
  it('only safe characters, never a folder, bounded length', () => {
    const n = fileNameFor({ title: 'Ångström scale / "quoted" \\ ../../etc', label: '3d_x²−y²', format: 'png', widthMm: 89, heightMm: 60, dpi: 300 });
    expect(n).toMatch(/^[a-z0-9._-]+\.png$/);
    expect(n).toBe('angstrom-scale-quoted-etc_3dx2-y2_89x60mm_300dpi.png');
    const long = fileNameFor({ title: 'x'.repeat(500), label: 'y'.repeat(500), format: 'png' }, '{title}{title}{title}{label}{label}{label}');
    expect(long.length).toBeLessThanOrEqual(FILE_NAME_MAX + 4);
    expect(fileNameFor({ title: '???', format: 'stl' })).toBe('figure.stl');
  });
  it('bad templates are refused with the reason', () => {
    expect(templateProblem(DEFAULT_FILE_NAME_TEMPLATE)).toBeNull();
    expect(templateProblem('{title}_{colour}')).toMatch(/unknown placeholders \{colour\}/);
    expect(templateProblem('{size}_{dpi}')).toMatch(/\{title\} or \{label\}/);
    expect(templateProblem('../{title}')).toMatch(/must not contain/);
    expect(() => fileNameFor({ title: 'a', format: 'png' }, '{nope}')).toThrow(/file-name template/);
  });
  it('slug folds accents and scripts to ASCII', () => {
    expect(slug('Li²⁺ Ångström')).toBe('li2-angstrom');
  });
  it('Content-Disposition: attachment with an ASCII name and the UTF-8 form (RFC 6266, RFC 8187)', () => {
    expect(attachmentDisposition('plate-4-7_3dz2.png')).toBe(`attachment; filename="plate-4-7_3dz2.png"; filename*=UTF-8''plate-4-7_3dz2.png`);
  });
});
