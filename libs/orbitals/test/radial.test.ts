import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  classicalTurningPoint,
  gaussLaguerreRule,
  genLaguerre,
  innerTurningPoint,
  meanRadius,
  meanRadiusNumeric,
  mostProbableRadius,
  oneSEnclosingIsovalue,
  oneSEnclosingRadius,
  probabilityInside,
  probabilityOutside,
  radialDistribution,
  radialNodes,
  radialR,
  radialSeries,
  radiusForProbability,
} from '../src';

const ref = JSON.parse(readFileSync(join(__dirname, '../../../test/reference/scipy-vectors.json'), 'utf8')) as {
  eval_genlaguerre: Array<{ k: number; alpha: number; x: number; value: number }>;
  roots_laguerre_20: { nodes: number[]; weights: number[] };
};

/** Composite Simpson on [0, b] with m (even) panels: an integration route independent of the library. */
function simpson(f: (x: number) => number, b: number, m = 4000): number {
  const h = b / m;
  let s = f(0) + f(b);
  for (let i = 1; i < m; i++) s += (i % 2 ? 4 : 2) * f(i * h);
  return (s * h) / 3;
}

// Griffiths, Introduction to Quantum Mechanics (2nd ed.), Table 4.7, a = a0 = 1, Z = 1.
const TABLE_4_7: Record<string, (r: number) => number> = {
  '1,0': (r) => 2 * Math.exp(-r),
  '2,0': (r) => (1 / Math.SQRT2) * (1 - r / 2) * Math.exp(-r / 2),
  '2,1': (r) => (1 / Math.sqrt(24)) * r * Math.exp(-r / 2),
  '3,0': (r) => (2 / Math.sqrt(27)) * (1 - (2 * r) / 3 + (2 * r * r) / 27) * Math.exp(-r / 3),
  '3,1': (r) => (8 / (27 * Math.sqrt(6))) * (1 - r / 6) * r * Math.exp(-r / 3),
  '3,2': (r) => (4 / (81 * Math.sqrt(30))) * r * r * Math.exp(-r / 3),
  '4,0': (r) => 0.25 * (1 - (3 * r) / 4 + (r * r) / 8 - (r * r * r) / 192) * Math.exp(-r / 4),
  '4,1': (r) => (Math.sqrt(5) / (16 * Math.sqrt(3))) * (1 - r / 4 + (r * r) / 80) * r * Math.exp(-r / 4),
  '4,2': (r) => (1 / (64 * Math.sqrt(5))) * (1 - r / 12) * r * r * Math.exp(-r / 4),
  '4,3': (r) => (1 / (768 * Math.sqrt(35))) * r * r * r * Math.exp(-r / 4),
};

describe('generalised Laguerre polynomials', () => {
  it('match scipy.special.eval_genlaguerre (test/reference/scipy-vectors.json) to 1e-12 relative', () => {
    expect(ref.eval_genlaguerre.length).toBeGreaterThan(100);
    for (const v of ref.eval_genlaguerre) {
      const got = genLaguerre(v.k, v.alpha, v.x);
      expect(Math.abs(got - v.value)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(v.value)));
    }
  });

  it('20-point Gauss–Laguerre rule matches scipy.special.roots_laguerre(20)', () => {
    const { nodes, weights } = gaussLaguerreRule(20);
    for (let i = 0; i < 20; i++) {
      expect(nodes[i]).toBeCloseTo(ref.roots_laguerre_20.nodes[i], 10);
      expect(Math.abs(weights[i] - ref.roots_laguerre_20.weights[i])).toBeLessThanOrEqual(1e-12 * ref.roots_laguerre_20.weights[i] + 1e-300);
    }
  });
});

describe('radial functions R_nl', () => {
  it('equal the closed forms of Griffiths Table 4.7 for n <= 4 (Z = 1 and, scaled by Z^{3/2} R(Zr), Z = 3)', () => {
    for (const [key, f] of Object.entries(TABLE_4_7)) {
      const [n, l] = key.split(',').map(Number);
      for (const r of [0, 0.1, 0.77, 1.5, 2, 3.3, 6.1, 11, 25]) {
        const want = f(r);
        expect(Math.abs(radialR(n, l, 1, r) - want)).toBeLessThanOrEqual(1e-13 * Math.max(Math.abs(want), 1e-3));
        const want3 = Math.pow(3, 1.5) * f(3 * r);
        expect(Math.abs(radialR(n, l, 3, r) - want3)).toBeLessThanOrEqual(1e-13 * Math.max(Math.abs(want3), 1e-3));
      }
    }
  });

  it('are normalised, ∫ R² r² dr = 1, for every n <= 12 and every l (Simpson quadrature)', () => {
    for (let n = 1; n <= 12; n++) {
      for (let l = 0; l < n; l++) {
        const b = n * (2 * n + 40); // rho = 2r/n = 4n + 80: the tail beyond is < 1e-20
        const I = simpson((r) => radialDistribution(n, l, 1, r), b, 40000);
        expect(Math.abs(I - 1)).toBeLessThan(1e-10);
      }
    }
  });

  it('reject invalid quantum numbers with a readable message', () => {
    expect(() => radialR(13, 0, 1, 1)).toThrow(/n must be between 1 and 12/);
    expect(() => radialR(2, 2, 1, 1)).toThrow(/l must be less than n \(got n=2, l=2\)/);
    expect(() => radialR(2, 1, 0, 1)).toThrow(/Z must be a positive/);
  });
});

describe('expectation values and special radii', () => {
  it('<r> = (a0/2Z)[3n² − l(l+1)] for every state with n <= 6 (Bethe & Salpeter, Quantum Mechanics of One- and Two-Electron Atoms, §3, eq. 3.26 — equation number from memory): Simpson and Gauss–Laguerre', () => {
    for (const Z of [1, 2]) {
      for (let n = 1; n <= 6; n++) {
        for (let l = 0; l < n; l++) {
          const formula = (3 * n * n - l * (l + 1)) / (2 * Z);
          expect(meanRadius(n, l, Z)).toBeCloseTo(formula, 14);
          const simp = simpson((r) => r * radialDistribution(n, l, Z, r), (10 * n * n + 40) / Z, 20000);
          expect(Math.abs(simp - formula)).toBeLessThan(1e-9 * formula);
          expect(Math.abs(meanRadiusNumeric(n, l, Z) - formula)).toBeLessThan(1e-12 * formula);
        }
      }
    }
  });

  it('2s node at 2 a0/Z; 3s nodes at (9 ± 3√3)/2 a0/Z (roots of the Griffiths Table 4.7 polynomials)', () => {
    for (const Z of [1, 2.5]) {
      const n2 = radialNodes(2, 0, Z);
      expect(n2).toHaveLength(1);
      expect(Math.abs(n2[0] - 2 / Z)).toBeLessThan(1e-9);
      const n3 = radialNodes(3, 0, Z);
      expect(n3).toHaveLength(2);
      expect(Math.abs(n3[0] - (9 - 3 * Math.sqrt(3)) / 2 / Z)).toBeLessThan(1e-9);
      expect(Math.abs(n3[1] - (9 + 3 * Math.sqrt(3)) / 2 / Z)).toBeLessThan(1e-9);
    }
    expect(radialNodes(3, 1, 1)[0]).toBeCloseTo(6, 9); // 1 - r/6 = 0 (Table 4.7)
    expect(radialNodes(4, 2, 1)[0]).toBeCloseTo(12, 9); // 1 - r/12 = 0 (Table 4.7)
    expect(radialNodes(3, 2, 1)).toEqual([]);
  });

  it('finds n-l-1 nodes for every n <= 12, each a zero of R_nl', () => {
    for (let n = 1; n <= 12; n++) {
      for (let l = 0; l < n; l++) {
        const nodes = radialNodes(n, l, 1);
        expect(nodes).toHaveLength(n - l - 1);
        for (const r0 of nodes) {
          const d = 1e-7 * r0;
          expect(Math.sign(radialR(n, l, 1, r0 - d))).toBe(-Math.sign(radialR(n, l, 1, r0 + d)));
        }
      }
    }
  });

  it('most probable radius is n² a0/Z for l = n−1 (d/dr[r^{2n} e^{−2Zr/n}] = 0 with R_{n,n−1} ∝ r^{n−1} e^{−Zr/n}, Griffiths eq. 4.89)', () => {
    for (let n = 1; n <= 12; n++) {
      expect(Math.abs(mostProbableRadius(n, n - 1, 1) - n * n)).toBeLessThan(1e-9 * n * n);
      expect(Math.abs(mostProbableRadius(n, n - 1, 2) - (n * n) / 2)).toBeLessThan(1e-9 * n * n);
    }
    // 2s: d/dr[r²(1-r/2)² e^{-r}] = 0 -> r = 3 + √5 (outer lobe), from the Table 4.7 form
    expect(mostProbableRadius(2, 0, 1)).toBeCloseTo(3 + Math.sqrt(5), 9);
  });

  it('1s probability beyond 2 a0 (the classically forbidden region of the ground state) is 13/e⁴ ≈ 0.2381 (a fact of the trade; = e^{−4}(1 + 4 + 8) from the 1s closed form)', () => {
    expect(Math.abs(probabilityOutside(1, 0, 1, 2) - 13 / Math.exp(4))).toBeLessThan(1e-12);
    expect(probabilityOutside(1, 0, 1, 2)).toBeCloseTo(0.2381, 4);
    expect(classicalTurningPoint(1, 0, 1)).toBe(2);
  });

  it('P(r<R) + P(r>R) = 1 and both match 1 − e^{−2ρ}(1+2ρ+2ρ²) for 1s and Simpson for other states to 1e-10', () => {
    for (const R of [0.01, 0.5, 1, 2.66116, 7, 30]) {
      const closed = 1 - Math.exp(-2 * R) * (1 + 2 * R + 2 * R * R);
      expect(Math.abs(probabilityInside(1, 0, 1, R) - closed)).toBeLessThan(1e-12);
      expect(Math.abs(probabilityInside(1, 0, 1, R) + probabilityOutside(1, 0, 1, R) - 1)).toBeLessThan(1e-13);
    }
    for (const [n, l, R] of [
      [3, 1, 4],
      [5, 0, 30],
      [8, 3, 60],
      [12, 0, 100],
      [12, 11, 150],
    ] as const) {
      const s = simpson((r) => radialDistribution(n, l, 1, r), R, 20000);
      expect(Math.abs(probabilityInside(n, l, 1, R) - s)).toBeLessThan(1e-10);
      expect(Math.abs(probabilityInside(n, l, 1, R) + probabilityOutside(n, l, 1, R) - 1)).toBeLessThan(1e-12);
    }
    expect(probabilityInside(2, 1, 1, 0)).toBe(0);
    expect(probabilityOutside(2, 1, 1, Infinity)).toBe(0);
  });

  it('1s 90 % sphere radius is ρ ≈ 2.66116 a0 from the closed form, scales as 1/Z; isovalue R_10(ρ)/√(4π)', () => {
    const r90 = oneSEnclosingRadius(0.9, 1);
    expect(r90).toBeCloseTo(2.66116, 5);
    expect(1 - Math.exp(-2 * r90) * (1 + 2 * r90 + 2 * r90 * r90)).toBeCloseTo(0.9, 14);
    expect(oneSEnclosingRadius(0.9, 2)).toBeCloseTo(r90 / 2, 14);
    expect(oneSEnclosingIsovalue(0.9, 1)).toBeCloseTo(radialR(1, 0, 1, r90) / Math.sqrt(4 * Math.PI), 14);
    expect(radiusForProbability(1, 0, 1, 0.9)).toBeCloseTo(r90, 10);
    expect(() => oneSEnclosingRadius(1.2)).toThrow(/fraction/);
  });

  it('outer classical turning point solves −Z²/(2n²) = −Z/r + l(l+1)/(2r²); l = 0 gives 2n²/Z', () => {
    for (const Z of [1, 3]) {
      for (let n = 1; n <= 12; n++) {
        expect(classicalTurningPoint(n, 0, Z)).toBeCloseTo((2 * n * n) / Z, 12);
        for (let l = 1; l < n; l++) {
          for (const r of [classicalTurningPoint(n, l, Z), innerTurningPoint(n, l, Z)]) {
            const E = -(Z * Z) / (2 * n * n);
            expect(Math.abs(-Z / r + (l * (l + 1)) / (2 * r * r) - E)).toBeLessThan(1e-12 * Math.abs(E) * 10);
          }
          expect(classicalTurningPoint(n, l, Z)).toBeGreaterThan(innerTurningPoint(n, l, Z));
        }
      }
    }
  });
});

describe('radialSeries', () => {
  it('samples R and r²R² on 0..rMax and reports nodes and turning point', () => {
    const s = radialSeries(3, 0, 1, { rMax: 20, samples: 201 });
    expect(s.r).toHaveLength(201);
    expect(s.r[0]).toBe(0);
    expect(s.r[200]).toBe(20);
    expect(s.R[100]).toBeCloseTo(TABLE_4_7['3,0'](10), 14);
    expect(s.P[100]).toBeCloseTo(100 * TABLE_4_7['3,0'](10) ** 2, 14);
    expect(s.nodes).toHaveLength(2);
    expect(s.turningPoint).toBe(18);
    const d = radialSeries(2, 1, 1);
    expect(d.rMax).toBeGreaterThanOrEqual(radiusForProbability(2, 1, 1, 0.999));
    expect(d.r).toHaveLength(401);
    expect(() => radialSeries(2, 1, 1, { samples: 1 })).toThrow(/samples/);
  });
});
