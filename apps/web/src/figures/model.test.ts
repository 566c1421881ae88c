import { parseRecipe } from '@psiform/contracts';
import { describeRecipe, gridMemoryText } from './model';

function recipe(doc: Record<string, unknown>) {
  const r = parseRecipe({
    version: 1,
    content: { Z: 2, terms: [{ n: 3, l: 2, m: -2, basis: 'real', re: 1, im: 0 }] },
    grid: { n: 96, extent: 'auto' },
    surface: { rule: 'enclosed', fraction: 0.9 },
    ...doc,
  });
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.recipe;
}

describe('the recipe stated as a model', () => {
  it('names label, Z, the one-electron model, the surface rule, the grid and the caveat', () => {
    expect(describeRecipe(recipe({ label: '3d_xy' }))).toBe(
      '3d_xy, Z = 2, one-electron hydrogen-like model; surface encloses 90% of the probability; grid 96³ — many-electron orbitals differ',
    );
    // No label stored: derived from the terms by prettyLabel.
    expect(describeRecipe(recipe({ surface: { rule: 'psi', value: 0.02 }, grid: { n: 64, extent: 30 } }))).toBe(
      '3d_xy, Z = 2, one-electron hydrogen-like model; surface drawn at |ψ| = 0.02 a0^−3/2; grid 64³ over ±30 a0 — many-electron orbitals differ',
    );
    expect(describeRecipe(recipe({ label: '2p_z', surface: { rule: 'enclosed', fraction: 0.955 } }))).toContain('encloses 95.5% of');
  });

  it('says an uploaded cube carries its own model', () => {
    const r = recipe({
      source: {
        kind: 'upload',
        assetId: '3f2c1a9e-8d7b-4c6a-9e5f-1a2b3c4d5e6f',
        sha256: 'a'.repeat(64),
        sizes: [64, 64, 48],
        spacing: [0.25, 0.25, 0.25],
        origin: [-8, -8, -6],
        quantity: 'density',
      },
    });
    expect(describeRecipe(r)).toBe(
      "Uploaded density |ψ|² cube 64 × 64 × 48 at 0.25 a0 spacing; surface encloses 90% of the probability; the model is whatever produced the cube, not Psiform's one-electron hydrogen-like model",
    );
  });

  it('states the grid memory: n³ × 4 bytes per field, twice for complex', () => {
    // 16³ × 4 = 16,384 bytes; 384³ × 4 × 2 = 452,984,832 bytes.
    expect(gridMemoryText(16, false)).toBe('16³ × 4 bytes × 1 = 16.4 kB for one field (real ψ)');
    expect(gridMemoryText(384, true)).toBe('384³ × 4 bytes × 2 = 453.0 MB for two fields (complex ψ)');
  });
});
