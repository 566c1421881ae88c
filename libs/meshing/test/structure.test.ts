// The grid follows the state's structure: the radial nodes (roots of the radial polynomial) cut the box into
// lobes, and each lobe's grid step comes from its thinnest part, so a thin shell that a coarse grid steps over
// is still drawn at the defaults, and a grid the user forces says what it loses.
import { describe, expect, it } from 'vitest';
import { stateFromNlm } from '@psiform/orbitals';
import { recipeToSurfaces } from '../src/pipeline';

// Hydrogen 3s by hand (Griffiths, "Introduction to Quantum Mechanics", table 4.7):
// R_30 = (2 / sqrt 27) (1 − 2r/3 + 2r²/27) e^{−r/3}, Y_00 = 1 / sqrt(4 pi).
const psi3s = (r: number) => (2 / Math.sqrt(27)) * (1 - (2 * r) / 3 + (2 * r * r) / 27) * Math.exp(-r / 3) / Math.sqrt(4 * Math.PI);
// Radial nodes: 2r²/27 − 2r/3 + 1 = 0, r = (9 ∓ 3 sqrt 3) / 2.
const nodes = [(9 - 3 * Math.sqrt(3)) / 2, (9 + 3 * Math.sqrt(3)) / 2];

function bisect(f: (r: number) => number, a: number, b: number): number {
  let fa = f(a);
  for (let i = 0; i < 100; i++) {
    const m = 0.5 * (a + b);
    const fm = f(m);
    if (Math.sign(fm) === Math.sign(fa)) {
      a = m;
      fa = fm;
    } else b = m;
  }
  return 0.5 * (a + b);
}

describe('a thin shell between two radial nodes (3s, |psi| at 99 % of its middle lobe peak)', () => {
  // The middle lobe (between the nodes) peaks where d/dr psi = 0: golden-section free, by bisection on a difference.
  const dpsi = (r: number) => psi3s(r + 1e-7) - psi3s(r - 1e-7);
  const rPeak = bisect(dpsi, nodes[0] + 0.1, nodes[1] - 0.1);
  const c = 0.99 * Math.abs(psi3s(rPeak));
  // The region |psi| > c in that lobe is a shell ra < r < rb, bounded by two spheres (hand-solved here).
  const ra = bisect((r) => Math.abs(psi3s(r)) - c, nodes[0], rPeak);
  const rb = bisect((r) => Math.abs(psi3s(r)) - c, rPeak, nodes[1]);
  const recipe = (n: number | 'auto') => ({ content: stateFromNlm(3, 0, 0, { complex: false }), grid: { n, extent: 'auto' as const }, surface: { rule: 'psi' as const, value: c } });

  it('is about 0.4 a0 thick: a 24-point grid over the box steps over it', () => {
    expect(rb - ra).toBeGreaterThan(0.3);
    expect(rb - ra).toBeLessThan(0.5);
  });

  it('at the default grid both spheres of the shell are drawn, at the hand-solved radii', async () => {
    const r = await recipeToSurfaces(recipe('auto'), { tolerance: Infinity });
    expect(r.features.radialNodes[0].map((x) => Number(x.toFixed(9)))).toEqual(nodes.map((x) => Number(x.toFixed(9))));
    // '-' phase: the shell's two spheres (2 parts, Euler 2 + 2); '+' phase: the outer lobe's sphere.
    expect(r.topology.found?.['-']).toEqual({ components: 2, euler: 4 });
    expect(r.topology.matches).toBe(true);
    const minus = r.surfaces.find((s) => s.phase === '-')!.mesh;
    let nearA = 0;
    let nearB = 0;
    for (let v = 0; v < minus.positions.length; v += 3) {
      const rad = Math.hypot(minus.positions[v], minus.positions[v + 1], minus.positions[v + 2]);
      // Projected onto the analytic surface: within 1e-4 a0 of one of the two radii.
      expect(Math.min(Math.abs(rad - ra), Math.abs(rad - rb))).toBeLessThan(1e-4);
      if (Math.abs(rad - ra) < 1e-4) nearA++;
      else nearB++;
    }
    expect(nearA).toBeGreaterThan(100);
    expect(nearB).toBeGreaterThan(100);
    expect(r.warnings.map((w) => w.code)).not.toContain('feature-unresolved');
  });

  it('a forced 24-point grid loses it and says so, naming the lobe', async () => {
    const r = await recipeToSurfaces(recipe(24), { tolerance: Infinity });
    const w = r.warnings.find((x) => x.code === 'feature-unresolved');
    expect(w?.feature?.description).toMatch(/inner radial lobe 2 of 3/);
    expect(w?.suggestedN).toBeGreaterThan(24);
  });
});

describe('a ring whose hole is narrower than a grid step (complex 2p, m = +1, |psi| set so the hole is 0.2 a0 across)', () => {
  // Hydrogen 2p by hand (closed forms of R_21 and Y_1±1 as tabulated in Griffiths, ch. 4; table numbers from memory):
  // |psi_21±1| = (1 / sqrt 24) r e^{−r/2} · sqrt(3 / 8 pi) sin θ = k ρ e^{−r/2}, ρ = r sin θ the distance from the
  // z axis. For a given ρ it is largest at z = 0 (r = ρ), so the ring {|psi| > c} is narrowest in the xy plane:
  // its hole has radius ρ_in and its rim radius ρ_out, the two roots of k ρ e^{−ρ/2} = c (one each side of ρ = 2).
  const k = (1 / Math.sqrt(24)) * Math.sqrt(3 / (8 * Math.PI));
  const rhoIn = 0.1;
  const c = k * rhoIn * Math.exp(-rhoIn / 2);
  const rhoOut = bisect((p) => k * p * Math.exp(-p / 2) - c, 2, 30);
  const recipe = (n: number | 'auto') => ({ content: stateFromNlm(2, 1, 1, { complex: true }), grid: { n, extent: 'auto' as const }, surface: { rule: 'psi' as const, value: c } });
  const radii = (positions: Float32Array) => {
    let lo = Infinity;
    let hi = 0;
    for (let v = 0; v < positions.length; v += 3) {
      const p = Math.hypot(positions[v], positions[v + 1]);
      lo = Math.min(lo, p);
      hi = Math.max(hi, p);
    }
    return { lo, hi };
  };

  it('at the defaults: one ring (Euler 0) with its 0.2 a0 hole, though the grid step is wider, and no warning', async () => {
    const r = await recipeToSurfaces(recipe('auto'), { tolerance: Infinity });
    expect(r.features.smallest?.kind).toBe('ring-hole');
    expect(r.features.smallest!.size).toBeCloseTo(2 * rhoIn, 2);
    expect(r.grid.n % 2).toBe(1); // odd: the z axis is a lattice line
    expect(r.grid.spacing).toBeGreaterThan(2 * rhoIn);
    expect(r.topology.found?.complex).toEqual({ components: 1, euler: 0 });
    expect(r.warnings).toEqual([]);
    // Projected onto the analytic surface: the hole's waist and the rim at the hand-solved radii (float32 positions).
    const { lo, hi } = radii(r.surfaces[0].mesh.positions);
    expect(Math.abs(lo - rhoIn)).toBeLessThan(1e-5);
    expect(Math.abs(hi - rhoOut)).toBeLessThan(5e-3);
  });

  it('a forced even grid (the axis between lattice points) closes the hole and says so, naming the ring', async () => {
    const r = await recipeToSurfaces(recipe(96), { tolerance: Infinity });
    // Its points nearest the axis are h/√2 ≈ 0.15 a0 from it, inside the ring: the hole is lost (a ball, Euler 2).
    expect(r.topology.found?.complex).toEqual({ components: 1, euler: 2 });
    const w = r.warnings.find((x) => x.code === 'feature-unresolved');
    expect(w?.feature?.kind).toBe('ring-hole');
    expect(w?.message).toMatch(/hole of a ring/);
    expect(r.warnings.map((x) => x.code)).toContain('topology-mismatch');
  });
});
