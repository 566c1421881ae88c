import { describe, expect, it } from 'vitest';
import { compileState, parseOrbitalLabel, type OrbitalState } from '@psiform/orbitals';
import { extractIsosurface } from '../src/marching-cubes';
import { extractSparse, type BlockField, type SparseInfo } from '../src/sparse';
import { recipeToSurfaces, type SampledField } from '../src/pipeline';
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
