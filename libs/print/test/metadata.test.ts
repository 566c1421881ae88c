import { recipeSchema, type Recipe } from '@psiform/contracts';
import { recipeToSurfaces, summariseSurfaces } from '@psiform/meshing';
import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { strFromU8, unzipSync } from 'fflate';
import { beforeAll, describe, expect, it } from 'vitest';
import { ALT_TEXT_MAX, MODEL_NOTE, buildBundle, encodeRgbaPng, figureMetadata, ionName, metadataSheetText, readPngInfo, shapeDescription, shortAltText, type MeshResultLike, type RecipeLike } from '../src';

const GENERATED = '2031-04-02T09:30:00.000Z';

function recipeFor(terms: Recipe['content']['terms'], Z: number, n: number, label?: string): Recipe {
  return recipeSchema.parse({ version: 1, label, content: { Z, terms }, grid: { n, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } });
}

/** Runs the real pipeline on a small grid and keeps its summary, as the worker's job JSON does. */
async function resultFor(recipe: Recipe): Promise<MeshResultLike> {
  return summariseSurfaces(await recipeToSurfaces(recipe));
}

const dxy = [{ n: 3, l: 2, m: -2, basis: 'real' as const, re: 1, im: 0 }];

describe('figureMetadata', () => {
  const recipe = recipeFor(dxy, 1, 40);
  const recipeLike: RecipeLike = recipe; // the contracts Recipe fits the structural type (compile-time check)
  let result: MeshResultLike;
  let meta: ReturnType<typeof figureMetadata>;
  beforeAll(async () => {
    result = await resultFor(recipe);
    meta = figureMetadata({ recipe: recipeLike, result, engineVersion: '0.1.0', palette: recipe.palette, generatedAt: GENERATED });
  });

  it('caption in plain words with label, Z, rule, colouring and grid', () => {
    expect(meta.label).toBe('3d_xy');
    // Plain text carries no underscore: the typesetter writes 3d_xy as 3dxy where there is no markup.
    expect(meta.caption).toBe('Isosurface of the hydrogen-like 3dxy orbital (Z = 1) enclosing 90% of the probability over all space; lobes coloured by the sign of ψ. Computed on a 40³ grid.');
    expect(meta.warnings).toEqual([]);
  });
  it('alt text in two parts: short (≤ 125 characters) and a long description of the d_xy cloverleaf; model note present', () => {
    expect(meta.altText).toBe('3D isosurface of the 3dxy orbital: a four-lobed cloverleaf (xy).');
    expect(meta.altText.length).toBeLessThanOrEqual(ALT_TEXT_MAX);
    expect(meta.longDescription).toMatch(/^Four-lobed cloverleaf in the xy plane, lobes pointing between the x and y axes/);
    expect(meta.longDescription).toContain(meta.caption);
    expect(meta.model.note).toBe(MODEL_NOTE);
    expect(MODEL_NOTE).toBe('Shapes are those of the one-electron hydrogen-like model; orbitals of many-electron atoms differ.');
  });
  it('records the achieved enclosed fraction (0.9 over all space, with its error), grid spacing and extent in a0 and Å (a0 = 0.529177210903 Å, CODATA 2018)', () => {
    expect(meta.surface.target).toBe(0.9);
    expect(meta.surface.enclosedAchieved).toBe(result.enclosed);
    expect(Math.abs(meta.surface.enclosedAchieved - 0.9)).toBeLessThan(meta.surface.enclosedError! + 1e-12);
    expect(meta.surface.enclosedOver).toBe('all space');
    expect(meta.surface.enclosedInBox).toBe(meta.surface.enclosedAchieved);
    expect(meta.grid.n).toBe(40);
    expect(meta.grid.mode).toBe('fixed');
    expect(meta.grid.requestedExtent).toBe('auto');
    expect(meta.grid.spacingBohr).toBeCloseTo((2 * result.grid.extent) / 39, 12);
    expect(meta.grid.extentAngstrom).toBeCloseTo(result.grid.extent * 0.529177210903, 12);
    expect(meta.terms).toEqual([{ n: 3, l: 2, m: -2, subshell: '3d', basis: 'real', coefficient: { re: 1, im: 0 }, label: '3d_xy' }]);
    expect(meta.surfaces.map((s) => s.phase).sort()).toEqual(['+', '-']);
    expect(meta.engineVersion).toBe('0.1.0');
    expect(meta.palette.positive).toBe('#1f5e5b'); // Psiform's default verdigris (contracts PSIFORM_PALETTE)
  });
  it('ion names for one-electron ions: H, He⁺, Li²⁺, Be³⁺, C⁵⁺, Ne⁹⁺, Zn²⁹⁺ (charge Z − 1; symbols from memory)', async () => {
    expect([1, 2, 3, 4, 6, 10, 30].map(ionName)).toEqual(['H', 'He⁺', 'Li²⁺', 'Be³⁺', 'C⁵⁺', 'Ne⁹⁺', 'Zn²⁹⁺']);
    expect(ionName(50)).toBe('hydrogen-like ion, Z = 50');
    const he = figureMetadata({ recipe: recipeFor([{ n: 1, l: 0, m: 0, basis: 'real', re: 1, im: 0 }], 2, 16), result: await resultFor(recipeFor([{ n: 1, l: 0, m: 0, basis: 'real', re: 1, im: 0 }], 2, 16)), engineVersion: 'x', palette: {positive: '#000000', negative: '#ffffff'}, generatedAt: GENERATED });
    expect(he.nucleus).toEqual({ Z: 2, name: 'He⁺' });
    expect(he.caption).toContain('1s orbital (Z = 2)');
  });
  it('complex states are coloured by phase; psi rule caption names the level and the enclosed share', async () => {
    const r = recipeSchema.parse({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 1, basis: 'complex', re: 1 }] }, grid: { n: 24 }, surface: { rule: 'psi', value: 0.02 } });
    const res = await resultFor(r);
    const m = figureMetadata({ recipe: r, result: res, engineVersion: '0.1.0', palette: r.palette, generatedAt: GENERATED });
    expect(m.surface.phaseColouring).toBe('argument');
    expect(m.caption).toContain('at |ψ| = 0.0200');
    expect(m.caption).toContain('coloured by the phase of ψ');
    expect(m.altText).toMatch(/ring around the z axis/);
    expect(m.longDescription).toMatch(/ring-shaped/);
  });
  it('shape words by l and m', () => {
    expect(shapeDescription({ Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1, im: 0 }] })).toMatch(/^Two lobes of opposite sign along the z axis.*nodal xy plane/);
    expect(shapeDescription({ Z: 1, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1, im: 0 }] })).toMatch(/torus/);
    expect(shapeDescription({ Z: 1, terms: [{ n: 3, l: 2, m: 2, basis: 'real', re: 1, im: 0 }] })).toMatch(/along the x and y axes/);
    expect(shapeDescription({ Z: 1, terms: [{ n: 2, l: 0, m: 0, basis: 'real', re: 1, im: 0 }] })).toMatch(/1 radial node/);
  });
  it('a box that cuts the surface and a grid too coarse for it are said in the caption, the warnings and the sheet', async () => {
    const r = recipeSchema.parse({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 16, extent: 3 }, surface: { rule: 'enclosed', fraction: 0.9 } });
    const res = await resultFor(r);
    const m = figureMetadata({ recipe: r, result: res, engineVersion: '0.1.0', palette: r.palette, generatedAt: GENERATED });
    expect(m.warnings.map((w) => w.code)).toContain('box-cuts-surface');
    expect(m.surface.enclosedInBox).toBeLessThan(0.9);
    expect(m.caption).toMatch(/enclosing 90% of the probability over all space/);
    expect(m.caption).toMatch(/The box cuts the surface open: the part shown encloses \d+(\.\d)?%/);
    const t = metadataSheetText(m);
    expect(t).toContain('Drawn inside the box');
    for (const w of m.warnings) expect(t).toContain(w.message);
  });
  it('rejects a bad generatedAt and a missing recipe, naming the field', () => {
    expect(() => figureMetadata({ recipe, result, engineVersion: '0.1.0', palette: recipe.palette, generatedAt: 'yesterday' })).toThrow(/generatedAt/);
    expect(() => figureMetadata({ recipe: undefined as unknown as RecipeLike, result, engineVersion: '0.1.0', palette: recipe.palette, generatedAt: GENERATED })).toThrow(/recipe/);
  });
  it('metadataSheetText carries caption, alt text, model note, grid, engine version', () => {
    const t = metadataSheetText(meta);
    expect(t).toContain(meta.caption);
    expect(t).toContain(meta.altText);
    expect(t).toContain(meta.longDescription);
    // Typeset for plain text: no underscores, no caret exponents (the conventions note quotes the engine's own text).
    expect(t.split('## Conventions')[0]).not.toMatch(/_|a0\^/);
    expect(t).toContain(MODEL_NOTE);
    expect(t).toContain('40³ points');
    expect(t).toContain('## Warnings');
    expect(t).toContain('Condon–Shortley');
    expect(t).toContain('Engine version 0.1.0');
  });
});

/** IHDR size and pHYs read by hand (PNG specification §11.2.2 and §11.3.5.3), independent of libs/print's reader. */
function pngByHand(bytes: Uint8Array): { width: number; height: number; ppm?: number; unit?: number; srgb: boolean } {
  const b = Buffer.from(bytes);
  const out: { width: number; height: number; ppm?: number; unit?: number; srgb: boolean } = { width: b.readUInt32BE(16), height: b.readUInt32BE(20), srgb: false };
  for (let o = 8; o < b.length; ) {
    const len = b.readUInt32BE(o);
    const type = b.toString('latin1', o + 4, o + 8);
    if (type === 'pHYs') {
      out.ppm = b.readUInt32BE(o + 8);
      out.unit = b[o + 16];
    }
    if (type === 'sRGB') out.srgb = true;
    o += 12 + len;
  }
  return out;
}

function png(width: number, height: number, dpi: number): Uint8Array {
  const rgba = new Uint8Array(width * height * 4).fill(200);
  return encodeRgbaPng(width, height, rgba, { dpi, filter: 'none' });
}

describe('buildBundle (zip via fflate)', () => {
  const recipe = recipeFor(dxy, 1, 24);
  let meta: ReturnType<typeof figureMetadata>;
  beforeAll(async () => {
    meta = figureMetadata({ recipe, result: await resultFor(recipe), engineVersion: '0.1.0', palette: recipe.palette, generatedAt: GENERATED });
  });
  // 180 × 120 mm at 600 dpi would be 4252 × 2835 px; a 60 × 40 px image at 600 dpi is 2.54 × 1.69 mm.
  const print = png(60, 40, 600);
  const thumb = png(32, 24, 96);
  const svg = new TextEncoder().encode('<?xml version="1.0"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="80mm" height="60mm" viewBox="0 0 80 60"/>');

  it('round trip: files, recipe.json, metadata.json and README.txt with their contents', () => {
    const zip = buildBundle([{ name: 'figure.png', bytes: print }, { name: 'companions/section.svg', bytes: svg }], meta);
    const out = unzipSync(zip);
    expect(Object.keys(out).sort()).toEqual(['README.txt', 'companions/section.svg', 'figure.png', 'metadata.json', 'recipe.json']);
    expect(out['figure.png']).toEqual(print);
    expect(out['companions/section.svg']).toEqual(svg);
    expect(JSON.parse(strFromU8(out['recipe.json']))).toEqual(JSON.parse(JSON.stringify(recipe)));
    const m = JSON.parse(strFromU8(out['metadata.json']));
    expect(m.caption).toBe(meta.caption);
    expect(m.recipe).toBeUndefined();
    expect(m.canvas).toBeUndefined(); // the recipe's working canvas is not a claim about any file
    expect(strFromU8(out['README.txt'])).toBe(metadataSheetText(meta, m.files.filter((f: { name: string }) => f.name !== 'README.txt')));
  });

  it('metadata.json describes every file inside: name, format, bytes and sha256 (checked with node:crypto) of each entry', () => {
    const out = unzipSync(buildBundle([{ name: 'figure.png', bytes: print }, { name: 'companions/section.svg', bytes: svg, role: 'cross-section' }], meta));
    const files: { name: string; format: string; bytes: number; sha256: string; role?: string }[] = JSON.parse(strFromU8(out['metadata.json'])).files;
    expect(files.map((f) => f.name).sort()).toEqual(Object.keys(out).filter((n) => n !== 'metadata.json').sort());
    for (const f of files) {
      expect({ name: f.name, bytes: f.bytes, sha256: f.sha256 }).toEqual({ name: f.name, bytes: out[f.name].length, sha256: createHash('sha256').update(out[f.name]).digest('hex') });
    }
    const section = files.find((f) => f.name === 'companions/section.svg')!;
    expect(section).toMatchObject({ format: 'svg', mediaType: 'image/svg+xml', widthMm: 80, heightMm: 60, role: 'cross-section' });
  });

  it('every PNG in a bundle matches its metadata: pixel size, dpi and mm read from the PNG itself, whatever size it was rendered at', () => {
    const out = unzipSync(buildBundle([{ name: 'figure.png', bytes: print }, { name: 'thumbs/small.png', bytes: thumb }], meta));
    const m = JSON.parse(strFromU8(out['metadata.json']));
    const pngs = m.files.filter((f: { format: string }) => f.format === 'png');
    expect(pngs).toHaveLength(2);
    for (const f of pngs) {
      const h = pngByHand(out[f.name]);
      expect(h.unit).toBe(1); // pixels per metre
      const dpi = Math.round((h.ppm! * 254) / 10000); // 1 in = 0.0254 m exactly
      expect({ name: f.name, widthPx: f.widthPx, heightPx: f.heightPx, dpi: f.dpi, colourSpace: f.colourSpace }).toEqual({ name: f.name, widthPx: h.width, heightPx: h.height, dpi, colourSpace: h.srgb ? 'sRGB' : undefined });
      expect(f.widthMm).toBeCloseTo((h.width / dpi) * 25.4, 2);
      expect(f.heightMm).toBeCloseTo((h.height / dpi) * 25.4, 2);
      // The sheet says the same numbers.
      expect(strFromU8(out['README.txt'])).toContain(`${f.name}: PNG, ${h.width} × ${h.height} px`);
    }
    expect(readPngInfo(out['figure.png']).width).toBe(60);
  });

  it('same inputs give the same bytes (entry times come from generatedAt)', () => {
    const a = buildBundle([{ name: 'figure.png', bytes: print }], meta);
    const b = buildBundle([{ name: 'figure.png', bytes: print }], meta);
    expect(a).toEqual(b);
  });
  it('rejects reserved, repeated and escaping names, and bytes that are not their format', () => {
    expect(() => buildBundle([{ name: 'recipe.json', bytes: print }], meta)).toThrow(/files\[0\].name "recipe.json" is reserved/);
    expect(() => buildBundle([{ name: 'a.png', bytes: print }, { name: 'a.png', bytes: print }], meta)).toThrow(/files\[1\]/);
    expect(() => buildBundle([{ name: '../x.png', bytes: print }], meta)).toThrow(/relative path/);
    expect(() => buildBundle([{ name: 'x.png', bytes: 'nope' as unknown as Uint8Array }], meta)).toThrow(/bytes/);
    expect(() => buildBundle([{ name: 'x.png', bytes: new Uint8Array([137, 80, 78, 71, 1, 2, 3]) }], meta)).toThrow(/x.png: not a readable PNG/);
    expect(() => buildBundle([{ name: 'x.bin', bytes: print }], meta)).toThrow(/x.bin: no describer/);
  });
});

describe('shortAltText', () => {
  it('stays within 125 characters for long superpositions and ions', () => {
    const terms = Array.from({ length: 16 }, (_, i) => ({ n: 7, l: 3, m: (i % 7) - 3, basis: 'real' as const, re: 0.25, im: 0.1 }));
    const label = 'a very long custom label for a superposition of many terms that nobody would want read aloud in full';
    const t = shortAltText({ Z: 92, terms }, label, 92);
    expect(t.length).toBeLessThanOrEqual(ALT_TEXT_MAX);
    expect(t).toMatch(/superposition of 16 terms/);
  });
});

/** A tiny uncompressed RGB TIFF written by hand (TIFF 6.0 baseline: one strip, little-endian), `dpi` in XResolution. */
function handTiff(width: number, height: number, dpi: number, photometric = 2): Uint8Array {
  const spp = photometric === 5 ? 4 : 3;
  const pixels = width * height * spp;
  const entries: [number, number, number, number][] = []; // tag, type, count, value
  const dataAt = 8;
  const resAt = dataAt + pixels;
  const ifdAt = resAt + 8 + ((resAt + 8) % 2);
  entries.push([256, 3, 1, width], [257, 3, 1, height], [258, 3, 1, 8], [259, 3, 1, 1], [262, 3, 1, photometric], [273, 4, 1, dataAt], [277, 3, 1, spp], [278, 3, 1, height], [279, 4, 1, pixels], [282, 5, 1, resAt], [283, 5, 1, resAt], [296, 3, 1, 2]);
  const buf = new Uint8Array(ifdAt + 2 + 12 * entries.length + 4);
  const dv = new DataView(buf.buffer);
  buf.set([0x49, 0x49]);
  dv.setUint16(2, 42, true);
  dv.setUint32(4, ifdAt, true);
  buf.fill(128, dataAt, dataAt + pixels);
  dv.setUint32(resAt, dpi, true);
  dv.setUint32(resAt + 4, 1, true);
  dv.setUint16(ifdAt, entries.length, true);
  entries.forEach(([tag, type, count, value], i) => {
    const e = ifdAt + 2 + 12 * i;
    dv.setUint16(e, tag, true);
    dv.setUint16(e + 2, type, true);
    dv.setUint32(e + 4, count, true);
    if (type === 3) dv.setUint16(e + 8, value, true);
    else dv.setUint32(e + 8, value, true);
  });
  return buf;
}

/** A one-page PDF with a MediaBox of w × h points, written by hand with a correct cross-reference table. */
function handPdf(wPt: number, hPt: number): Uint8Array {
  const objs = ['<< /Type /Catalog /Pages 2 0 R >>', '<< /Type /Pages /Kids [3 0 R] /Count 1 >>', `<< /Type /Page /Parent 2 0 R /MediaBox [0 0 ${wPt} ${hPt}] >>`];
  let out = '%PDF-1.4\n';
  const offs: number[] = [];
  objs.forEach((o, i) => {
    offs.push(out.length);
    out += `${i + 1} 0 obj\n${o}\nendobj\n`;
  });
  const xref = out.length;
  out += `xref\n0 ${objs.length + 1}\n0000000000 65535 f \n${offs.map((o) => `${String(o).padStart(10, '0')} 00000 n \n`).join('')}`;
  out += `trailer\n<< /Size ${objs.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return new TextEncoder().encode(out);
}

describe('bundle metadata for print files (TIFF, PDF), checked against Debian libtiff tiffinfo and poppler pdfinfo', () => {
  const recipe = recipeFor(dxy, 1, 24);
  let meta: ReturnType<typeof figureMetadata>;
  beforeAll(async () => {
    meta = figureMetadata({ recipe, result: await resultFor(recipe), engineVersion: '0.1.0', palette: recipe.palette, generatedAt: GENERATED });
  });
  it('a TIFF is described by its own tags (size, dpi, photometric), the same numbers tiffinfo reads', () => {
    const tif = handTiff(20, 10, 600, 5);
    const dir = mkdtempSync(join(tmpdir(), 'psiform-tif-'));
    writeFileSync(join(dir, 'f.tif'), tif);
    const info = execFileSync('tiffinfo', [join(dir, 'f.tif')], { encoding: 'utf8' });
    expect(info).toMatch(/Image Width: 20 Image Length: 10/);
    expect(info).toMatch(/Resolution: 600, 600 pixels\/inch/);
    expect(info).toMatch(/Photometric Interpretation: separated/);
    const out = unzipSync(buildBundle([{ name: 'figure.tif', bytes: tif }], meta));
    const f = JSON.parse(strFromU8(out['metadata.json'])).files.find((x: { name: string }) => x.name === 'figure.tif');
    expect(f).toMatchObject({ format: 'tiff', widthPx: 20, heightPx: 10, dpi: 600, colourSpace: 'CMYK' });
    expect(f.widthMm).toBeCloseTo((20 / 600) * 25.4, 2);
  });
  it('a PDF is described by its MediaBox (1 pt = 1/72 in), the page size pdfinfo reads', () => {
    const pdf = handPdf(252.283, 170.079); // 89 × 60 mm
    const dir = mkdtempSync(join(tmpdir(), 'psiform-pdf-'));
    writeFileSync(join(dir, 'f.pdf'), pdf);
    const info = execFileSync('pdfinfo', [join(dir, 'f.pdf')], { encoding: 'utf8' });
    const m = /Page size:\s+([\d.]+) x ([\d.]+) pts/.exec(info)!;
    const out = unzipSync(buildBundle([{ name: 'radial.pdf', bytes: pdf }], meta));
    const f = JSON.parse(strFromU8(out['metadata.json'])).files.find((x: { name: string }) => x.name === 'radial.pdf');
    expect(f).toMatchObject({ format: 'pdf', pages: 1 });
    expect(f.widthMm).toBeCloseTo((Number(m[1]) / 72) * 25.4, 1);
    expect(f.heightMm).toBeCloseTo((Number(m[2]) / 72) * 25.4, 1);
    expect(f.widthMm).toBeCloseTo(89, 1);
  });
});
