import { describe, expect, it } from 'vitest';
import { fractionProblem, gridProblem, RECIPE_LIMITS, zProblem } from '../src/limits';
import { ENGINE_CONVENTIONS, PSIFORM_PALETTE, RECIPE_VERSION, canonicalJson, formatRecipeIssues, parseRecipe, recipeSchema, type RecipeIssue } from '../src/recipe';

/** A minimal valid document: 2p_z (real basis), Z = 1, 48³ grid, 90% enclosed. */
function minimal(): Record<string, any> {
  return {
    version: RECIPE_VERSION,
    content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] },
    grid: { n: 48 },
    surface: { rule: 'enclosed', fraction: 0.9 },
  };
}

function issuesOf(doc: unknown): RecipeIssue[] {
  const r = parseRecipe(doc);
  if (r.ok) throw new Error(`expected the recipe to be rejected: ${JSON.stringify(doc)}`);
  return r.issues;
}

function withTerm(term: Record<string, unknown>): Record<string, any> {
  const d = minimal();
  d.content.terms = [term];
  return d;
}

describe('parseRecipe: valid documents', () => {
  it('accepts a minimal recipe and fills every default', () => {
    const r = parseRecipe(minimal());
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const rec = r.recipe;
    expect(rec.version).toBe(1);
    expect(rec.content.terms[0]).toEqual({ n: 2, l: 1, m: 0, basis: 'real', re: 1, im: 0 });
    expect(rec.grid).toEqual({ n: 48, extent: 'auto' });
    expect(rec.surface).toEqual({ rule: 'enclosed', fraction: 0.9 });
    expect(rec.phase).toEqual({ mode: 'auto' });
    expect(rec.palette).toEqual({ swatchbookId: null, positive: PSIFORM_PALETTE.positive, negative: PSIFORM_PALETTE.negative });
    expect(PSIFORM_PALETTE).toMatchObject({ positive: '#1f5e5b', negative: '#a86a1c' });
    expect(rec.canvas).toEqual({ widthMm: 89, heightMm: 60, dpi: 300 });
    expect(rec.stage.camera).toEqual({ view: 'three_quarter', projection: 'perspective', target: [0, 0, 0], fovDeg: 35, zoom: 1 });
    expect(rec.stage.lights.ambient).toBe(0.35);
    expect(rec.stage.material).toEqual({ gloss: 0.45, opacity: 1, nodalOutline: false });
    expect(rec.annotations.scaleBar).toEqual({ show: true, unit: 'angstrom' });
  });

  it('is idempotent: a parsed recipe parses to itself', () => {
    const first = parseRecipe(minimal());
    if (!first.ok) throw new Error('minimal recipe rejected');
    const second = parseRecipe(JSON.parse(JSON.stringify(first.recipe)));
    expect(second.ok).toBe(true);
    if (second.ok) expect(second.recipe).toEqual(first.recipe);
  });

  it('accepts a complex superposition, the psi rule and numeric extent', () => {
    const d = minimal();
    d.content = {
      Z: 3,
      terms: [
        { n: 2, l: 1, m: 1, basis: 'complex', re: Math.SQRT1_2, im: 0 },
        { n: 2, l: 1, m: -1, basis: 'complex', re: 0, im: Math.SQRT1_2 },
      ],
    };
    d.surface = { rule: 'psi', value: 0.02 };
    d.grid = { n: 64, extent: 12.5 };
    const r = parseRecipe(d);
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.recipe.content.terms).toHaveLength(2);
      expect(r.recipe.grid.extent).toBe(12.5);
    }
  });

  it('accepts the limits themselves (n = 12 with l = 11, m = -11; grid 16 and 384)', () => {
    const d = withTerm({ n: RECIPE_LIMITS.nMax, l: 11, m: -11, basis: 'real', re: 1 });
    expect(parseRecipe(d).ok).toBe(true);
    for (const n of [RECIPE_LIMITS.gridMin, RECIPE_LIMITS.gridMax]) {
      const g = minimal();
      g.grid.n = n;
      expect(parseRecipe(g).ok).toBe(true);
    }
  });
});

describe('parseRecipe: rejected documents name the field', () => {
  it('l >= n', () => {
    const issues = issuesOf(withTerm({ n: 2, l: 2, m: 0, basis: 'real', re: 1 }));
    expect(issues).toContainEqual({ path: 'content.terms.0.l', message: 'l must be less than n (got n=2, l=2)' });
  });

  it('|m| > l', () => {
    const issues = issuesOf(withTerm({ n: 3, l: 1, m: -2, basis: 'complex', re: 1 }));
    expect(issues).toEqual([{ path: 'content.terms.0.m', message: '|m| must not exceed l (got l=1, m=-2)' }]);
  });

  it('n = 13 (over RECIPE_LIMITS.nMax)', () => {
    const issues = issuesOf(withTerm({ n: 13, l: 0, m: 0, basis: 'real', re: 1 }));
    expect(issues).toEqual([{ path: 'content.terms.0.n', message: 'n must be between 1 and 12 (got n=13)' }]);
  });

  it('n = 0 and a fractional n', () => {
    expect(issuesOf(withTerm({ n: 0, l: 0, m: 0, basis: 'real', re: 1 }))).toContainEqual({ path: 'content.terms.0.n', message: 'n must be between 1 and 12 (got n=0)' });
    expect(issuesOf(withTerm({ n: 2.5, l: 0, m: 0, basis: 'real', re: 1 }))).toContainEqual({ path: 'content.terms.0.n', message: 'n must be an integer (got n=2.5)' });
  });

  it('the second term is named by its index', () => {
    const d = minimal();
    d.content.terms.push({ n: 1, l: 1, m: 0, basis: 'real', re: 1 });
    expect(issuesOf(d)).toEqual([{ path: 'content.terms.1.l', message: 'l must be less than n (got n=1, l=1)' }]);
  });

  it('grid 999 (over RECIPE_LIMITS.gridMax) and grid 8 (under gridMin)', () => {
    const big = minimal();
    big.grid.n = 999;
    // The words are limits.ts gridProblem's, which the Composer shows under its grid field.
    expect(issuesOf(big)).toEqual([{ path: 'grid.n', message: "grid.n must be 'auto' or a whole number from 16 to 384 (got 999)" }]);
    expect(issuesOf(big)[0].message).toBe(`grid.n ${gridProblem(999)}`);
    const small = minimal();
    small.grid.n = 8;
    expect(issuesOf(small)).toEqual([{ path: 'grid.n', message: `grid.n ${gridProblem(8)}` }]);
    small.grid.n = 'fine';
    expect(issuesOf(small)).toEqual([{ path: 'grid.n', message: `grid.n must be 'auto' or a whole number from 16 to 384 (got "fine")` }]);
  });

  it('NaN and Infinity fractions (possible from JavaScript callers, not from JSON)', () => {
    for (const f of [NaN, Infinity, -Infinity]) {
      const d = minimal();
      d.surface.fraction = f;
      const issues = issuesOf(d);
      expect(issues).toHaveLength(1);
      expect(issues[0].path).toBe('surface.fraction');
      expect(issues[0].message).toBe(`fraction ${fractionProblem(f)}`);
    }
  });

  it('fraction 1, 0 and 1.5 are outside (0, 1)', () => {
    for (const f of [1, 0, 1.5, -0.2]) {
      const d = minimal();
      d.surface.fraction = f;
      expect(issuesOf(d)).toEqual([{ path: 'surface.fraction', message: `fraction must be a number between 0 and 1, both excluded (got ${f})` }]);
    }
  });

  it('a fraction given as a string is not coerced', () => {
    const d = minimal();
    d.surface.fraction = '0.9';
    expect(issuesOf(d)).toEqual([{ path: 'surface.fraction', message: 'fraction must be a number between 0 and 1, both excluded (got "0.9")' }]);
  });

  it('missing and wrong version', () => {
    const d = minimal();
    delete d.version;
    expect(issuesOf(d)).toEqual([{ path: 'version', message: 'version must be 1' }]);
    d.version = 2;
    expect(issuesOf(d)).toEqual([{ path: 'version', message: 'version must be 1' }]);
  });

  it('a non-positive psi value and an unknown surface rule', () => {
    const d = minimal();
    d.surface = { rule: 'psi', value: 0 };
    expect(issuesOf(d)).toEqual([{ path: 'surface.value', message: 'value must be a positive number (got 0)' }]);
    d.surface = { rule: 'density', value: 0.1 };
    expect(issuesOf(d)[0].path).toBe('surface.rule');
  });

  it('all-zero coefficients, no terms, Z out of range', () => {
    const zero = withTerm({ n: 1, l: 0, m: 0, basis: 'real', re: 0, im: 0 });
    expect(issuesOf(zero)).toEqual([{ path: 'content.terms', message: 'at least one coefficient must be non-zero' }]);
    const none = minimal();
    none.content.terms = [];
    expect(issuesOf(none)).toContainEqual({ path: 'content.terms', message: 'at least one term is required' });
    const z = minimal();
    z.content.Z = 119;
    expect(issuesOf(z)).toEqual([{ path: 'content.Z', message: 'Z must be a whole number from 1 to 118 (got 119)' }]);
    z.content.Z = 0;
    expect(issuesOf(z)).toEqual([{ path: 'content.Z', message: `Z ${zProblem(0)}` }]);
  });

  it('documents that are not objects fail at the root', () => {
    for (const doc of [null, 42, 'recipe', [1, 2]]) {
      const issues = issuesOf(doc);
      expect(issues[0].path).toBe('(root)');
    }
  });

  it('unknown fields are refused by name at every level, not dropped (a misspelt nodalOutLine)', () => {
    const d = minimal();
    d.stage = { material: { nodalOutLine: true } };
    d.colour = 'red';
    d.content.terms[0].spin = 1;
    expect(issuesOf(d)).toEqual(
      expect.arrayContaining([
        { path: 'stage.material.nodalOutLine', message: 'unknown field' },
        { path: 'colour', message: 'unknown field' },
        { path: 'content.terms.0.spin', message: 'unknown field' },
      ]),
    );
    expect(issuesOf(d)).toHaveLength(3);
  });

  it('formatRecipeIssues gives one "path: message" line per issue', () => {
    const issues = issuesOf(withTerm({ n: 2, l: 2, m: 3, basis: 'real', re: 1 }));
    expect(formatRecipeIssues(issues)).toEqual([
      'content.terms.0.l: l must be less than n (got n=2, l=2)',
      'content.terms.0.m: |m| must not exceed l (got l=2, m=3)',
    ]);
  });
});

describe('canonicalJson', () => {
  it('does not depend on key order, at any depth', () => {
    const a = { version: 1, grid: { n: 48, extent: 'auto' }, content: { Z: 1, terms: [{ n: 1, l: 0, m: 0, basis: 'real', re: 1, im: 0 }] } };
    const b = { content: { terms: [{ im: 0, re: 1, basis: 'real', m: 0, l: 0, n: 1 }], Z: 1 }, grid: { extent: 'auto', n: 48 }, version: 1 };
    expect(canonicalJson(a)).toBe(canonicalJson(b));
    expect(canonicalJson(a)).toBe('{"content":{"Z":1,"terms":[{"basis":"real","im":0,"l":0,"m":0,"n":1,"re":1}]},"grid":{"extent":"auto","n":48},"version":1}');
  });

  it('keeps array order and value differences, and drops undefined keys', () => {
    expect(canonicalJson([2, 1])).not.toBe(canonicalJson([1, 2]));
    expect(canonicalJson({ a: 1 })).not.toBe(canonicalJson({ a: 2 }));
    expect(canonicalJson({ a: 1, b: undefined })).toBe('{"a":1}');
    expect(JSON.parse(canonicalJson({ z: [{ y: 1, x: null }], s: 'é"' }))).toEqual({ s: 'é"', z: [{ x: null, y: 1 }] });
  });

  it('equal recipes written in different key orders parse to the same canonical text', () => {
    const d1 = minimal();
    const d2 = { surface: { fraction: 0.9, rule: 'enclosed' }, grid: { n: 48 }, content: { terms: [{ re: 1, basis: 'real', m: 0, l: 1, n: 2 }], Z: 1 }, version: 1 };
    const r1 = parseRecipe(d1);
    const r2 = parseRecipe(d2);
    if (!r1.ok || !r2.ok) throw new Error('rejected');
    expect(canonicalJson(r1.recipe)).toBe(canonicalJson(r2.recipe));
  });
});

describe('grid and palette wheel (issue: truthful figures)', () => {
  const base = { version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, surface: { rule: 'enclosed', fraction: 0.9 } };
  it("grid defaults to 'auto' (the engine picks the grid); a number forces one; other strings are refused naming grid.n", () => {
    const a = parseRecipe(base);
    expect(a.ok && a.recipe.grid).toEqual({ n: 'auto', extent: 'auto' });
    const b = parseRecipe({ ...base, grid: { n: 'auto', extent: 4 } });
    expect(b.ok && b.recipe.grid).toEqual({ n: 'auto', extent: 4 });
    const c = parseRecipe({ ...base, grid: { n: 'fine' } });
    expect(c.ok).toBe(false);
    expect(!c.ok && c.issues[0].path).toBe('grid.n');
  });
  it('palette.wheel is optional and checked (OKLCH L in (0, 1), C in [0, 0.4])', () => {
    const ok = parseRecipe({ ...base, palette: { wheel: { lightness: 0.7, chroma: 0.11 } } });
    expect(ok.ok && ok.recipe.palette.wheel).toEqual({ lightness: 0.7, chroma: 0.11 });
    const bad = parseRecipe({ ...base, palette: { wheel: { lightness: 1.2, chroma: 0.11 } } });
    expect(!bad.ok && formatRecipeIssues(bad.issues)).toEqual(['palette.wheel.lightness: wheel.lightness must be between 0 and 1 (OKLCH L)']);
  });
});

describe('the recipe as documented (the API docs convert this schema with zod toJSONSchema)', () => {
  it('states the sign conventions, the units and the normalisation rule', async () => {
    const { z } = await import('zod');
    const doc = z.toJSONSchema(recipeSchema, { io: 'input', unrepresentable: 'any' }) as unknown as { description: string; properties: { content: { properties: { terms: { items: { properties: { re: { description: string }; basis: { description: string } } } } } } } };
    expect(doc.description).toContain(ENGINE_CONVENTIONS);
    expect(doc.description).toContain('Bohr radii a0');
    const term = doc.properties.content.properties.terms.items.properties;
    expect(term.re.description).toMatch(/normalises once/);
    expect(term.basis.description).toMatch(/Condon–Shortley/);
  });
});
