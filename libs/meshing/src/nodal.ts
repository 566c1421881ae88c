// Nodal surfaces (psi = 0) of a real sampled field, kept only where they cut the figure.

import { extractIsosurface } from './marching-cubes';
import type { Mesh } from './mesh';
import { cubeGeometry, type CubeGrid } from './orbital-surfaces';

const { abs, ceil, round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export interface NodalOptions {
  /** A nodal point is kept when a line through it along the surface normal reaches |psi| >= fraction × isovalue
   * (default 1: the lobes themselves). */
  fraction?: number;
}

/**
 * The psi = 0 isosurface by marching cubes (Lorensen & Cline 1987, level 0 on the real field), clipped to where it
 * cuts the figure: nodal planes and cones are infinite, so a vertex is kept only if the line through it along its
 * normal (both ways, up to the box) meets a sample with |psi| >= fraction × isovalue — i.e. the part of the nodal
 * surface that lies between lobes. Triangles with a dropped vertex are dropped. Returns null when nothing is left
 * (e.g. 1s, which has no node). No box caps: a nodal surface is not the boundary of a region.
 */
export function extractNodalSurface(re: Float32Array, grid: CubeGrid, isovalue: number, opts: NodalOptions = {}): Mesh | null {
  if (!(isovalue > 0) || !Number.isFinite(isovalue)) throw new RangeError(`isovalue must be a positive number (got ${isovalue})`);
  const fraction = opts.fraction ?? 1;
  if (!(fraction > 0) || !Number.isFinite(fraction)) throw new RangeError(`fraction must be > 0 (got ${fraction})`);
  const { dims, origin, spacing } = cubeGeometry(grid);
  const n = grid.n;
  if (re.length !== n ** 3) throw new RangeError(`field length ${re.length} must be n³ = ${n ** 3}`);
  const raw = extractIsosurface(re, dims, { origin, spacing }, 0, { inside: 'above', closeAtBoundary: false });
  const P = raw.positions;
  const N = raw.normals;
  const nv = P.length / 3;
  if (nv === 0) return null;

  const level = fraction * isovalue;
  const step = 0.5 * spacing;
  const maxSteps = ceil((4 * grid.extent) / step);
  const at = (x: number, y: number, z: number): number => {
    const i = round((x - origin[0]) / spacing);
    const j = round((y - origin[1]) / spacing);
    const k = round((z - origin[2]) / spacing);
    if (i < 0 || j < 0 || k < 0 || i >= n || j >= n || k >= n) return NaN;
    return abs(re[i + n * (j + n * k)]);
  };
  const keep = new Int32Array(nv).fill(-1);
  let kept = 0;
  for (let v = 0; v < nv; v++) {
    const x = P[3 * v], y = P[3 * v + 1], z = P[3 * v + 2];
    const dx = N[3 * v], dy = N[3 * v + 1], dz = N[3 * v + 2];
    let hit = false;
    for (const s of [1, -1]) {
      for (let t = 1; t <= maxSteps && !hit; t++) {
        const a = at(x + s * t * step * dx, y + s * t * step * dy, z + s * t * step * dz);
        if (Number.isNaN(a)) break;
        if (a >= level) hit = true;
      }
      if (hit) break;
    }
    if (hit) keep[v] = kept++;
  }
  const I = raw.indices;
  const idx: number[] = [];
  for (let f = 0; f < I.length; f += 3) {
    const a = keep[I[f]], b = keep[I[f + 1]], c = keep[I[f + 2]];
    if (a >= 0 && b >= 0 && c >= 0) idx.push(a, b, c);
  }
  if (idx.length === 0) return null;
  const positions = new Float32Array(3 * kept);
  const normals = new Float32Array(3 * kept);
  for (let v = 0; v < nv; v++) {
    const o = keep[v];
    if (o < 0) continue;
    for (let d = 0; d < 3; d++) {
      positions[3 * o + d] = P[3 * v + d];
      normals[3 * o + d] = N[3 * v + d];
    }
  }
  return { positions, normals, indices: new Uint32Array(idx) };
}
