import { describe, expect, it } from 'vitest';
import { compileState, oneSEnclosingIsovalue, parseOrbitalLabel, stateFromNlm, type CompiledState } from '@psiform/orbitals';
import { NoSurfaceError, recipeToSurfaces } from '../src/pipeline';
import { extractOrbitalSurfaces } from '../src/orbital-surfaces';
import { meshStats } from '../src/stats';

const RHO_90 = 2.66116; // 1s, 90 %: 1 - e^{-2 rho}(1 + 2 rho + 2 rho²) = 0.9 (from R_10, Z = 1)

describe('1s at 90 % enclosed probability, N = 128', () => {
  it('the closed form radius solves the enclosed-probability equation', async () => {
    // P(r < rho) for 1s: integral of 4 r² e^{-2r} dr (Griffiths, Introduction to QM, 4.2: R_10 = 2 e^{-r}).
    const p = 1 - Math.exp(-2 * RHO_90) * (1 + 2 * RHO_90 + 2 * RHO_90 ** 2);
    expect(p).toBeCloseTo(0.9, 5);
  });

  it('all-space level: encloses 0.9 to 1e-9 (the closed form above), one closed outward sphere, volume within 0.2 %', async () => {
    const r = await recipeToSurfaces({ content: parseOrbitalLabel('1s').state, grid: { n: 128, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } });
    expect(Math.abs(r.enclosed.fraction - 0.9)).toBeLessThan(1e-9);
    expect(r.enclosed.error).toBeLessThan(1e-6);
    expect(r.enclosed.over).toBe('all space');
    expect(r.isovalue).toBeCloseTo(oneSEnclosingIsovalue(0.9), 9);
    expect(r.warnings).toEqual([]);
    expect(r.surfaces.map((s) => s.phase)).toEqual(['+', '-']);
    const plus = r.surfaces[0].stats!;
    expect(r.surfaces[1].mesh.indices.length).toBe(0); // 1s has no negative lobe
    expect(plus.watertight).toBe(true);
    expect(plus.euler).toBe(2);
    expect(plus.components).toBe(1);
    expect(Math.abs(plus.volume / ((4 / 3) * Math.PI * RHO_90 ** 3) - 1)).toBeLessThan(0.002);
    // With the grid threshold the area is 0.06 % small (measured), so area is checked at 0.1 % here
    // and at 0.05 % with the closed-form isovalue below.
    expect(Math.abs(plus.area / (4 * Math.PI * RHO_90 ** 2) - 1)).toBeLessThan(0.001);
  });

  it('closed-form isovalue psi(rho) = e^{-rho}/sqrt(pi): area within 0.05 %, volume within 0.2 %', async () => {
    const c = oneSEnclosingIsovalue(0.9);
    expect(c).toBeCloseTo(Math.exp(-RHO_90) / Math.sqrt(Math.PI), 5);
    const r = await recipeToSurfaces({ content: parseOrbitalLabel('1s').state, grid: { n: 128, extent: 'auto' }, surface: { rule: 'psi', value: c } });
    const s = r.surfaces[0].stats!;
    expect(Math.abs(s.area / (4 * Math.PI * RHO_90 ** 2) - 1)).toBeLessThan(0.0005);
    expect(Math.abs(s.volume / ((4 / 3) * Math.PI * RHO_90 ** 3) - 1)).toBeLessThan(0.002);
    // Analytic normals are radial and outward (common practice check: n . r/|r| ~ 1).
    const { positions: P, normals: N } = r.surfaces[0].mesh;
    let worst = 1;
    for (let v = 0; v < P.length / 3; v++) {
      const rr = Math.hypot(P[3 * v], P[3 * v + 1], P[3 * v + 2]);
      worst = Math.min(worst, (P[3 * v] * N[3 * v] + P[3 * v + 1] * N[3 * v + 1] + P[3 * v + 2] * N[3 * v + 2]) / rr);
    }
    expect(worst).toBeGreaterThan(0.9999);
  });

  it('the sampler receives the recipe state as given and the pipeline returns its own meshes', async () => {
    const state = parseOrbitalLabel('3dz2').state;
    const seen: unknown[] = [];
    await recipeToSurfaces(
      { content: state, grid: { n: 40, extent: 20 }, surface: { rule: 'enclosed', fraction: 0.9 } },
      {
        sample: (s, g, c) => {
          seen.push([s, g]);
          const re = new Float32Array(g.n ** 3);
          c.sampleGrid({ n: g.n, extent: g.extent as never }, re, null);
          return { re, im: null };
        },
      },
    );
    expect(seen).toEqual([[{ Z: 1, terms: state.terms }, { n: 40, extent: 20 }]]);
  });
});

describe('lobes and phases', () => {
  it('2p_z: one lobe per phase, each Euler 2; + above the nodal plane z = 0, - below', async () => {
    const r = await recipeToSurfaces({ content: parseOrbitalLabel('2pz').state, grid: { n: 64, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } });
    const [plus, minus] = r.surfaces;
    for (const s of [plus, minus]) {
      expect(s.stats!.components).toBe(1);
      expect(s.stats!.euler).toBe(2);
      expect(s.stats!.watertight).toBe(true);
      expect(s.stats!.volume).toBeGreaterThan(0);
      // The enclosed-rule level sits between samples, so no edge vertices coincide.
      expect(s.stats!.degenerateTriangles).toBe(0);
    }
    expect(plus.stats!.bbox!.min[2]).toBeGreaterThan(0);
    expect(minus.stats!.bbox!.max[2]).toBeLessThan(0);
    // Mirror symmetry psi(x,y,-z) = -psi: equal areas (tolerance: grid is symmetric, 1e-6 relative).
    expect(Math.abs(plus.stats!.area / minus.stats!.area - 1)).toBeLessThan(1e-6);
  });

  it('3d_z²: + phase is two polar lobes (2 components, Euler 4), - phase one equatorial ring (Euler 0)', async () => {
    // 3d_z² ∝ r² e^{-r/3} (3 cos²θ - 1): positive near the z axis (two cones), negative in a torus
    // around the equator; nodal cones at cos²θ = 1/3 (Atkins' Physical Chemistry, hydrogenic orbitals).
    const r = await recipeToSurfaces({ content: parseOrbitalLabel('3dz2').state, grid: { n: 80, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } });
    const [plus, minus] = r.surfaces;
    expect(plus.stats!.components).toBe(2);
    expect(plus.stats!.euler).toBe(4);
    expect(minus.stats!.components).toBe(1);
    expect(minus.stats!.euler).toBe(0);
    for (const s of [plus, minus]) expect(s.stats!.watertight).toBe(true);
    // The ring lies around the equator: its z-extent is smaller than its x-extent.
    const b = minus.stats!.bbox!;
    expect(b.max[2] - b.min[2]).toBeLessThan(b.max[0] - b.min[0]);
  });

  it('complex 2p(m=+1): one |psi| surface, a torus (Euler 0), with arg psi = phi per vertex', async () => {
    // psi_21(+1) ∝ r e^{-r/2} sinθ e^{i phi} (Condon-Shortley sign -1): |psi| = c is a ring torus
    // and arg psi = phi + pi (Griffiths 4.1, Table 4.3).
    const state = stateFromNlm(2, 1, 1, { complex: true });
    // At 50 % the hole around the z axis is several cells wide. (Measured: at 80 % and n = 64 the
    // hole is narrower than one cell and the grid closes it, Euler 2; n = 65 or 128 shows the torus.)
    const r = await recipeToSurfaces({ content: state, grid: { n: 64, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.5 } });
    expect(r.surfaces).toHaveLength(1);
    const s = r.surfaces[0];
    expect(s.phase).toBe('complex');
    expect(s.stats!.euler).toBe(0);
    expect(s.stats!.watertight).toBe(true);
    const P = s.mesh.positions;
    const A = s.mesh.phaseAngle!;
    expect(A.length).toBe(P.length / 3);
    let worst = 0;
    for (let v = 0; v < A.length; v++) {
      const phi = Math.atan2(P[3 * v + 1], P[3 * v]);
      const d = Math.atan2(Math.sin(A[v] - phi - Math.PI), Math.cos(A[v] - phi - Math.PI));
      const d2 = Math.atan2(Math.sin(A[v] - phi), Math.cos(A[v] - phi));
      worst = Math.max(worst, Math.min(Math.abs(d), Math.abs(d2)));
    }
    expect(worst).toBeLessThan(1e-5);
  });

  it('analytic and field normals agree on 2p_z (within 0.1 rad except near the nodal plane)', async () => {
    const compiled = compileState(parseOrbitalLabel('2pz').state) as CompiledState;
    const grid = { n: 48, extent: 12 };
    const re = new Float32Array(grid.n ** 3);
    compiled.sampleGrid({ n: grid.n, extent: grid.extent as never }, re, null);
    const a = extractOrbitalSurfaces(compiled, re, grid, 0.02);
    const f = extractOrbitalSurfaces(compiled, re, grid, 0.02, { normals: 'field' });
    for (let k = 0; k < 2; k++) {
      const A = a[k].mesh.normals, F = f[k].mesh.normals;
      expect(A.length).toBe(F.length);
      let bad = 0;
      for (let v = 0; v < A.length / 3; v++) {
        const dot = A[3 * v] * F[3 * v] + A[3 * v + 1] * F[3 * v + 1] + A[3 * v + 2] * F[3 * v + 2];
        if (dot < Math.cos(0.1)) bad++;
      }
      expect(bad / (A.length / 3)).toBeLessThan(0.01);
      expect(meshStats(a[k].mesh).volume).toBeGreaterThan(0);
    }
  });

  it('bad requests fail with the field named', async () => {
    const content = parseOrbitalLabel('1s').state;
    await expect(recipeToSurfaces({ content, grid: { n: 1 }, surface: { rule: 'psi', value: 0.1 } })).rejects.toThrow(/grid.n/);
    await expect(recipeToSurfaces({ content, grid: { n: 16 }, surface: { rule: 'enclosed', fraction: 1.5 } })).rejects.toThrow(/surface.fraction/);
    await expect(recipeToSurfaces({ content, grid: { n: 16 }, surface: { rule: 'psi', value: -1 } })).rejects.toThrow(/surface.value/);
    await expect(recipeToSurfaces({ content, grid: { n: 16, extent: -2 }, surface: { rule: 'psi', value: 0.1 } })).rejects.toThrow(/grid.extent/);
    // A level above the largest |psi| has no surface (1s: |psi| <= 1/sqrt(pi) at the nucleus).
    await expect(recipeToSurfaces({ content, grid: { n: 16 }, surface: { rule: 'psi', value: 0.6 } })).rejects.toThrow(/no surface/);
  });

  it('the largest |psi| is the closed-form maximum over all space, whatever the grid, and the no-surface error carries it', async () => {
    // Closed forms (hydrogen, a0 units): 1s |psi| = e^-r / sqrt(pi), largest 1/sqrt(pi) at r = 0; 2p_z
    // psi = r e^(-r/2) cos(theta) / (4 sqrt(2 pi)), largest on the z axis at r = 2: 2 e^-1 / (4 sqrt(2 pi)).
    const cases = [
      { label: '1s', max: 1 / Math.sqrt(Math.PI) },
      { label: '2pz', max: (2 * Math.exp(-1)) / (4 * Math.sqrt(2 * Math.PI)) },
    ];
    for (const { label, max } of cases) {
      const content = parseOrbitalLabel(label).state;
      for (const n of [16, 41]) {
        const r = await recipeToSurfaces({ content, grid: { n }, surface: { rule: 'psi', value: max / 2 } });
        expect(Math.abs(r.maxAbsPsi! - max) / max, `${label} at ${n}³`).toBeLessThan(1e-3);
      }
      const err = await recipeToSurfaces({ content, grid: { n: 16 }, surface: { rule: 'psi', value: 2 * max } }).catch((e: unknown) => e);
      expect(err).toBeInstanceOf(NoSurfaceError);
      expect(Math.abs((err as NoSurfaceError).maxAbsPsi - max) / max).toBeLessThan(1e-3);
    }
  });
});
