import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { compileState, fieldBound, parseOrbitalLabel, stateFromNlm, type OrbitalState } from '../src';

/** SciPy from Debian's python (python3-scipy, installed by npm test's set-up): the independent reference. */
function scipy(script: string): any {
  const r = spawnSync('/usr/bin/python3', ['-c', script], { encoding: 'utf8', timeout: 120000 });
  if (r.status !== 0) throw new Error(`python failed (Debian python3-scipy is needed): ${r.stderr}`);
  return JSON.parse(r.stdout);
}

const label = (s: string) => parseOrbitalLabel(s).state;
const sp3: OrbitalState = { Z: 1, terms: [{ n: 2, l: 0, m: 0, basis: 'real', re: 0.5, im: 0 }, { n: 2, l: 1, m: 0, basis: 'real', re: Math.sqrt(0.75), im: 0 }] };

describe('sampleBox: a block of a cube grid, bit for bit', () => {
  it('equals the same points of sampleGrid for real, superposed and complex states', () => {
    for (const state of [label('3dz2'), sp3, stateFromNlm(3, 2, 1, { complex: true })]) {
      const c = compileState(state);
      const n = 13;
      const E = 9;
      const re = new Float32Array(n ** 3);
      const im = new Float32Array(n ** 3);
      c.sampleGrid({ n, extent: E as never }, re, im);
      const size = [4, 5, 3] as const;
      const start = [7, 2, 9] as const;
      const br = new Float32Array(60);
      const bi = new Float32Array(60);
      c.sampleBox({ origin: [-E, -E, -E], spacing: (2 * E) / (n - 1), start, size }, br, bi);
      for (let k = 0, i = 0; k < size[2]; k++)
        for (let j = 0; j < size[1]; j++)
          for (let q = 0; q < size[0]; q++, i++) {
            const g = start[0] + q + n * (start[1] + j + n * (start[2] + k));
            expect(br[i]).toBe(re[g]);
            expect(bi[i]).toBe(im[g]);
          }
    }
  });

  it('refuses bad blocks with a message', () => {
    const c = compileState(label('2pz'));
    expect(() => c.sampleBox({ origin: [0, 0, 0], spacing: 0.1, start: [0, 0, 0], size: [2, 2, 0] }, new Float32Array(8), null)).toThrow(/sizes/);
    expect(() => c.sampleBox({ origin: [0, 0, 0], spacing: 0.1, start: [0, 0, 0], size: [2, 2, 2] }, new Float32Array(4), null)).toThrow(/outRe/);
  });
});

describe('fieldBound: enclosures of psi over boxes never miss a value', () => {
  it('every sampled value of every box lies inside the enclosure (5000 random boxes, 6 states)', () => {
    let seed = 12345;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
    const w = new Float64Array(4);
    const misses: string[] = [];
    for (const state of [label('1s'), label('3dz2'), label('4fxyz'), label('5s'), sp3, stateFromNlm(4, 3, 2, { complex: true })]) {
      const c = compileState(state);
      const fb = fieldBound(c);
      for (let b = 0; b < 850; b++) {
        const size = 0.05 + rnd() * (b % 3 === 0 ? 8 : 1);
        const x0 = (rnd() - 0.5) * 30, y0 = (rnd() - 0.5) * 30, z0 = (rnd() - 0.5) * 30;
        fb.box(x0, x0 + size, y0, y0 + size * 0.7, z0, z0 + size * 1.3, w);
        for (let s = 0; s < 6; s++) {
          const v = c.evaluate(x0 + rnd() * size, y0 + rnd() * size * 0.7, z0 + rnd() * size * 1.3);
          if (!(v.re >= w[0] && v.re <= w[1] && v.im >= w[2] && v.im <= w[3])) misses.push(`${b}: ${v.re}, ${v.im} not in [${w.join(', ')}]`);
        }
      }
    }
    expect(misses).toEqual([]);
  });

  it('a box around a value gets a tight range: width shrinks like the box (centred form), ≤ 3 × the true spread for small boxes', () => {
    const c = compileState(label('3dz2'));
    const fb = fieldBound(c);
    const w = new Float64Array(4);
    const p = [3.1, -1.7, 4.2];
    let prevWidth = Infinity;
    for (const half of [0.4, 0.1, 0.025]) {
      fb.box(p[0] - half, p[0] + half, p[1] - half, p[1] + half, p[2] - half, p[2] + half, w);
      let lo = Infinity, hi = -Infinity;
      for (let i = 0; i <= 8; i++)
        for (let j = 0; j <= 8; j++)
          for (let k = 0; k <= 8; k++) {
            const v = c.evaluate(p[0] - half + (i * half) / 4, p[1] - half + (j * half) / 4, p[2] - half + (k * half) / 4).re;
            lo = Math.min(lo, v);
            hi = Math.max(hi, v);
          }
      const width = w[1] - w[0];
      expect(width).toBeLessThan(3 * (hi - lo));
      expect(width).toBeLessThan(prevWidth / 3);
      prevWidth = width;
    }
  });

  it('away from the nucleus the bound is radial × direction: 2p_z round its radial peak r = 2 is exact to the padding', () => {
    // 2p_z = R_21(r) Y_10, R_21 = r e^{-r/2} / √24 (Griffiths Table 4.7), Y_10 = √(3/4π) cos θ: psi = z e^{-r/2} / √(32π).
    // d/dr (r e^{-r/2}) = 0 at r = 2 (by hand), so over a thin box round (0, 0, 2) the largest psi is psi(0, 0, 2).
    // A product of separate ranges of e^{-r/2} and z would overshoot by (z1 / 2) e^{(2 - r0) / 2} ≈ 10 % here.
    const c = compileState(label('2pz'));
    const fb = fieldBound(c);
    const w = new Float64Array(4);
    fb.box(-0.01, 0.01, -0.01, 0.01, 1.9, 2.1, w);
    const top = (2 * Math.exp(-1)) / Math.sqrt(32 * Math.PI);
    expect(w[1]).toBeGreaterThanOrEqual(top);
    expect(w[1] / top - 1).toBeLessThan(1e-5);
    // The lower end: the smaller of R at r0 = 1.9 and r1 = √(2.1² + 2 · 0.01²) times the smallest cos θ of the box.
    const R21 = (r: number) => (r * Math.exp(-r / 2)) / Math.sqrt(24);
    const lowest = Math.min(R21(1.9), R21(Math.hypot(0.01, 0.01, 2.1))) * Math.sqrt(3 / (4 * Math.PI)) * (1.9 / Math.hypot(1.9, 0.01, 0.01));
    expect(w[0]).toBeLessThanOrEqual(c.evaluate(0.01, 0.01, 2.1).re);
    expect(Math.abs(w[0] / lowest - 1)).toBeLessThan(1e-5);
  });

  it('radialRange: 2s, g = R_20 (closed form (2 − r) e^{-r/2} / (2√2), Griffiths Table 4.7) has its minimum at r = 4 inside [1, 6]', () => {
    const fb = fieldBound(compileState(label('2s')));
    const out = new Float64Array(2);
    fb.radialRange(0, 1, 6, out);
    const R = (r: number) => ((2 - r) * Math.exp(-r / 2)) / (2 * Math.SQRT2);
    expect(out[0]).toBeCloseTo(R(4), 12);
    expect(out[1]).toBeCloseTo(R(1), 12);
    expect(() => fb.radialRange(0, 3, 2, out)).toThrow(/r0/);
  });
});

describe('the analytic gradient (what surface projection and normals use)', () => {
  it('2p_z: value and gradient equal the closed form ψ = z e^{-r/2} / √(32π) (Griffiths Table 4.7 × Y_10)', () => {
    const c = compileState(label('2pz'));
    const out = new Float64Array(8);
    for (const [x, y, z] of [[0.3, -1.2, 2.1], [-2.5, 0.7, -0.4], [1, 1, 1]]) {
      c.gradient(x, y, z, out);
      const r = Math.hypot(x, y, z);
      const k = 1 / Math.sqrt(32 * Math.PI);
      const e = Math.exp(-r / 2);
      expect(out[6]).toBeCloseTo(k * z * e, 14);
      expect(out[0]).toBeCloseTo(k * z * e * (-x / (2 * r)), 14);
      expect(out[1]).toBeCloseTo(k * z * e * (-y / (2 * r)), 14);
      expect(out[2]).toBeCloseTo(k * e * (1 - (z * z) / (2 * r)), 14);
    }
  });

  it('matches SciPy central differences of psi built from scipy.special (genlaguerre, sph_harm_y) for a complex 4f(m = 2) and a 3d superposition, to 1e-7 relative', () => {
    const pts = [[1.3, -0.4, 2.2], [-3.1, 2.6, -0.9], [0.5, 4.4, 1.7]];
    const state: OrbitalState = { Z: 2, terms: [{ n: 4, l: 3, m: 2, basis: 'complex', re: 0.6, im: 0.3 }, { n: 3, l: 2, m: -1, basis: 'complex', re: -0.2, im: 0.7 }] };
    const c = compileState(state);
    const norm = Math.sqrt(0.6 ** 2 + 0.3 ** 2 + 0.2 ** 2 + 0.7 ** 2);
    // psi = sum c R_nl Y_lm with R_nl = sqrt((2Z/n)^3 (n-l-1)! / (2n (n+l)!)) e^{-ρ/2} ρ^l L_{n-l-1}^{2l+1}(ρ), ρ = 2Zr/n
    // (Griffiths eq. 4.89 in Z-scaled form); SciPy's sph_harm_y includes the Condon–Shortley phase, as the engine.
    const ref = scipy(`
import json, math
import numpy as np
from scipy import special
Z = 2
terms = [(4, 3, 2, complex(0.6, 0.3)), (3, 2, -1, complex(-0.2, 0.7))]
norm = math.sqrt(sum(abs(t[3])**2 for t in terms))
def Y(l, m, th, ph):
    if hasattr(special, 'sph_harm_y'): return complex(special.sph_harm_y(l, m, th, ph))
    return complex(special.sph_harm(m, l, ph, th))
def psi(x, y, z):
    r = math.sqrt(x*x+y*y+z*z); th = math.acos(z/r); ph = math.atan2(y, x)
    s = 0j
    for n, l, m, c in terms:
        rho = 2*Z*r/n
        N = math.sqrt((2*Z/n)**3 * math.factorial(n-l-1) / (2*n*math.factorial(n+l)))
        s += c/norm * N * math.exp(-rho/2) * rho**l * special.eval_genlaguerre(n-l-1, 2*l+1, rho) * Y(l, m, th, ph)
    return s
h = 1e-5
out = []
for p in ${JSON.stringify(pts)}:
    g = []
    for k in range(3):
        a = list(p); b = list(p); a[k] += h; b[k] -= h
        g.append((psi(*a) - psi(*b)) / (2*h))
    v = psi(*p)
    out.append({'re': v.real, 'im': v.imag, 'gre': [q.real for q in g], 'gim': [q.imag for q in g]})
print(json.dumps(out))
`);
    expect(norm).toBeGreaterThan(0);
    const out = new Float64Array(8);
    pts.forEach(([x, y, z], i) => {
      c.gradient(x, y, z, out);
      const scale = Math.max(...ref[i].gre.map(Math.abs), ...ref[i].gim.map(Math.abs));
      expect(Math.abs(out[6] - ref[i].re)).toBeLessThan(1e-10);
      expect(Math.abs(out[7] - ref[i].im)).toBeLessThan(1e-10);
      for (let k = 0; k < 3; k++) {
        expect(Math.abs(out[k] - ref[i].gre[k])).toBeLessThan(1e-7 * scale);
        expect(Math.abs(out[3 + k] - ref[i].gim[k])).toBeLessThan(1e-7 * scale);
      }
    });
  });
});
