import { describe, expect, it } from 'vitest';
import { parseRecipe, PSIFORM_PALETTE, type Recipe } from '@psiform/contracts';
import { describeRecipeChanges, recipeChanges } from '../src/recipe-changes';

const base = {
  version: 1,
  label: '2pz',
  content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] },
  grid: { n: 64 },
  surface: { rule: 'enclosed', fraction: 0.9 },
};

function recipe(over: (d: Record<string, any>) => void = () => {}): Recipe {
  const doc = structuredClone(base) as Record<string, any>;
  over(doc);
  const r = parseRecipe(doc);
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.recipe;
}

describe('recipeChanges (words for the proof comparison)', () => {
  it('the issue’s own example: key light and enclosed surface', () => {
    const a = recipe();
    const b = recipe((d) => {
      d.surface.fraction = 0.95;
      d.stage = { lights: { key: { intensity: 2.7, color: '#fff8ef', azimuthDeg: 35, elevationDeg: 40 } } };
    });
    expect(describeRecipeChanges(recipeChanges(a, b))).toBe('surface 90% → 95%; key light 2.2 → 2.7');
  });

  it('an unchanged recipe (defaults written out or left out) has no changes', () => {
    const a = recipe();
    const b = recipe((d) => (d.stage = { lights: { key: { intensity: 2.2, color: '#fff8ef', azimuthDeg: 35, elevationDeg: 40 } } }));
    expect(recipeChanges(a, b)).toEqual([]);
    expect(describeRecipeChanges([])).toBe('no change to the recipe');
  });

  it('a new state is one line with the typeset labels (not a second line for the label)', () => {
    const b = recipe((d) => {
      d.label = '3dz2';
      d.content.terms = [{ n: 3, l: 2, m: 0, basis: 'real', re: 1 }];
    });
    expect(recipeChanges(recipe(), b)).toEqual([{ path: 'content.terms', what: 'state', from: '2p_z', to: '3d_z²' }]);
  });

  it('coefficients of the same states, Z, grid, rule switch, colours, print size and dpi', () => {
    const a = recipe((d) => (d.content.terms = [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }, { n: 2, l: 1, m: 1, basis: 'real', re: 1 }]));
    const b = recipe((d) => {
      d.content.terms = [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }, { n: 2, l: 1, m: 1, basis: 'real', re: 0.5, im: -0.5 }];
      d.content.Z = 2;
      d.grid.n = 96;
      d.surface = { rule: 'psi', value: 0.05 };
      d.palette = { positive: '#aa3300' };
      d.canvas = { widthMm: 120, heightMm: 80, dpi: 600 };
    });
    const words = recipeChanges(a, b).map((c) => `${c.what} ${c.from} → ${c.to}`);
    expect(words).toEqual([
      'Z 1 → 2',
      'coefficient of 2p_x 1 → 0.5−0.5i',
      'surface 90% → |ψ| = 0.05 a₀⁻³ᐟ²',
      'grid 64³ → 96³',
      `positive phase colour ${PSIFORM_PALETTE.positive} → #aa3300`,
      'print size 89 × 60 mm → 120 × 80 mm',
      'resolution 300 dpi → 600 dpi',
    ]);
  });

  it('stage and annotations in words; any other field by its path', () => {
    const b = recipe((d) => {
      d.stage = { camera: { view: 'axis_z', fovDeg: 20 }, background: { transparent: true }, material: { nodalOutline: true } };
      d.annotations = { axes: true, scaleBar: { unit: 'bohr' }, caption: 'The 2p_z orbital of hydrogen' };
    });
    expect(describeRecipeChanges(recipeChanges(recipe(), b))).toBe(
      'nodal outline off → on; transparent background off → on; view three-quarter → along z; field of view 35° → 20°; axes hidden → shown; scale-bar unit Å → a₀; caption — → “The 2p_z orbital of hydrogen”',
    );
  });
});
