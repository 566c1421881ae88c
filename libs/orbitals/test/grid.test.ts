import { describe, expect, it } from 'vitest';
import {
  GridTooLargeError,
  MAX_GRID_N,
  OrbitalState,
  a0,
  angstrom,
  autoExtent,
  bohr,
  bohrToAngstrom,
  checkGridFits,
  compileState,
  enclosedFractionAt,
  enclosedThreshold,
  gridBytes,
  oneSEnclosingIsovalue,
  oneSEnclosingRadius,
  parseOrbitalLabel,
  probabilityInside,
  radiusForProbability,
  stateProbabilityInside,
  voxelVolume,
} from '../src';
import { angstromToBohr } from '../src/units';

describe('units', () => {
  it('a0 = 0.529177210903 Å (CODATA 2018) and conversions round-trip', () => {
    expect(a0).toBe(0.529177210903);
    expect(bohrToAngstrom(bohr(2))).toBeCloseTo(1.058354421806, 12);
    expect(angstromToBohr(angstrom(0.529177210903))).toBeCloseTo(1, 15);
  });
});

describe('grid memory', () => {
  it('gridBytes = n³ x 4 bytes (x 2 for complex)', () => {
    expect(gridBytes(3, false)).toBe(108);
    expect(gridBytes(3, true)).toBe(216);
    expect(gridBytes(512, true)).toBe(512 ** 3 * 8);
  });

  it('checkGridFits throws GridTooLargeError with the size, the need and the budget', () => {
    expect(() => checkGridFits(384, true)).not.toThrow();
    expect(() => checkGridFits(MAX_GRID_N, true)).not.toThrow();
    let err: unknown;
    try {
      checkGridFits(2048, false);
    } catch (e) {
      err = e;
    }
    expect(err).toBeInstanceOf(GridTooLargeError);
    expect((err as Error).message).toBe('grid 2048³ needs 34.4 GB, more than the 4.0 GB budget');
    expect(() => checkGridFits(256, true, 100e6)).toThrow('grid 256³ (complex) needs 134.2 MB, more than the 100.0 MB budget');
    expect(() => checkGridFits(600, false, 1e12)).toThrow(/maximum of 512/);
    expect(() => checkGridFits(1.5, false)).toThrow(/integer >= 2/);
  });

  it('voxelVolume is the cube of the spacing 2 extent / (n − 1)', () => {
    expect(voxelVolume({ n: 5, extent: bohr(2) })).toBe(1);
  });
});

describe('autoExtent', () => {
  it('1s: the cube half-width covers the 99.9 % sphere from the closed form, rounded up to 4 digits only (scales as 1/Z)', () => {
    const R999 = oneSEnclosingRadius(0.999, 1); // 5.58 a0
    const e = autoExtent(parseOrbitalLabel('1s').state);
    expect(e).toBeGreaterThanOrEqual(R999);
    expect(e - R999).toBeLessThan(1e-3);
    for (const Z of [2, 26]) {
      const eZ = autoExtent(parseOrbitalLabel('1s', { Z }).state);
      expect(eZ).toBeGreaterThanOrEqual(R999 / Z);
      expect(Math.abs(eZ * Z - e) / e).toBeLessThan(2e-3);
    }
    expect(autoExtent(parseOrbitalLabel('1s').state, { fraction: 0.9 })).toBe(2.662); // 2.66116 a0, rounded up
  });

  it('uses the slowest-decaying term and checks the superposition, cross terms included', () => {
    const state: OrbitalState = {
      Z: 1,
      terms: [
        { n: 2, l: 1, m: 0, basis: 'real', re: 0.6, im: 0 },
        { n: 4, l: 1, m: 0, basis: 'real', re: 0.8, im: 0 },
      ],
    };
    const e = autoExtent(state);
    expect(e).toBeGreaterThanOrEqual(radiusForProbability(4, 1, 1, 0.999));
    expect(stateProbabilityInside(state, e)).toBeGreaterThanOrEqual(0.999);
    expect(Number(e.toPrecision(4))).toBe(e); // 4 significant digits
  });

  it('stateProbabilityInside of a single term equals probabilityInside; mixed n with same l,m includes the overlap', () => {
    const s: OrbitalState = { Z: 1, terms: [{ n: 3, l: 1, m: 1, basis: 'complex', re: 1, im: 0 }] };
    expect(stateProbabilityInside(s, 7)).toBeCloseTo(probabilityInside(3, 1, 1, 7), 14);
    // (1s + 2s)/√2 inside R = 1: ½[P1s + P2s] + ∫_0^1 R10 R20 r² dr (closed form of the last term for Z = 1:
    // ∫ 2e^{-r}(1/√2)(1 − r/2)e^{-r/2} r² dr, integrated here with Simpson)
    const mix: OrbitalState = {
      Z: 1,
      terms: [
        { n: 1, l: 0, m: 0, basis: 'real', re: Math.SQRT1_2, im: 0 },
        { n: 2, l: 0, m: 0, basis: 'real', re: Math.SQRT1_2, im: 0 },
      ],
    };
    let cross = 0;
    const M = 2000;
    for (let i = 0; i <= M; i++) {
      const r = i / M;
      const f = 2 * Math.exp(-r) * Math.SQRT1_2 * (1 - r / 2) * Math.exp(-r / 2) * r * r;
      cross += (i === 0 || i === M ? 1 : i % 2 ? 4 : 2) * f;
    }
    cross /= 3 * M;
    const want = 0.5 * (probabilityInside(1, 0, 1, 1) + probabilityInside(2, 0, 1, 1)) + cross;
    expect(stateProbabilityInside(mix, 1)).toBeCloseTo(want, 11);
  });
});

describe('enclosedThreshold', () => {
  it('on 8 hand-summed values (total 36): 50 % -> 6 (8+7+6 = 21 >= 18), 15/36 -> 7, 100 % -> 1', () => {
    const d = new Float32Array([3, 8, 1, 6, 2, 7, 5, 4]);
    expect(enclosedThreshold(d, 0.5)).toBe(6);
    expect(enclosedFractionAt(d, 6)).toBeCloseTo(21 / 36, 15);
    expect(enclosedThreshold(d, 15 / 36)).toBe(7);
    expect(enclosedThreshold(d, 16 / 36)).toBe(6);
    expect(enclosedThreshold(d, 8 / 36)).toBe(8);
    expect(enclosedThreshold(d, 1)).toBe(1);
    expect(enclosedThreshold(d, 0.5, 0.125)).toBe(6); // voxel volume cancels
    const d64 = Float64Array.from(d);
    expect(enclosedThreshold(d64, 0.5)).toBe(6);
    expect(enclosedThreshold(d64, 15 / 36)).toBe(7);
  });

  it('handles zeros, ties and values sharing the top 16 bits (resolved by the second pass)', () => {
    // 1.0, 1.0000001 (next float32 up) and 1.0000002 share bits >>> 16
    const a = Math.fround(1.0000001);
    const b = Math.fround(1.0000002);
    const d = new Float32Array([0, 1, a, b, 0, 1]);
    const total = 2 + a + b;
    expect(enclosedThreshold(d, b / total)).toBe(b);
    expect(enclosedThreshold(d, (a + b) / total)).toBe(a);
    expect(enclosedThreshold(d, (a + b + 0.5) / total)).toBe(1);
    const d64 = new Float64Array([0, 1, 1 + 1e-15, 1 + 2e-15, 0, 1]);
    expect(enclosedThreshold(d64, (1 + 2e-15) / d64.reduce((s, v) => s + v, 0))).toBe(1 + 2e-15);
  });

  it('agrees with a sort-based reference on a sampled 2p_z density', () => {
    const c = compileState(parseOrbitalLabel('2pz').state);
    const psi = new Float32Array(40 ** 3);
    c.sampleGrid({ n: 40, extent: bohr(12) }, psi, null);
    const rho = psi.map((v) => v * v);
    const sorted = Float64Array.from(rho).sort().reverse();
    const total = rho.reduce((s, v) => s + v, 0);
    for (const f of [0.5, 0.9, 0.99]) {
      let acc = 0;
      let k = 0;
      while (acc < f * total) acc += sorted[k++];
      const t = enclosedThreshold(rho, f);
      expect(t).toBe(sorted[k - 1]);
      expect(enclosedFractionAt(rho, t)).toBeGreaterThanOrEqual(f);
      const nextUp = sorted.filter((v) => v > t).reduce((m, v) => Math.min(m, v), Infinity);
      expect(enclosedFractionAt(rho, nextUp)).toBeLessThan(f);
    }
  });

  it('on a sampled 1s density the 90 % isovalue matches the closed form ψ = R_10(ρ)/√(4π), ρ = 2.66116 a0, within 1 %', () => {
    const c = compileState(parseOrbitalLabel('1s').state);
    const n = 161;
    const psi = new Float32Array(n ** 3);
    c.sampleGrid({ n, extent: bohr(8) }, psi, null);
    const rho = psi.map((v) => v * v);
    const t = enclosedThreshold(rho, 0.9, voxelVolume({ n, extent: bohr(8) }));
    const psiIso = Math.sqrt(t);
    expect(Math.abs(psiIso / oneSEnclosingIsovalue(0.9, 1) - 1)).toBeLessThan(0.01);
  });

  it('rejects negative or non-finite values and bad fractions', () => {
    expect(() => enclosedThreshold(new Float32Array([1, -0.3, 2]), 0.5)).toThrow(/density\[1\] = -0.3.*\|psi\|²/);
    expect(() => enclosedThreshold(new Float32Array([1, NaN]), 0.5)).toThrow(/density\[1\]/);
    expect(() => enclosedThreshold(new Float64Array([1, Infinity]), 0.5)).toThrow(/density\[1\]/);
    expect(() => enclosedThreshold(new Float32Array([0, 0]), 0.5)).toThrow(/zero everywhere/);
    expect(() => enclosedThreshold(new Float32Array([1]), 0)).toThrow(/fraction/);
    expect(() => enclosedThreshold(new Float32Array([1]), 1.5)).toThrow(/fraction/);
    expect(enclosedThreshold(new Float32Array([-0, 2]), 0.5)).toBe(2);
  });
});
