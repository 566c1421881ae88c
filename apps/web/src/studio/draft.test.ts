import { canonicalJson, gridProblem, mmProblem, parseRecipe, type Recipe, type RecipeTerm } from '@psiform/contracts';
import { compileState, parseOrbitalLabel } from '@psiform/orbitals';
import { createDraft, draftErrors, draftReducer, fieldText, initialMode, isDirty, namedState, viewShowsState, type ComposerDraft, type ContentMode, type DraftAction } from './draft';

function recipeOf(terms: RecipeTerm[], Z = 1, label?: string): Recipe {
  const r = parseRecipe({ version: 1, label, content: { Z, terms }, grid: { n: 64, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } });
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.recipe;
}

const fromLabel = (key: string, Z = 1) => recipeOf(parseOrbitalLabel(key).state.terms as RecipeTerm[], Z, key);

/** ψ at fixed pseudo-random points (a small LCG, so the points are the same every run), complex. */
function samplePsi(r: Recipe, count = 64): number[] {
  const c = compileState({ Z: r.content.Z, terms: r.content.terms.map((t) => ({ ...t, im: t.im ?? 0 })) });
  let seed = 12345;
  const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648) * 16 - 8;
  const out: number[] = [];
  for (let i = 0; i < count; i++) {
    const v = c.evaluate(rnd(), rnd(), rnd());
    out.push(v.re, v.im);
  }
  return out;
}

const run = (d: ComposerDraft, ...actions: DraftAction[]) => actions.reduce(draftReducer, d);
const MODES: ContentMode[] = ['label', 'nlm', 'superposition', 'hybrid'];

// States of every kind: complex single terms (a phase that must not rotate), real forms, a hybrid, the cubic f,
// a real g form (no name: the n, l, m view), a superposition with non-right-angle phases, an ion.
const STATES: [string, Recipe][] = [
  ['2p(m=+1), complex', fromLabel('2p+1')],
  ['3d(m=−2), complex', fromLabel('3d-2')],
  ['3d_z²', fromLabel('3dz2')],
  ['4f_x(y²−z²), cubic set', fromLabel('4fx(y2-z2)')],
  ['sp³ #2', fromLabel('sp3#2')],
  ['5g (m = 3), real, unnamed', recipeOf([{ n: 5, l: 4, m: 3, basis: 'real', re: 1, im: 0 }])],
  [
    'superposition with 37° and 250°',
    recipeOf([
      { n: 2, l: 1, m: 1, basis: 'complex', re: Math.cos(0.6457718), im: Math.sin(0.6457718) },
      { n: 3, l: 2, m: 0, basis: 'real', re: 0.4 * Math.cos(4.3633231), im: 0.4 * Math.sin(4.3633231) },
    ]),
  ],
  ['1s of Li²⁺', fromLabel('1s', 3)],
];

describe('Composer draft: one model over the recipe', () => {
  it.each(STATES)('opening %s is not dirty, and no sequence of view switches changes ψ (sampled at 64 points)', (_name, recipe) => {
    const d0 = createDraft(recipe);
    expect(isDirty(d0, recipe)).toBe(false);
    const before = samplePsi(recipe);
    let d = d0;
    for (const m of [...MODES, ...MODES.slice().reverse(), 'superposition', 'label', 'hybrid', 'nlm'] as ContentMode[]) {
      d = draftReducer(d, { type: 'mode', mode: m });
      expect(d.recipe.content.terms).toEqual(recipe.content.terms);
      expect(isDirty(d, recipe)).toBe(false);
      expect(draftErrors(d)).toEqual({});
    }
    // Exact: the sampled ψ is bit-for-bit the same (the terms are the same numbers).
    expect(samplePsi(d.recipe)).toEqual(before);
    expect(canonicalJson(d.recipe)).toBe(canonicalJson(recipe));
  });

  it('each view either shows the state exactly or reports that it cannot (then the UI offers "replace with…")', () => {
    const complex = fromLabel('2p+1');
    expect(viewShowsState('superposition', complex.content.terms)).toBe(true);
    expect(viewShowsState('label', complex.content.terms)).toBe(true); // 2p+1 is a named complex form
    expect(viewShowsState('nlm', complex.content.terms)).toBe(true);
    expect(viewShowsState('hybrid', complex.content.terms)).toBe(false);
    const sp3 = fromLabel('sp3#2');
    expect(viewShowsState('nlm', sp3.content.terms)).toBe(false);
    expect(viewShowsState('label', sp3.content.terms)).toBe(false);
    expect(initialMode(sp3.content.terms)).toBe('hybrid');
    expect(namedState(fromLabel('4fx(y2-z2)').content.terms)?.key).toBe('4fx(y2-z2)');
    expect(initialMode(STATES[5][1].content.terms)).toBe('nlm');
    expect(initialMode(STATES[6][1].content.terms)).toBe('superposition');
  });

  it('the superposition view shows the stored coefficients as |c| and phase, and an untouched row keeps its exact value', () => {
    const [, sup] = STATES[6];
    let d = run(createDraft(sup), { type: 'mode', mode: 'superposition' });
    const [a, b] = d.rowIds;
    expect(fieldText(d, `row.${a}.phase`)).toBe('37'); // 0.6457718 rad = 37.0000° to 4 decimals
    expect(fieldText(d, `row.${b}.mag`)).toBe('0.4');
    // Editing the second row's magnitude leaves the first term's numbers exactly as they were.
    d = run(d, { type: 'text', key: `row.${b}.mag`, value: '0.5' });
    expect(d.recipe.content.terms[0]).toEqual(sup.content.terms[0]);
    expect(Math.hypot(d.recipe.content.terms[1].re, d.recipe.content.terms[1].im)).toBeCloseTo(0.5, 12);
    expect(Math.atan2(d.recipe.content.terms[1].im, d.recipe.content.terms[1].re)).toBeCloseTo(4.3633231 - 2 * Math.PI, 6);
    expect(isDirty(d, sup)).toBe(true);
  });

  it('replacing is explicit: picking a label replaces the terms; invalid typing never does', () => {
    const complex = fromLabel('2p+1');
    let d = run(createDraft(complex), { type: 'mode', mode: 'label' }, { type: 'text', key: 'label', value: '2p' });
    expect(draftErrors(d).label).toBeTruthy();
    expect(d.recipe.content.terms).toEqual(complex.content.terms);
    d = run(d, { type: 'text', key: 'label', value: '2pz' });
    expect(d.recipe.content.terms).toEqual([{ n: 2, l: 1, m: 0, basis: 'real', re: 1, im: 0 }]);
    expect(d.recipe.label).toBe('2p_z');
    const hy = run(createDraft(complex), { type: 'mode', mode: 'hybrid' });
    expect(hy.recipe.content.terms).toEqual(complex.content.terms);
    const picked = run(hy, { type: 'replacing', open: true }, { type: 'hybrid', set: 'sp2', member: 3 });
    expect(namedState(picked.recipe.content.terms)?.key).toBe('sp2#3');
  });

  it('typed values out of range keep their text and a message naming the limit, and leave the recipe as it was', () => {
    const r = fromLabel('2pz');
    const d = run(
      createDraft(r),
      { type: 'text', key: 'canvas.widthMm', value: '5' },
      { type: 'text', key: 'canvas.heightMm', value: '5000' },
      { type: 'text', key: 'grid', value: '999' },
    );
    expect(fieldText(d, 'canvas.widthMm')).toBe('5');
    expect(draftErrors(d)).toMatchObject({
      'canvas.widthMm': 'The width must be from 10 to 1000 mm (got 5 mm).',
      'canvas.heightMm': 'The height must be from 10 to 1000 mm (got 5000 mm).',
      grid: "Grid N must be 'auto' or a whole number from 16 to 384 (got 999).",
    });
    // The words after the field name are the API's own (libs/contracts): its 400 says "grid.n <the same>".
    expect(parseRecipe({ ...r, grid: { ...r.grid, n: 999 } })).toMatchObject({ ok: false, issues: [{ path: 'grid.n', message: `grid.n ${gridProblem(999)}` }] });
    expect(draftErrors(d).grid).toBe(`Grid N ${gridProblem(999)}.`);
    expect(draftErrors(d)['canvas.widthMm']).toBe(`The width ${mmProblem(5)}.`);
    expect(d.recipe.canvas).toEqual(r.canvas);
    expect(d.recipe.grid.n).toBe(64);
    const titled = run(createDraft(r, { isNew: true }), { type: 'text', key: 'title', value: 'x'.repeat(250) });
    expect(draftErrors(titled).title).toBe('The title must be at most 200 characters (this one has 250).');
    expect(draftErrors(createDraft(r, { isNew: true })).title).toBe('The title must not be empty.');
  });
});
