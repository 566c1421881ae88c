import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { assocLegendre, evalPoly, gaussLegendreRule, parseOrbitalLabel, realSolidHarmonic, realY, solidHarmonic, sphericalY } from '../src';

const ref = JSON.parse(readFileSync(join(__dirname, '../../../test/reference/scipy-vectors.json'), 'utf8')) as {
  sph_harm: Array<{ l: number; m: number; theta: number; phi: number; re: number; im: number }>;
  lpmv: Array<{ l: number; m: number; x: number; value: number }>;
};

describe('spherical harmonics (Condon–Shortley phase)', () => {
  it('Y_lm matches scipy.special.sph_harm(m, l, azimuth, polar) for l <= 6 (test/reference/scipy-vectors.json)', () => {
    expect(ref.sph_harm.length).toBe(196);
    for (const v of ref.sph_harm) {
      const y = sphericalY(v.l, v.m, v.theta, v.phi);
      expect(Math.abs(y.re - v.re)).toBeLessThan(1e-13);
      expect(Math.abs(y.im - v.im)).toBeLessThan(1e-13);
    }
  });

  it('P_l^m matches scipy.special.lpmv (which includes the Condon–Shortley phase)', () => {
    for (const v of ref.lpmv) expect(Math.abs(assocLegendre(v.l, v.m, v.x) - v.value)).toBeLessThan(1e-12 * Math.max(1, Math.abs(v.value)));
  });

  // Gauss–Legendre in cos(theta) (16 points: exact for the polynomial degree <= 8 here) x uniform phi
  // (18 points: exact for trigonometric degree < 18).
  function sphereQuadrature(f: (theta: number, phi: number) => number): number {
    const { nodes, weights } = gaussLegendreRule(16);
    const M = 18;
    let s = 0;
    for (let i = 0; i < nodes.length; i++) {
      const theta = Math.acos(nodes[i]);
      for (let j = 0; j < M; j++) s += weights[i] * (2 * Math.PI / M) * f(theta, (2 * Math.PI * j) / M + 0.1);
    }
    return s;
  }

  it('are orthonormal on the sphere for l <= 4: ∫ conj(Y_lm) Y_l\'m\' dΩ = δ δ (quadrature)', () => {
    const lm: Array<[number, number]> = [];
    for (let l = 0; l <= 4; l++) for (let m = -l; m <= l; m++) lm.push([l, m]);
    for (const [l1, m1] of lm) {
      for (const [l2, m2] of lm) {
        const re = sphereQuadrature((t, p) => {
          const a = sphericalY(l1, m1, t, p);
          const b = sphericalY(l2, m2, t, p);
          return a.re * b.re + a.im * b.im;
        });
        const im = sphereQuadrature((t, p) => {
          const a = sphericalY(l1, m1, t, p);
          const b = sphericalY(l2, m2, t, p);
          return a.re * b.im - a.im * b.re;
        });
        expect(Math.abs(re - (l1 === l2 && m1 === m2 ? 1 : 0))).toBeLessThan(1e-13);
        expect(Math.abs(im)).toBeLessThan(1e-13);
      }
    }
  });

  it('real forms are orthonormal for l <= 4 as well', () => {
    for (let l1 = 0; l1 <= 4; l1++)
      for (let m1 = -l1; m1 <= l1; m1++)
        for (let l2 = 0; l2 <= 4; l2++)
          for (let m2 = -l2; m2 <= l2; m2++) {
            const s = sphereQuadrature((t, p) => realY(l1, m1, t, p) * realY(l2, m2, t, p));
            expect(Math.abs(s - (l1 === l2 && m1 === m2 ? 1 : 0))).toBeLessThan(1e-13);
          }
  });

  it('solid harmonics r^l Y_lm (Cartesian polynomials) equal r^l Y_lm from the angular route for l <= 11', () => {
    const pts = [
      [0.3, -0.7, 0.5],
      [-1.2, 0.4, -0.9],
      [0.05, 0.9, 1.7],
    ];
    for (let l = 0; l <= 11; l++) {
      for (let m = -l; m <= l; m++) {
        for (const [x, y, z] of pts) {
          const r = Math.hypot(x, y, z);
          const Y = sphericalY(l, m, Math.acos(z / r), Math.atan2(y, x));
          const P = evalPoly(solidHarmonic(l, m), x, y, z);
          const rl = Math.pow(r, l);
          expect(Math.abs(P.re - rl * Y.re)).toBeLessThan(1e-12 * rl);
          expect(Math.abs(P.im - rl * Y.im)).toBeLessThan(1e-12 * rl);
        }
      }
    }
  });
});

/** Checks that the real polynomial of a label equals k * target(x,y,z) with k > 0 at random points. */
function proportional(label: string, target: (x: number, y: number, z: number) => number): number {
  const { state } = parseOrbitalLabel(`4${label}`);
  const l = state.terms[0].l;
  const f = (x: number, y: number, z: number) => {
    let s = 0;
    for (const t of state.terms) s += t.re * evalPoly(realSolidHarmonic(l, t.m), x, y, z).re;
    return s;
  };
  const pts = [
    [0.31, 0.77, -0.52],
    [-0.9, 0.12, 0.44],
    [0.6, -0.35, 0.95],
    [1.1, 0.8, 0.3],
  ];
  const k = f(pts[0][0], pts[0][1], pts[0][2]) / target(pts[0][0], pts[0][1], pts[0][2]);
  for (const [x, y, z] of pts) expect(Math.abs(f(x, y, z) - k * target(x, y, z))).toBeLessThan(1e-12 * Math.abs(k));
  return k;
}

describe('real forms: chemists\' conventions (common practice; signs positive along the named direction)', () => {
  const r2 = (x: number, y: number, z: number) => x * x + y * y + z * z;
  it('p and d real forms are positive multiples of x, y, z, xy, yz, xz, 3z²−r², x²−y²', () => {
    const cases: Array<[string, (x: number, y: number, z: number) => number]> = [
      ['px', (x) => x],
      ['py', (_x, y) => y],
      ['pz', (_x, _y, z) => z],
      ['dxy', (x, y) => x * y],
      ['dyz', (_x, y, z) => y * z],
      ['dxz', (x, _y, z) => x * z],
      ['dz2', (x, y, z) => 3 * z * z - r2(x, y, z)],
      ['dx2-y2', (x, y) => x * x - y * y],
    ];
    for (const [lab, f] of cases) expect(proportional(lab, f)).toBeGreaterThan(0);
    // normalisation of p: sqrt(3/4pi) x/r
    expect(proportional('px', (x) => x)).toBeCloseTo(Math.sqrt(3 / (4 * Math.PI)), 14);
  });

  it('realY (angular route) has the same signs: p_x, p_y, d_xy, d_yz, d_xz, d_x²−y² positive in their named directions', () => {
    const deg = Math.PI / 180;
    expect(realY(1, 1, 90 * deg, 0)).toBeCloseTo(Math.sqrt(3 / (4 * Math.PI)), 15); // +x
    expect(realY(1, -1, 90 * deg, 90 * deg)).toBeCloseTo(Math.sqrt(3 / (4 * Math.PI)), 15); // +y
    expect(realY(1, 0, 0, 0)).toBeCloseTo(Math.sqrt(3 / (4 * Math.PI)), 15); // +z
    expect(realY(2, -2, 90 * deg, 45 * deg)).toBeGreaterThan(0); // x = y > 0
    expect(realY(2, -1, 45 * deg, 90 * deg)).toBeGreaterThan(0); // y = z > 0
    expect(realY(2, 1, 45 * deg, 0)).toBeGreaterThan(0); // x = z > 0
    expect(realY(2, 2, 90 * deg, 0)).toBeGreaterThan(0); // +x
    expect(realY(2, 2, 90 * deg, 90 * deg)).toBeLessThan(0); // +y
    expect(realY(3, -3, 90 * deg, 30 * deg)).toBeGreaterThan(0); // y(3x²−y²) at phi = 30°
  });

  it('general-set f forms: z(5z²−3r²), x(5z²−r²), y(5z²−r²), xyz, z(x²−y²), x(x²−3y²), y(3x²−y²)', () => {
    const cases: Array<[string, (x: number, y: number, z: number) => number]> = [
      ['fz3', (x, y, z) => z * (5 * z * z - 3 * r2(x, y, z))],
      ['fxz2', (x, y, z) => x * (5 * z * z - r2(x, y, z))],
      ['fyz2', (x, y, z) => y * (5 * z * z - r2(x, y, z))],
      ['fxyz', (x, y, z) => x * y * z],
      ['fz(x2-y2)', (x, y, z) => z * (x * x - y * y)],
      ['fx(x2-3y2)', (x, y) => x * (x * x - 3 * y * y)],
      ['fy(3x2-y2)', (x, y) => y * (3 * x * x - y * y)],
    ];
    for (const [lab, f] of cases) expect(proportional(lab, f)).toBeGreaterThan(0);
  });

  it('cubic-set f forms: x(5x²−3r²), y(5y²−3r²), x(y²−z²), y(z²−x²), with unit norm', () => {
    const cases: Array<[string, (x: number, y: number, z: number) => number, number]> = [
      // normalisation constants by symmetry with f_z³ = sqrt(7/16pi) z(5z²−3r²) and f_z(x²−y²) = sqrt(105/16pi) z(x²−y²)
      ['fx3', (x, y, z) => x * (5 * x * x - 3 * r2(x, y, z)), Math.sqrt(7 / (16 * Math.PI))],
      ['fy3', (x, y, z) => y * (5 * y * y - 3 * r2(x, y, z)), Math.sqrt(7 / (16 * Math.PI))],
      ['fx(y2-z2)', (x, y, z) => x * (y * y - z * z), Math.sqrt(105 / (16 * Math.PI))],
      ['fy(z2-x2)', (x, y, z) => y * (z * z - x * x), Math.sqrt(105 / (16 * Math.PI))],
      ['fz3', (x, y, z) => z * (5 * z * z - 3 * r2(x, y, z)), Math.sqrt(7 / (16 * Math.PI))],
    ];
    for (const [lab, f, k] of cases) expect(proportional(lab, f)).toBeCloseTo(k, 13);
  });
});
