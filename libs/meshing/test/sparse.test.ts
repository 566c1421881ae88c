import { describe, expect, it } from 'vitest';
import { compileState, parseOrbitalLabel, type OrbitalState } from '@psiform/orbitals';
import { extractIsosurface } from '../src/marching-cubes';
import { denseBlockField, extractSparse, type BlockField, type SparseInfo } from '../src/sparse';
import { recipeToSurfaces, type RefineContext, type SampledField } from '../src/pipeline';
import { meshStats } from '../src/stats';
import type { Mesh } from '../src/mesh';

/** Vertex positions sorted, so meshes built in different orders can be compared. */
function sortedVertices(m: Mesh): number[][] {
  const out: number[][] = [];
  for (let v = 0; v < m.positions.length; v += 3) out.push([m.positions[v], m.positions[v + 1], m.positions[v + 2]]);
  return out.sort((a, b) => a[0] - b[0] || a[1] - b[1] || a[2] - b[2]);
}

function expectSameMesh(a: Mesh, b: Mesh, tol: number) {
  expect(a.positions.length).toBe(b.positions.length);
  expect(a.indices.length).toBe(b.indices.length);
  const va = sortedVertices(a);
  const vb = sortedVertices(b);
  let worst = 0;
  for (let i = 0; i < va.length; i++) for (let k = 0; k < 3; k++) worst = Math.max(worst, Math.abs(va[i][k] - vb[i][k]));
  expect(worst).toBeLessThan(tol);
  const sa = meshStats(a);
  const sb = meshStats(b);
  expect([sa.components, sa.euler, sa.boundaryEdges]).toEqual([sb.components, sb.euler, sb.boundaryEdges]);
  expect(sa.area).toBeCloseTo(sb.area, 4);
}

describe('coarse-to-fine extraction equals dense marching cubes on the same grid', () => {
  it('a hand-made field f = 4 − r² (sphere r = √(4 − level)) with its exact bound over boxes: same mesh, fewer points', () => {
    const n = 33;
    const E = 3;
    const h = (2 * E) / (n - 1);
    const f = (x: number, y: number, z: number) => 4 - (x * x + y * y + z * z);
    const dense = new Float32Array(n ** 3);
    for (let k = 0, i = 0; k < n; k++) for (let j = 0; j < n; j++) for (let q = 0; q < n; q++, i++) dense[i] = f(-E + q * h, -E + j * h, -E + k * h);
    const field: BlockField = {
      // f is monotone in r: its range over a box comes from the nearest and farthest points (by hand).
      bound(x0, x1, y0, y1, z0, z1, out) {
        const d = (a: number, b: number) => (a > 0 ? a : b < 0 ? -b : 0);
        const near = d(x0, x1) ** 2 + d(y0, y1) ** 2 + d(z0, z1) ** 2;
        const far = Math.max(x0 * x0, x1 * x1) + Math.max(y0 * y0, y1 * y1) + Math.max(z0 * z0, z1 * z1);
        out[0] = 4 - far;
        out[1] = 4 - near;
      },
      sample(start, size, out) {
        for (let k = 0, i = 0; k < size[2]; k++)
          for (let j = 0; j < size[1]; j++) for (let q = 0; q < size[0]; q++, i++) out[i] = dense[start[0] + q + n * (start[1] + j + n * (start[2] + k))];
      },
    };
    const info = {} as SparseInfo;
    const [sp] = extractSparse(field, { n, extent: E }, [{ level: 1, inside: 'above' }], { blockCells: 4 }, info);
    const dn = extractIsosurface(dense, { nx: n, ny: n, nz: n }, { origin: [-E, -E, -E], spacing: h }, 1, { inside: 'above', closeAtBoundary: false });
    expectSameMesh(sp, dn, 1e-6);
    const st = meshStats(sp);
    expect([st.components, st.euler, st.watertight]).toEqual([1, 2, true]);
    expect(info.pointsSampled).toBeLessThan(n ** 3);
    expect(info.blocksActive).toBeLessThan(info.blocksTotal);
  });

  const denseSampler = (_s: OrbitalState, grid: { n: number; extent: number }, c: ReturnType<typeof compileState>): SampledField => {
    const re = new Float32Array(grid.n ** 3);
    const im = c.isReal ? null : new Float32Array(grid.n ** 3);
    c.sampleGrid({ n: grid.n, extent: grid.extent as never }, re, im);
    return { re, im };
  };

  for (const [name, state, n] of [
    ['3d_z² (both phases)', parseOrbitalLabel('3dz2').state, 48],
    ['3p(m = 1) complex (|psi| with the radial sign)', { Z: 1, terms: [{ n: 3, l: 1, m: 1, basis: 'complex', re: 1, im: 0 }] } as OrbitalState, 48],
    ['4s automatic grids (inner cubes cut at node spheres)', parseOrbitalLabel('4s').state, 'auto'],
  ] as const) {
    it(`${name}: recipeToSurfaces with and without a dense sampler give the same surfaces`, async () => {
      const recipe = { content: state, grid: { n, extent: 'auto' as const }, surface: { rule: 'enclosed' as const, fraction: 0.9 } };
      const a = await recipeToSurfaces(recipe, { tolerance: Infinity });
      const b = await recipeToSurfaces(recipe, { tolerance: Infinity, sample: denseSampler });
      expect(a.sampling.method).toBe('sparse');
      expect(b.sampling.method).toBe('dense');
      expect(a.sampling.points).toBeLessThan(b.sampling.points);
      expect(a.grid.regions).toEqual(b.grid.regions);
      for (let i = 0; i < a.surfaces.length; i++) expectSameMesh(a.surfaces[i].mesh, b.surfaces[i].mesh, 1e-5);
      expect(a.topology).toEqual(b.topology);
    });
  }
});

describe('mirror symmetry: the upper blocks are meshed and the mesh reflected', () => {
  // A field sampled from exactly symmetric lattice coordinates (X = (2i - (n - 1)) h / 2 is negated exactly by
  // i -> n - 1 - i), so with and without symmetry the extractor sees the same values at every point, and the
  // crossed lattice edges, hence the vertices, must be the same.
  const latticeField = (n: number, E: number, f: (x: number, y: number, z: number) => number): BlockField => {
    const h = (2 * E) / (n - 1);
    const c = (i: number) => ((2 * i - (n - 1)) * h) / 2;
    const dense = new Float32Array(n ** 3);
    for (let k = 0, i = 0; k < n; k++) for (let j = 0; j < n; j++) for (let q = 0; q < n; q++, i++) dense[i] = f(c(q), c(j), c(k));
    // no bound (every block may be crossed): the test is about the reflection, not the culling
    return denseBlockField(dense, n);
  };
  const g = (x: number, y: number, z: number) => Math.exp(-(x * x + y * y + z * z) / 2);
  // even in x, y, z: two lobes along z and a belt (3d_z²-like); odd in z: two lobes of opposite sign
  const even = (x: number, y: number, z: number) => (2 * z * z - x * x - y * y + 0.3 * x * x * y * y) * g(x, y, z);
  const oddZ = (x: number, y: number, z: number) => z * (1 + 0.3 * x * x - 0.2 * y * y) * g(x, y, z);
  const levels = [
    { level: 0.35, inside: 'above' as const },
    { level: -0.35, inside: 'below' as const },
  ];

  const reflected = (m: Mesh, a: number): Mesh => {
    const p = Float32Array.from(m.positions);
    for (let v = a; v < p.length; v += 3) p[v] = 0 - p[v]; // 0 - 0 is +0 (toEqual tells -0 from 0)
    return { positions: p, normals: m.normals, indices: m.indices };
  };

  for (const [name, f, mirror] of [
    ['even in x, y and z', even, [1, 1, 1]],
    ['odd in z (the + surface reflects to the − one)', oddZ, [1, 1, -1]],
  ] as const) {
    for (const n of [33, 34, 35]) {
      for (const B of [3, 5]) {
        it(`${name}, n = ${n} (${n % 2 ? 'centre on a lattice plane' : 'centre mid-cell'}), ${B}³-cell blocks: same vertices, closed, a mirror image of itself, an eighth of the points`, () => {
          const E = 4;
          const field = latticeField(n, E, f);
          const plain = {} as SparseInfo;
          const sym = {} as SparseInfo;
          const a = extractSparse(field, { n, extent: E }, levels, { blockCells: B }, plain);
          const b = extractSparse(field, { n, extent: E }, levels, { blockCells: B, mirror }, sym);
          for (let q = 0; q < 2; q++) {
            // same crossed edges, same vertices (up to the rounding of a negated coordinate)
            expect(sortedVertices(b[q])).toHaveLength(a[q].positions.length / 3);
            const va = sortedVertices(a[q]);
            const vb = sortedVertices(b[q]);
            let worst = 0;
            for (let i = 0; i < va.length; i++) for (let k = 0; k < 3; k++) worst = Math.max(worst, Math.abs(va[i][k] - vb[i][k]));
            expect(worst).toBeLessThan(1e-5);
            const sa = meshStats(a[q]);
            const sb = meshStats(b[q]);
            expect([sa.boundaryEdges, sa.watertight]).toEqual([0, true]);
            expect([sb.components, sb.euler, sb.boundaryEdges, sb.watertight]).toEqual([sa.components, sa.euler, 0, true]);
            // ambiguous cells may be split the other way round, so areas agree closely, not exactly
            expect(Math.abs(sb.area - sa.area) / sa.area).toBeLessThan(2e-3);
            expect(Math.abs(sb.volume - sa.volume) / Math.abs(sa.volume)).toBeLessThan(3e-3);
          }
          // a mirror image of itself: reflected along an even axis a level's vertices are its own, along an odd one
          // they are the other level's
          for (let ax = 0; ax < 3; ax++) {
            const other = mirror[ax] < 0 ? 1 : 0;
            expect(sortedVertices(reflected(b[0], ax))).toEqual(sortedVertices(b[other]));
          }
          expect(sym.pointsSampled).toBeLessThan(0.3 * plain.pointsSampled);
        });
      }
    }
  }

  it('an ellipsoid (no ambiguous cells): area and volume equal to 1e-9 with and without symmetry, odd and even n', () => {
    for (const n of [33, 34]) {
      const E = 4;
      const field = latticeField(n, E, (x, y, z) => 9 - (x * x + 2 * y * y + 0.5 * z * z));
      const one = [{ level: 1, inside: 'above' as const }];
      const [a] = extractSparse(field, { n, extent: E }, one, {});
      const [b] = extractSparse(field, { n, extent: E }, one, { mirror: [1, 1, 1] });
      const sa = meshStats(a);
      const sb = meshStats(b);
      expect([b.indices.length, sb.components, sb.euler, sb.watertight]).toEqual([a.indices.length, 1, 2, true]);
      expect(Math.abs(sb.area - sa.area) / sa.area).toBeLessThan(1e-9);
      expect(Math.abs(sb.volume - sa.volume) / sa.volume).toBeLessThan(1e-9);
    }
  });

  it('not used where it cannot be exact: an even block size, or an odd axis without each level’s negative', () => {
    const n = 33;
    const E = 4;
    const field = latticeField(n, E, oddZ);
    const plain = extractSparse(field, { n, extent: E }, levels, { blockCells: 4 });
    const evenBlocks = extractSparse(field, { n, extent: E }, levels, { blockCells: 4, mirror: [1, 1, -1] });
    expect(evenBlocks.map((m) => [...m.indices])).toEqual(plain.map((m) => [...m.indices]));
    const one = [{ level: 0.35, inside: 'above' as const }];
    const lone = extractSparse(field, { n, extent: E }, one, { blockCells: 5 });
    const loneSym = extractSparse(field, { n, extent: E }, one, { blockCells: 5, mirror: [1, 1, -1] });
    expect([...loneSym[0].positions]).toEqual([...lone[0].positions]);
    expect(() => extractSparse(field, { n, extent: E }, one, { mirror: [2, 0, 0] as never })).toThrow(/mirror/);
  });
});

describe('real states are meshed by symmetry where their terms share a parity', () => {
  for (const n of [48, 49]) {
    it(`2p_z at grid ${n}: the − lobe is the + lobe reflected in z, vertex for vertex; both closed, one part each`, async () => {
      const recipe = { content: parseOrbitalLabel('2pz').state, grid: { n, extent: 'auto' as const }, surface: { rule: 'enclosed' as const, fraction: 0.9 } };
      const r = await recipeToSurfaces(recipe, { tolerance: Infinity, refine: (ctx) => ctx.surfaces });
      const [plus, minus] = r.surfaces;
      const flipped = Float32Array.from(plus.mesh.positions);
      for (let v = 2; v < flipped.length; v += 3) flipped[v] = 0 - flipped[v];
      expect(sortedVertices({ ...plus.mesh, positions: flipped })).toEqual(sortedVertices(minus.mesh));
      for (const s of r.surfaces) expect([s.stats!.components, s.stats!.euler, s.stats!.watertight]).toEqual([1, 2, true]);
      // an eighth of the grid's blocks at most are sampled directly (z: 2, x: 2, y: 2)
      expect(r.sampling.blocksActive).toBeLessThan(r.sampling.blocksTotal / 8);
    });
  }
});

describe('recipeToSurfaces with and without symmetry: the same surface', () => {
  // 3d_z²: even in x, y, z (even grid: middle cell layers); sp: even in x and y only; 4f_xyz: odd in all three;
  // 2p_x on an odd grid: odd in x. Same crossed edges, so the same vertices; same parts; areas within 0.1 %
  // (ambiguous cells may be split the other way round in the reflected parts).
  for (const [label, n] of [['3dz2', 64], ['sp', 'auto'], ['4fxyz', 'auto'], ['2px', 49]] as const) {
    it(`${label} at grid ${n}`, async () => {
      const recipe = { content: parseOrbitalLabel(label).state, grid: { n, extent: 'auto' as const }, surface: { rule: 'enclosed' as const, fraction: 0.9 } };
      const hooks = { tolerance: Infinity, refine: (ctx: RefineContext) => ctx.surfaces };
      const a = await recipeToSurfaces(recipe, { ...hooks, symmetry: false });
      const b = await recipeToSurfaces(recipe, hooks);
      expect(b.grid.regions).toEqual(a.grid.regions);
      expect(b.sampling.points).toBeLessThan(a.sampling.points / 1.9);
      for (let i = 0; i < a.surfaces.length; i++) {
        const [ma, mb] = [a.surfaces[i].mesh, b.surfaces[i].mesh];
        expect(mb.positions.length).toBe(ma.positions.length);
        const va = sortedVertices(ma);
        const vb = sortedVertices(mb);
        let worst = 0;
        for (let v = 0; v < va.length; v++) for (let k = 0; k < 3; k++) worst = Math.max(worst, Math.abs(va[v][k] - vb[v][k]));
        expect(worst).toBeLessThan(1e-5);
        const [sa, sb] = [a.surfaces[i].stats!, b.surfaces[i].stats!];
        expect([sb.components, sb.euler, sb.watertight]).toEqual([sa.components, sa.euler, true]);
        expect(Math.abs(sb.area - sa.area) / sa.area).toBeLessThan(1e-3);
      }
      expect(b.topology).toEqual(a.topology);
    });
  }
});
