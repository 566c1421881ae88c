import { recipeSchema, type Recipe } from '@psiform/contracts';
import { recipeToSurfaces, summariseSurfaces } from '@psiform/meshing';
import { strFromU8, unzipSync } from 'fflate';
import { beforeAll, describe, expect, it } from 'vitest';
import { MODEL_NOTE, buildBundle, figureMetadata, ionName, metadataSheetText, shapeDescription, type MeshResultLike, type RecipeLike } from '../src';

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
    expect(meta.caption).toBe('Isosurface of the hydrogen-like 3d_xy orbital (Z = 1) enclosing 90% of the probability over all space; lobes coloured by the sign of ψ. Computed on a 40³ grid.');
    expect(meta.warnings).toEqual([]);
  });
  it('alt text describes the d_xy cloverleaf; model note present', () => {
    expect(meta.altText).toMatch(/^Four-lobed cloverleaf in the xy plane, lobes pointing between the x and y axes/);
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
    expect(meta.palette.positive).toBe('#c8553d');
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
    expect(m.altText).toMatch(/ring-shaped/);
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
    expect(t).toContain(MODEL_NOTE);
    expect(t).toContain('40³ points');
    expect(t).toContain('## Warnings');
    expect(t).toContain('Condon–Shortley');
    expect(t).toContain('Engine version 0.1.0');
  });
});

describe('buildBundle (zip via fflate)', () => {
  const recipe = recipeFor(dxy, 1, 24);
  let meta: ReturnType<typeof figureMetadata>;
  beforeAll(async () => {
    meta = figureMetadata({ recipe, result: await resultFor(recipe), engineVersion: '0.1.0', palette: recipe.palette, generatedAt: GENERATED });
  });
  const png = new Uint8Array([137, 80, 78, 71, 1, 2, 3]);
  const svg = new TextEncoder().encode('<svg xmlns="http://www.w3.org/2000/svg"/>');

  it('round trip: files, recipe.json, metadata.json and README.txt with their contents', () => {
    const zip = buildBundle([{ name: 'figure.png', bytes: png }, { name: 'companions/section.svg', bytes: svg }], meta);
    const out = unzipSync(zip);
    expect(Object.keys(out).sort()).toEqual(['README.txt', 'companions/section.svg', 'figure.png', 'metadata.json', 'recipe.json']);
    expect(out['figure.png']).toEqual(png);
    expect(out['companions/section.svg']).toEqual(svg);
    expect(JSON.parse(strFromU8(out['recipe.json']))).toEqual(JSON.parse(JSON.stringify(recipe)));
    const m = JSON.parse(strFromU8(out['metadata.json']));
    expect(m.caption).toBe(meta.caption);
    expect(m.recipe).toBeUndefined();
    expect(strFromU8(out['README.txt'])).toBe(metadataSheetText(meta));
  });
  it('same inputs give the same bytes (entry times come from generatedAt)', () => {
    const a = buildBundle([{ name: 'figure.png', bytes: png }], meta);
    const b = buildBundle([{ name: 'figure.png', bytes: png }], meta);
    expect(a).toEqual(b);
  });
  it('rejects reserved, repeated and escaping names', () => {
    expect(() => buildBundle([{ name: 'recipe.json', bytes: png }], meta)).toThrow(/files\[0\].name "recipe.json" is reserved/);
    expect(() => buildBundle([{ name: 'a.png', bytes: png }, { name: 'a.png', bytes: png }], meta)).toThrow(/files\[1\]/);
    expect(() => buildBundle([{ name: '../x.png', bytes: png }], meta)).toThrow(/relative path/);
    expect(() => buildBundle([{ name: 'x.png', bytes: 'nope' as unknown as Uint8Array }], meta)).toThrow(/bytes/);
  });
});
