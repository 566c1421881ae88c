import { describe, expect, it } from 'vitest';
import {
  F_CUBIC_SET,
  HYBRID_SETS,
  L_LETTERS,
  OrbitalState,
  REAL_LABEL_NAMES,
  bohr,
  compileState,
  parseOrbitalLabel,
  radialR,
  realY,
  sphericalY,
  stateNormSquared,
} from '../src';

/** mulberry32: small seeded PRNG so the "random" points are reproducible. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** The spherical route: sum_terms c * R_nl(r) * Y(theta, phi), independent of the Cartesian tables. */
function spherical(state: OrbitalState, x: number, y: number, z: number): { re: number; im: number } {
  const r = Math.hypot(x, y, z);
  const theta = r > 0 ? Math.acos(z / r) : 0;
  const phi = Math.atan2(y, x);
  let re = 0;
  let im = 0;
  for (const t of state.terms) {
    const R = radialR(t.n, t.l, state.Z, r);
    const Y = t.basis === 'real' ? { re: realY(t.l, t.m, theta, phi), im: 0 } : sphericalY(t.l, t.m, theta, phi);
    re += R * (t.re * Y.re - t.im * Y.im);
    im += R * (t.re * Y.im + t.im * Y.re);
  }
  return { re, im };
}

function allLabels(): string[] {
  const out: string[] = [];
  for (let n = 1; n <= 6; n++) {
    for (const name of REAL_LABEL_NAMES) {
      const l = (L_LETTERS as readonly string[]).indexOf(name[0]);
      if (l < n) out.push(`${n}${name}`);
    }
    for (let l = 0; l < n; l++) for (let m = -l; m <= l; m++) out.push(`${n}${L_LETTERS[l]}${m > 0 ? '+' : m < 0 ? '-' : ''}${Math.abs(m)}`);
  }
  for (const h of HYBRID_SETS) out.push(h, `${h}#2`);
  return out;
}

describe('compileState: Cartesian route vs spherical route', () => {
  const labels = allLabels();

  it(`evaluate() agrees with radialR·Y at random points to 1e-12 relative for ${labels.length} labels with n <= 6`, () => {
    const rand = rng(12345);
    expect(labels).toContain('4fx3');
    expect(labels).toContain('6h-5');
    for (const lab of labels) {
      for (const Z of [1, 2.5]) {
        const { state } = parseOrbitalLabel(lab, { Z });
        const c = compileState(state);
        const pts: number[][] = [];
        for (let i = 0; i < 24; i++) pts.push([0, 1, 2].map(() => ((rand() * 2 - 1) * 30) / Z));
        const refs = pts.map(([x, y, z]) => spherical(state, x, y, z));
        const scale = Math.max(...refs.map((v) => Math.hypot(v.re, v.im)));
        pts.forEach(([x, y, z], i) => {
          const got = c.evaluate(x, y, z);
          const want = refs[i];
          // 1e-12 relative, plus 1e-13 of the largest |psi| seen, for points that land near a nodal surface
          const tol = 1e-12 * Math.hypot(want.re, want.im) + 1e-13 * scale;
          expect(Math.abs(got.re - want.re)).toBeLessThanOrEqual(tol);
          expect(Math.abs(got.im - want.im)).toBeLessThanOrEqual(tol);
        });
      }
    }
  });

  it('superpositions with complex coefficients across n and l also agree', () => {
    const state: OrbitalState = {
      Z: 1.7,
      terms: [
        { n: 3, l: 2, m: 1, basis: 'complex', re: 0.4, im: -0.3 },
        { n: 4, l: 2, m: -2, basis: 'real', re: 0.2, im: 0.6 },
        { n: 2, l: 1, m: 1, basis: 'real', re: -0.5, im: 0 },
        { n: 4, l: 0, m: 0, basis: 'complex', re: 0.1, im: 0.1 },
      ],
    };
    const c = compileState(state);
    expect(c.isReal).toBe(false);
    // compileState applies the one normalisation rule: psi / sqrt(sum |c|² over the complex-basis expansion).
    const k = 1 / Math.sqrt(stateNormSquared(state));
    expect(Math.abs(k - 1)).toBeGreaterThan(0.01); // the coefficients above are not normalised
    const rand = rng(7);
    for (let i = 0; i < 200; i++) {
      const [x, y, z] = [0, 1, 2].map(() => (rand() * 2 - 1) * 15);
      const got = c.evaluate(x, y, z);
      const want = spherical(state, x, y, z);
      expect(Math.abs(got.re - k * want.re)).toBeLessThan(1e-13);
      expect(Math.abs(got.im - k * want.im)).toBeLessThan(1e-13);
    }
  });

  it('n = 12 states agree too (Laguerre degree 11)', () => {
    for (const lab of ['12s', '12p+1', '12dxy', '12fx3', '12k-7', '12o+11']) {
      const { state } = parseOrbitalLabel(lab);
      const c = compileState(state);
      const rand = rng(99);
      for (let i = 0; i < 20; i++) {
        const [x, y, z] = [0, 1, 2].map(() => (rand() * 2 - 1) * 200);
        const want = spherical(state, x, y, z);
        const got = c.evaluate(x, y, z);
        const tol = 1e-10 * Math.hypot(want.re, want.im) + 1e-20;
        expect(Math.abs(got.re - want.re)).toBeLessThanOrEqual(tol);
        expect(Math.abs(got.im - want.im)).toBeLessThanOrEqual(tol);
      }
    }
  });
});

describe('compileState: gradient', () => {
  it('agrees with central finite differences (h = 1e-5) for real and complex states', () => {
    const rand = rng(42);
    const g = new Float64Array(6);
    for (const lab of ['1s', '2pz', '3dz2', '3dxy', '4fx3', '5g+3', '6s', 'sp3d2#3', '4d-1']) {
      const c = compileState(parseOrbitalLabel(lab).state);
      for (let i = 0; i < 20; i++) {
        const p = [0, 1, 2].map(() => (rand() * 2 - 1) * 12);
        c.gradient(p[0], p[1], p[2], g);
        let scale = 0;
        for (let d = 0; d < 3; d++) {
          const hp = [...p];
          const hm = [...p];
          hp[d] += 1e-5;
          hm[d] -= 1e-5;
          const a = c.evaluate(hp[0], hp[1], hp[2]);
          const b = c.evaluate(hm[0], hm[1], hm[2]);
          const fdRe = (a.re - b.re) / 2e-5;
          const fdIm = (a.im - b.im) / 2e-5;
          scale = Math.max(scale, Math.abs(fdRe), Math.abs(fdIm));
          expect(Math.abs(g[d] - fdRe)).toBeLessThan(1e-7 * Math.abs(fdRe) + 1e-11);
          expect(Math.abs(g[3 + d] - fdIm)).toBeLessThan(1e-7 * Math.abs(fdIm) + 1e-11);
        }
        expect(scale).toBeGreaterThan(0);
      }
    }
  });

  it('2p_z gradient at the nucleus is (0, 0, R21\'(0) sqrt(3/4pi)) = (0, 0, sqrt(3/4pi)/sqrt(24)) (Griffiths Table 4.7)', () => {
    const g = new Float64Array(6);
    compileState(parseOrbitalLabel('2pz').state).gradient(0, 0, 0, g);
    expect(g[0]).toBe(0);
    expect(g[1]).toBe(0);
    expect(g[2]).toBeCloseTo(Math.sqrt(3 / (4 * Math.PI)) / Math.sqrt(24), 15);
  });
});

describe('compileState: sampleGrid', () => {
  // n = 3, extent 1: coordinates -1, 0, 1 on each axis, index = x + 3 (y + 3 z).
  const POINTS_27: Array<[number, number, number]> = [
    [-1, -1, -1], [0, -1, -1], [1, -1, -1], [-1, 0, -1], [0, 0, -1], [1, 0, -1], [-1, 1, -1], [0, 1, -1], [1, 1, -1],
    [-1, -1, 0], [0, -1, 0], [1, -1, 0], [-1, 0, 0], [0, 0, 0], [1, 0, 0], [-1, 1, 0], [0, 1, 0], [1, 1, 0],
    [-1, -1, 1], [0, -1, 1], [1, -1, 1], [-1, 0, 1], [0, 0, 1], [1, 0, 1], [-1, 1, 1], [0, 1, 1], [1, 1, 1],
  ];
  const grid = { n: 3, extent: bohr(1) };

  it('equals evaluate() at the 27 points of a 3³ grid with extent 1 (real and complex states)', () => {
    for (const lab of ['1s', '2px', '3dz2', '3dxy', '4fx3', 'sp3#3', '3d+2', '4f-1']) {
      const c = compileState(parseOrbitalLabel(lab).state);
      const re = new Float32Array(27);
      const im = new Float32Array(27).fill(NaN);
      c.sampleGrid(grid, re, im);
      POINTS_27.forEach(([x, y, z], i) => {
        const v = c.evaluate(x, y, z);
        expect(re[i]).toBe(Math.fround(v.re));
        expect(im[i]).toBe(Math.fround(v.im));
      });
    }
  });

  it('hand values: 1s at the centre is 2/sqrt(4pi) = 1/sqrt(pi); 2p_z at (0,0,1) is e^{-1/2}/sqrt(24)·sqrt(3/4pi) and zero in z = 0 (Griffiths Table 4.7)', () => {
    const s = new Float32Array(27);
    compileState(parseOrbitalLabel('1s').state).sampleGrid(grid, s, null);
    expect(s[13]).toBe(Math.fround(1 / Math.sqrt(Math.PI)));
    expect(s[26]).toBe(Math.fround(Math.exp(-Math.sqrt(3)) / Math.sqrt(Math.PI)));
    const p = new Float32Array(27);
    compileState(parseOrbitalLabel('2pz').state).sampleGrid(grid, p, null);
    expect(p[22]).toBe(Math.fround((Math.exp(-0.5) / Math.sqrt(24)) * Math.sqrt(3 / (4 * Math.PI))));
    expect(p[4]).toBe(-p[22]);
    for (let i = 9; i < 18; i++) expect(p[i]).toBe(0);
  });

  it('writes slabs into whole-grid or slab-sized arrays, identical to one full pass', () => {
    const c = compileState(parseOrbitalLabel('3d+1').state);
    const g = { n: 9, extent: bohr(6) };
    const fullRe = new Float32Array(729);
    const fullIm = new Float32Array(729);
    c.sampleGrid(g, fullRe, fullIm);
    const re = new Float32Array(729);
    const im = new Float32Array(729);
    c.sampleGrid(g, re, im, 0, 4);
    c.sampleGrid(g, re, im, 4, 9);
    expect(re).toEqual(fullRe);
    expect(im).toEqual(fullIm);
    const slabRe = new Float32Array(81 * 3);
    const slabIm = new Float32Array(81 * 3);
    c.sampleGrid(g, slabRe, slabIm, 2, 5);
    expect(slabRe).toEqual(fullRe.subarray(162, 405));
    expect(slabIm).toEqual(fullIm.subarray(162, 405));
  });

  it('rejects bad arguments with clear messages', () => {
    const real = compileState(parseOrbitalLabel('2pz').state);
    const cplx = compileState(parseOrbitalLabel('2p+1').state);
    expect(() => real.sampleGrid(grid, new Float32Array(26), null)).toThrow(/outRe has length 26/);
    expect(() => cplx.sampleGrid(grid, new Float32Array(27), null)).toThrow(/pass outIm/);
    expect(() => real.sampleGrid({ n: 1, extent: bohr(1) }, new Float32Array(1), null)).toThrow(/grid.n must be an integer >= 2/);
    expect(() => real.sampleGrid({ n: 3, extent: bohr(-1) }, new Float32Array(27), null)).toThrow(/grid.extent/);
    expect(() => real.sampleGrid({ n: 600, extent: bohr(1) }, new Float32Array(1), null)).toThrow(/maximum of 512/);
    expect(() => real.sampleGrid(grid, new Float32Array(27), null, 2, 1)).toThrow(/zStart <= zEnd/);
    expect(() => compileState({ Z: 1, terms: [{ n: 2, l: 2, m: 0, basis: 'real', re: 1, im: 0 }] })).toThrow(/terms\[0\]/);
  });
});

describe('real labels are real, with the chemists\' signs', () => {
  it('every real label and hybrid compiles to isReal with Im = 0 on the grid', () => {
    const labels = [...REAL_LABEL_NAMES.map((n) => `4${n}`), ...F_CUBIC_SET.map((n) => `5${n}`), ...HYBRID_SETS.map((h) => `${h}#2`)];
    for (const lab of labels) {
      const c = compileState(parseOrbitalLabel(lab).state);
      expect(c.isReal).toBe(true);
      const re = new Float32Array(125);
      const im = new Float32Array(125).fill(1);
      c.sampleGrid({ n: 5, extent: bohr(8) }, re, im);
      expect(im.every((v) => v === 0)).toBe(true);
      expect(re.some((v) => v !== 0)).toBe(true);
      expect(c.evaluate(1.3, -0.4, 2.2).im).toBe(0);
    }
  });

  it('signs: p_x > 0 at +x, p_y > 0 at +y, p_z > 0 at +z, d_xy > 0 at x = y > 0, d_x²−y² > 0 on x, d_z² > 0 on z, f_x³ > 0 at +x', () => {
    const at = (lab: string, x: number, y: number, z: number) => compileState(parseOrbitalLabel(lab).state).evaluate(x, y, z).re;
    expect(at('2px', 1, 0, 0)).toBeGreaterThan(0);
    expect(at('2px', -1, 0, 0)).toBeLessThan(0);
    expect(at('2py', 0, 1, 0)).toBeGreaterThan(0);
    expect(at('2pz', 0, 0, 1)).toBeGreaterThan(0);
    expect(at('3dxy', 1, 1, 0)).toBeGreaterThan(0);
    expect(at('3dxy', 1, -1, 0)).toBeLessThan(0);
    expect(at('3dxz', 1, 0, 1)).toBeGreaterThan(0);
    expect(at('3dyz', 0, 1, 1)).toBeGreaterThan(0);
    expect(at('3dx2-y2', 1, 0, 0)).toBeGreaterThan(0);
    expect(at('3dx2-y2', 0, 1, 0)).toBeLessThan(0);
    expect(at('3dz2', 0, 0, 1)).toBeGreaterThan(0);
    expect(at('3dz2', 1, 0, 0)).toBeLessThan(0);
    expect(at('4fx3', 1, 0, 0)).toBeGreaterThan(0);
    expect(at('4fy3', 0, 1, 0)).toBeGreaterThan(0);
    expect(at('4fz3', 0, 0, 1)).toBeGreaterThan(0);
    expect(at('4fxyz', 1, 1, 1)).toBeGreaterThan(0);
    // p_x and d_xy vanish on their nodal planes
    expect(at('2px', 0, 0.7, -0.3)).toBe(0);
    expect(at('3dxy', 0, 0.7, -0.3)).toBe(0);
  });
});
