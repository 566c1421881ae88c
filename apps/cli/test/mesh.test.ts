import * as fs from 'node:fs';
import * as path from 'node:path';
import { describe, expect, it } from 'vitest';

// Sources are named beside each check. The formulas are standard; the book equation and table numbers
// (Griffiths 2nd ed., Bethe & Salpeter) are cited from memory.
import { bisect, psiform, psiformJson, tempDir } from './helpers';

type Surface = { phase: string; vertices: number; triangles: number; area: number; volume: number; components: number; euler: number; watertight: boolean };

describe('psiform mesh', () => {
  it('2p_z at grid 48: two lobes, one per phase, each a watertight sphere (one component, Euler 2)', () => {
    const j = psiformJson(['mesh', '--orbital', '2pz', '--grid', '48']);
    expect(j.grid.n).toBe(48);
    expect(j.grid.extent).toBeGreaterThan(0);
    expect(j.isovalue).toBeGreaterThan(0);
    expect(j.surfaces.map((s: Surface) => s.phase).sort()).toEqual(['+', '-']);
    for (const s of j.surfaces as Surface[]) {
      expect(s.watertight).toBe(true);
      expect(s.components).toBe(1);
      expect(s.euler).toBe(2);
      expect(s.triangles).toBeGreaterThan(100);
      expect(s.volume).toBeGreaterThan(0);
    }
    // 2p_z is odd under z -> -z (Y_10 ∝ cos θ): the two lobes are mirror images, so equal
    // area and volume up to grid placement (the 48-point grid is symmetric about z = 0).
    const [a, b] = j.surfaces as Surface[];
    expect(Math.abs(a.area - b.area) / a.area).toBeLessThan(1e-3);
    expect(Math.abs(a.volume - b.volume) / a.volume).toBeLessThan(1e-3);
    expect(a.triangles).toBe(b.triangles);
    // The default surface encloses 90% of the probability (both lobes together).
    expect(Math.abs(j.enclosed - 0.9)).toBeLessThan(0.01);
    expect(j.model).toMatch(/one-electron hydrogen-like/i);
    expect(j.timings_ms.sample).toBeGreaterThanOrEqual(0);
  });

  it('1s with --iso V is the sphere r = -ln(V sqrt(pi)) (psi_100 = e^{-r}/sqrt(pi), Griffiths 2nd ed. eq. 4.80)', () => {
    const V = 0.05;
    const R = -Math.log(V * Math.sqrt(Math.PI));
    const j = psiformJson(['mesh', '--orbital', '1s', '--grid', '64', '--extent', '4', '--iso', String(V)]);
    expect(j.isovalue).toBeCloseTo(V, 12);
    expect(j.surfaces).toHaveLength(1);
    const s: Surface = j.surfaces[0];
    expect(s.phase).toBe('+');
    expect(s.watertight).toBe(true);
    expect(s.euler).toBe(2);
    // Marching cubes cuts chords inside the sphere: spacing h = 8/63 a0 gives relative errors
    // of order (h/R)^2 ~ 0.3%; 1% tolerance.
    expect(Math.abs(s.volume - (4 / 3) * Math.PI * R ** 3) / ((4 / 3) * Math.PI * R ** 3)).toBeLessThan(0.01);
    expect(Math.abs(s.area - 4 * Math.PI * R * R) / (4 * Math.PI * R * R)).toBeLessThan(0.01);
    // Enclosed probability of a sphere of radius R: 1 - e^{-2R}(1 + 2R + 2R^2).
    const P = 1 - Math.exp(-2 * R) * (1 + 2 * R + 2 * R * R);
    expect(Math.abs(j.enclosed - P)).toBeLessThan(0.01);
  });

  it('1s enclosing 90%: isovalue is psi at the radius holding 90% (root of 1 - e^{-2R}(1+2R+2R^2) = 0.9)', () => {
    const R = bisect((r) => 1 - Math.exp(-2 * r) * (1 + 2 * r + 2 * r * r) - 0.9, 0.1, 10);
    const j = psiformJson(['mesh', '--orbital', '1s', '--grid', '64', '--enclose', '0.9']);
    const expected = Math.exp(-R) / Math.sqrt(Math.PI);
    expect(Math.abs(j.isovalue - expected) / expected).toBeLessThan(0.02);
    expect(Math.abs(j.enclosed - 0.9)).toBeLessThan(0.01);
    expect(j.surfaces).toHaveLength(1);
  });

  it('complex 2p(m=+1): |psi| ∝ sin θ vanishes on the z axis, so its isosurface is one torus (Euler 0)', () => {
    // |psi_211| = (1/8√π) r e^{-r/2} sin θ (Griffiths 2nd ed., Tables 4.3 and 4.7), largest 2/(8√π e) ≈ 0.0519
    // at r = 2, θ = π/2. At |psi| = 0.03 the hole through the middle is over 1 a0 wide at r = 2, several
    // grid cells at 48 points over ±8 a0. (At 90% enclosed the hole is thinner than a cell and closes.)
    const j = psiformJson(['mesh', '--nlm', '2,1,1', '--complex', '--grid', '48', '--extent', '8', '--iso', '0.03']);
    expect(j.surfaces).toHaveLength(1);
    const s: Surface = j.surfaces[0];
    expect(s.phase).toBe('complex');
    expect(s.watertight).toBe(true);
    expect(s.components).toBe(1);
    expect(s.euler).toBe(0);
  });

  it('3d_z2: two positive lobes on the z axis (2 components, Euler 4) and a negative torus (Euler 0)', () => {
    // Y_20 ∝ 3cos^2 θ - 1: positive for cos^2 θ > 1/3 (two cones' insides, split at the nucleus), negative
    // in the belt between the nodal cones, which wraps around the z axis (Griffiths 2nd ed., Table 4.3).
    const j = psiformJson(['mesh', '--orbital', '3dz2', '--grid', '64']);
    const plus = j.surfaces.find((s: Surface) => s.phase === '+');
    const minus = j.surfaces.find((s: Surface) => s.phase === '-');
    expect(plus.watertight && minus.watertight).toBe(true);
    expect(plus.components).toBe(2);
    expect(plus.euler).toBe(4);
    expect(minus.components).toBe(1);
    expect(minus.euler).toBe(0);
  });

  it('Z scales lengths by 1/Z: the 2p_z lobes at Z = 2 have 1/8 of the volume at Z = 1 (same grid points per a0/Z)', () => {
    const one = psiformJson(['mesh', '--orbital', '2pz', '--grid', '48', '--extent', '16']);
    const two = psiformJson(['mesh', '--orbital', '2pz', '--grid', '48', '--extent', '8', '--Z', '2']);
    expect(Math.abs(two.isovalue / one.isovalue / Math.pow(2, 1.5) - 1)).toBeLessThan(1e-5); // psi scales as Z^{3/2}
    expect(Math.abs((two.surfaces[0].volume / one.surfaces[0].volume) * 8 - 1)).toBeLessThan(1e-4);
  });

  it('same recipe, same mesh: mesh --recipe (from psiform recipe) repeats mesh --orbital exactly', () => {
    const dir = tempDir();
    const r = psiform(['recipe', '--orbital', '3dxy', '--grid', '40', '--enclose', '0.8']);
    expect(r.code).toBe(0);
    const file = path.join(dir, 'r.json');
    fs.writeFileSync(file, r.stdout);
    const a = psiformJson(['mesh', '--recipe', file]);
    const b = psiformJson(['mesh', '--orbital', '3dxy', '--grid', '40', '--enclose', '0.8']);
    expect(a.isovalue).toBe(b.isovalue);
    expect(a.surfaces.map((s: Surface) => [s.phase, s.vertices, s.triangles, s.area])).toEqual(b.surfaces.map((s: Surface) => [s.phase, s.vertices, s.triangles, s.area]));
    // One thread and two threads sample the same field.
    const c = psiformJson(['mesh', '--recipe', file, '--threads', '1']);
    expect(c.surfaces.map((s: Surface) => s.vertices)).toEqual(a.surfaces.map((s: Surface) => s.vertices));
    expect(c.isovalue).toBe(a.isovalue);
  });

  it('prints a readable table without --json', () => {
    const r = psiform(['mesh', '--orbital', '2pz', '--grid', '32']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    expect(r.stdout).toMatch(/isovalue/);
    expect(r.stdout).toMatch(/watertight/);
    expect(r.stdout.split('\n').filter((l) => /^\s+[+-]\s/.test(l))).toHaveLength(2);
  });
});
