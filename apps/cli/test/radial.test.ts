import { describe, expect, it } from 'vitest';

// Sources are named beside each check. The formulas are standard; the book equation and table numbers
// (Griffiths 2nd ed., Bethe & Salpeter) are cited from memory.
import { hasScipy, psiform, psiformJson, scipy } from './helpers';

// Closed forms used below (hydrogen-like, lengths in a0):
//  R_10 = 2 Z^{3/2} e^{-Zr};  R_20 = (Z/2)^{3/2} (2 - Zr) e^{-Zr/2}
//  (Bethe & Salpeter, Quantum Mechanics of One- and Two-Electron Atoms, §3, table of R_nl;
//   also Griffiths, Introduction to Quantum Mechanics, 2nd ed., Table 4.7).

describe('psiform radial', () => {
  it('2s has one radial node at r = 2 a0 (zero of 2 - r in R_20)', () => {
    const j = psiformJson(['radial', '--n', '2', '--l', '0']);
    expect(j.nodes).toHaveLength(1);
    expect(Math.abs(j.nodes[0] - 2)).toBeLessThan(1e-9);
    expect(j.prob_outside).toBeNull();
  });

  it('nodes scale as 1/Z: 2s at Z = 2 has its node at 1 a0', () => {
    const j = psiformJson(['radial', '--n', '2', '--l', '0', '--Z', '2']);
    expect(Math.abs(j.nodes[0] - 1)).toBeLessThan(1e-9);
  });

  it('3s nodes at (9 -/+ 3 sqrt3)/2 a0 (zeros of 27 - 18r + 2r^2 in R_30, same tables)', () => {
    const j = psiformJson(['radial', '--n', '3', '--l', '0']);
    expect(j.nodes).toHaveLength(2);
    expect(Math.abs(j.nodes[0] - (9 - 3 * Math.sqrt(3)) / 2)).toBeLessThan(1e-9);
    expect(Math.abs(j.nodes[1] - (9 + 3 * Math.sqrt(3)) / 2)).toBeLessThan(1e-9);
  });

  it('node count is n - l - 1 (Bethe & Salpeter §3)', () => {
    for (const [n, l] of [[1, 0], [4, 1], [6, 3], [7, 0]]) {
      const j = psiformJson(['radial', '--n', String(n), '--l', String(l)]);
      expect(j.nodes).toHaveLength(n - l - 1);
      for (let i = 1; i < j.nodes.length; i++) expect(j.nodes[i]).toBeGreaterThan(j.nodes[i - 1]);
    }
  });

  it('1s: P(r > 2 a0) = 13/e^4 (integral of 4 r^2 e^{-2r} from R to infinity = e^{-2R}(1 + 2R + 2R^2))', () => {
    const j = psiformJson(['radial', '--n', '1', '--l', '0', '--outside', '2']);
    expect(Math.abs(j.prob_outside - 13 / Math.exp(4))).toBeLessThan(1e-9);
    expect(j.outside_r).toBe(2);
  });

  it('P(r > 0) = 1 (normalisation)', () => {
    const j = psiformJson(['radial', '--n', '4', '--l', '2', '--outside', '0']);
    expect(Math.abs(j.prob_outside - 1)).toBeLessThan(1e-9);
  });

  it('mean radius <r> = (3n^2 - l(l+1)) / 2Z (Bethe & Salpeter §3, expectation values of r^k)', () => {
    for (const [n, l, Z] of [[1, 0, 1], [2, 1, 1], [3, 2, 1], [4, 0, 3], [5, 3, 2]]) {
      const j = psiformJson(['radial', '--n', String(n), '--l', String(l), '--Z', String(Z)]);
      expect(Math.abs(j.mean_r - (3 * n * n - l * (l + 1)) / (2 * Z))).toBeLessThan(1e-9);
    }
  });

  it('most probable radius for l = n - 1 is n^2/Z (maximum of r^{2n} e^{-2Zr/n})', () => {
    for (const [n, Z] of [[1, 1], [2, 1], [3, 1], [3, 2]]) {
      const j = psiformJson(['radial', '--n', String(n), '--l', String(n - 1), '--Z', String(Z)]);
      expect(Math.abs(j.most_probable_r - (n * n) / Z)).toBeLessThan(1e-7);
    }
  });

  it('s-state turning point: E = -Z^2/2n^2 = -Z/r gives r = 2n^2/Z (1s: 2 a0, 2s: 8 a0)', () => {
    expect(Math.abs(psiformJson(['radial', '--n', '1', '--l', '0']).turning_point_r - 2)).toBeLessThan(1e-9);
    expect(Math.abs(psiformJson(['radial', '--n', '2', '--l', '0']).turning_point_r - 8)).toBeLessThan(1e-9);
    expect(Math.abs(psiformJson(['radial', '--n', '2', '--l', '0', '--Z', '2']).turning_point_r - 4)).toBeLessThan(1e-9);
  });

  it('turning point with l > 0 includes the centrifugal term: E_n = -Z/r + l(l+1)/2r^2 (2p: 4 + 2 sqrt2 a0)', () => {
    const j = psiformJson(['radial', '--n', '2', '--l', '1']);
    expect(Math.abs(j.turning_point_r - (4 + 2 * Math.SQRT2))).toBeLessThan(1e-9);
  });

  it.runIf(hasScipy())('agrees with SciPy (genlaguerre roots, quad integrals) for 5f, 6p, 7d at Z = 1, 2, 3', () => {
    // Reference: scipy.special.genlaguerre / eval_genlaguerre and scipy.integrate.quad on
    // R_nl ∝ rho^l e^{-rho/2} L^{(2l+1)}_{n-l-1}(rho), rho = 2Zr/n (Bethe & Salpeter §3).
    const cases = [[5, 3, 1, 7.5], [6, 1, 2, 20], [7, 2, 3, 10]];
    const ref = scipy(`
import json, numpy as np
from scipy import special, integrate, optimize
out = []
for n, l, Z, R in ${JSON.stringify(cases)}:
    L = special.genlaguerre(n - l - 1, 2 * l + 1)
    roots = sorted(float(x) * n / (2 * Z) for x in L.roots)
    f = lambda r: (2*Z*r/n)**(2*l) * np.exp(-2*Z*r/n) * special.eval_genlaguerre(n-l-1, 2*l+1, 2*Z*r/n)**2 * r**2
    tot = integrate.quad(f, 0, np.inf, limit=400)[0]
    mean = integrate.quad(lambda r: f(r) * r, 0, np.inf, limit=400)[0] / tot
    tail = integrate.quad(f, R, np.inf, limit=400)[0] / tot
    # global maximum of r^2 R^2: coarse grid, then a bounded refinement around the best sample
    grid = np.linspace(1e-6, 6.0 * n * n / Z, 200001)
    imax = grid[np.argmax(f(grid))]
    best = optimize.minimize_scalar(lambda r: -f(r), bounds=(imax - 0.01, imax + 0.01), method='bounded', options={'xatol': 1e-12}).x
    out.append({'nodes': roots, 'mean': mean, 'tail': tail, 'mp': float(best)})
print(json.dumps(out))
`);
    cases.forEach(([n, l, Z, R], i) => {
      const j = psiformJson(['radial', '--n', String(n), '--l', String(l), '--Z', String(Z), '--outside', String(R)]);
      expect(j.nodes).toHaveLength(ref[i].nodes.length);
      j.nodes.forEach((r: number, k: number) => expect(Math.abs(r - ref[i].nodes[k])).toBeLessThan(1e-8));
      expect(Math.abs(j.mean_r - ref[i].mean)).toBeLessThan(1e-7);
      expect(Math.abs(j.prob_outside - ref[i].tail)).toBeLessThan(1e-7);
      expect(Math.abs(j.most_probable_r - ref[i].mp)).toBeLessThan(1e-5);
    });
  });

  it('prints a readable summary without --json', () => {
    const r = psiform(['radial', '--n', '2', '--l', '0', '--outside', '2']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/radial nodes\s+2\b/);
    expect(r.stdout).toMatch(/one-electron hydrogen-like model/i);
    expect(r.stderr).toBe('');
  });
});
