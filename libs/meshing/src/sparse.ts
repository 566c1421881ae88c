// Coarse-to-fine extraction: marching cubes on a fine cube grid without sampling the whole grid.
//
// The grid (n points per side over ±extent) is cut into blocks of `blockCells`³ cells. An octree over the blocks
// asks the field for a SAFE enclosure of its values over each box (interval bound, @psiform/orbitals fieldBound);
// a box whose enclosure excludes every level cannot hold a cell the surface crosses, so it is dropped with all
// its children. Only the blocks left are sampled (their points, bit-identical to the dense grid's) and meshed.
// Because no crossed cell is ever dropped, the mesh equals dense marching cubes on the same grid (Lorensen &
// Cline 1987; tables from Bourke, mc-tables.ts) vertex for vertex, while the work follows the surface's area.
// Edge vertices are shared across blocks through a key per lattice edge (point index × 3 + axis), so the mesh is
// indexed and watertight where the surface is closed.
// Octree culling of empty space for isosurfaces: J. Wilhelms & A. Van Gelder, "Octrees for faster isosurface
// generation", ACM Trans. Graph. 11(3), 1992; interval bounds instead of min/max trees: T. Duff, "Interval
// arithmetic and recursive subdivision for implicit functions and constructive solid geometry", SIGGRAPH 1992.

import { CDX, CDY, CDZ, CORNER_OFFSETS, EDGE_AXIS, EDGE_HI, EDGE_LO, EDGE_TABLE, TRI_TABLE } from './mc-tables';
import { EdgeTable, GrowableFloat32, GrowableUint32, type Mesh } from './mesh';
import type { CubeGrid } from './orbital-surfaces';

/** The field as blocks: a safe enclosure over a box, and exact values at a block of lattice points. */
export interface BlockField {
  /**
   * out[0] <= field <= out[1] everywhere in [x0, x1] × [y0, y1] × [z0, z1] (a0); out[2] <= |field| there (0 when
   * unknown), for fields whose sign may flip while their magnitude stays large.
   */
  bound(x0: number, x1: number, y0: number, y1: number, z0: number, z1: number, out: Float64Array): void;
  /**
   * The field at lattice points (-extent + (i0 + ix) h, ...) for ix < nx, iy < ny, iz < nz, x fastest, into `out`.
   * Must give the values a dense sample of the same grid would (bit for bit), so blocks agree on shared faces.
   */
  sample(start: readonly [number, number, number], size: readonly [number, number, number], out: Float32Array): void;
}

export interface SparseLevel {
  level: number;
  /** 'above': the enclosed region is field > level; 'below': field < level. */
  inside: 'above' | 'below';
}

export interface SparseInfo {
  /** Blocks of the full grid, boxes the bound was asked about, blocks sampled, points sampled. */
  blocksTotal: number;
  boxesTested: number;
  blocksActive: number;
  pointsSampled: number;
}


/**
 * Meshes of field = level for each level (no normals: zero vectors; the pipeline's projection writes analytic
 * ones). Cells at the grid's faces are not capped (as extractIsosurface with closeAtBoundary false).
 */
export function extractSparse(field: BlockField, grid: CubeGrid, levels: readonly SparseLevel[], opts: { blockCells?: number } = {}, info?: SparseInfo): Mesh[] {
  const { n, extent } = grid;
  if (!Number.isInteger(n) || n < 2) throw new RangeError(`grid.n must be an integer >= 2 (got ${n})`);
  if (!(extent > 0) || !Number.isFinite(extent)) throw new RangeError(`grid.extent must be > 0 (got ${extent})`);
  const B = opts.blockCells ?? 4;
  if (!Number.isInteger(B) || B < 1) throw new RangeError(`blockCells must be an integer >= 1 (got ${B})`);
  const L = levels.length;
  const h = (2 * extent) / (n - 1);
  const cells = n - 1;
  const nb = Math.ceil(cells / B);
  const stats: SparseInfo = { blocksTotal: nb * nb * nb, boxesTested: 0, blocksActive: 0, pointsSampled: 0 };
  const coord = (i: number) => -extent + i * h;

  // 1. Octree over blocks: keep the blocks whose bound admits a level. mask bit q: level q may cross.
  const active: number[] = []; // triples bx, by, bz and the mask
  const bnd = new Float64Array(3);
  const visit = (x0: number, x1: number, y0: number, y1: number, z0: number, z1: number): void => {
    // block ranges [x0, x1) ...; the box spans cells x0 B .. min(x1 B, cells)
    bnd[2] = 0;
    field.bound(coord(x0 * B), coord(Math.min(x1 * B, cells)), coord(y0 * B), coord(Math.min(y1 * B, cells)), coord(z0 * B), coord(Math.min(z1 * B, cells)), bnd);
    stats.boxesTested++;
    let mask = 0;
    for (let q = 0; q < L; q++) {
      const lv = levels[q].level;
      if (bnd[0] <= lv && lv <= bnd[1] && Math.abs(lv) >= bnd[2]) mask |= 1 << q;
    }
    if (mask === 0) return;
    if (x1 - x0 === 1 && y1 - y0 === 1 && z1 - z0 === 1) {
      active.push(x0, y0, z0, mask);
      return;
    }
    const xm = x1 - x0 > 1 ? (x0 + x1) >> 1 : x1;
    const ym = y1 - y0 > 1 ? (y0 + y1) >> 1 : y1;
    const zm = z1 - z0 > 1 ? (z0 + z1) >> 1 : z1;
    for (const [za, zb] of zm < z1 ? [[z0, zm], [zm, z1]] : [[z0, z1]])
      for (const [ya, yb] of ym < y1 ? [[y0, ym], [ym, y1]] : [[y0, y1]])
        for (const [xa, xb] of xm < x1 ? [[x0, xm], [xm, x1]] : [[x0, x1]]) visit(xa, xb, ya, yb, za, zb);
  };
  visit(0, nb, 0, nb, 0, nb);
  // Blocks in z, y, x order: the output does not depend on the octree's visiting order.
  const order = Array.from({ length: active.length / 4 }, (_, i) => i).sort(
    (a, b) => active[4 * a + 2] - active[4 * b + 2] || active[4 * a + 1] - active[4 * b + 1] || active[4 * a] - active[4 * b],
  );
  stats.blocksActive = order.length;

  // 2. Sample and mesh each active block.
  const S = B + 1;
  const vals = new Float32Array(S * S * S);
  // Sized for about 2B vertices per active block (a surface crossing a block of B³ cells meets about B² edges, and
  // most blocks are active only because the bound is not tight): tables then grow a few times at most.
  const guess = Math.max(1024, order.length * B * 2);
  const out = levels.map(() => ({ pos: new GrowableFloat32(guess * 3), idx: new GrowableUint32(guess * 6), ids: new EdgeTable(guess) }));
  const cv = new Float64Array(8);
  const coff = new Int32Array(8);
  const ev = new Uint32Array(12);
  const N1 = n;
  for (const a of order) {
    const bx = active[4 * a], by = active[4 * a + 1], bz = active[4 * a + 2], mask = active[4 * a + 3];
    const i0 = bx * B, j0 = by * B, k0 = bz * B;
    const sx = Math.min(S, n - i0), sy = Math.min(S, n - j0), sz = Math.min(S, n - k0);
    field.sample([i0, j0, k0], [sx, sy, sz], vals);
    stats.pointsSampled += sx * sy * sz;
    const sxy = sx * sy;
    const cnt = sx * sy * sz;
    let vmin = Infinity;
    let vmax = -Infinity;
    for (let i = 0; i < cnt; i++) {
      const v = vals[i];
      if (v < vmin) vmin = v;
      if (v > vmax) vmax = v;
    }
    // Offsets of the 8 corners in this block's array (Bourke's corner order, CORNER_OFFSETS).
    for (let c = 0; c < 8; c++) coff[c] = CORNER_OFFSETS[c][0] + sx * CORNER_OFFSETS[c][1] + sxy * CORNER_OFFSETS[c][2];
    const o0 = coff[0], o1 = coff[1], o2 = coff[2], o3 = coff[3], o4 = coff[4], o5 = coff[5], o6 = coff[6], o7 = coff[7];
    for (let q = 0; q < L; q++) {
      const level = levels[q].level;
      if ((mask & (1 << q)) === 0 || level < vmin || level > vmax) continue;
      const o = out[q];
      // Room for this block at once (12 edge vertices and 5 triangles per cell at most), not per vertex.
      o.pos.reserve(3 * 12 * (sx - 1) * (sy - 1) * (sz - 1));
      o.idx.reserve(15 * (sx - 1) * (sy - 1) * (sz - 1));
      const s = levels[q].inside === 'above' ? 1 : -1;
      const sl = s * level;
      for (let k = 0; k < sz - 1; k++)
        for (let j = 0; j < sy - 1; j++) {
          const row = sx * j + sxy * k;
          for (let i = 0; i < sx - 1; i++) {
            const b = row + i;
            const v0 = vals[b + o0], v1 = vals[b + o1], v2 = vals[b + o2], v3 = vals[b + o3];
            const v4 = vals[b + o4], v5 = vals[b + o5], v6 = vals[b + o6], v7 = vals[b + o7];
            const ci =
              (s * v0 > sl ? 1 : 0) |
              (s * v1 > sl ? 2 : 0) |
              (s * v2 > sl ? 4 : 0) |
              (s * v3 > sl ? 8 : 0) |
              (s * v4 > sl ? 16 : 0) |
              (s * v5 > sl ? 32 : 0) |
              (s * v6 > sl ? 64 : 0) |
              (s * v7 > sl ? 128 : 0);
            if (ci === 0 || ci === 255) continue;
            cv[0] = v0;
            cv[1] = v1;
            cv[2] = v2;
            cv[3] = v3;
            cv[4] = v4;
            cv[5] = v5;
            cv[6] = v6;
            cv[7] = v7;
            const em = EDGE_TABLE[ci];
            for (let e = 0; e < 12; e++) {
              if ((em & (1 << e)) === 0) continue;
              const lo = EDGE_LO[e];
              const axis = EDGE_AXIS[e];
              const gi = i0 + i + CDX[lo], gj = j0 + j + CDY[lo], gk = k0 + k + CDZ[lo];
              const key = (gi + N1 * (gj + N1 * gk)) * 3 + axis;
              let id = o.ids.get(key);
              if (id < 0) {
                const va = cv[lo];
                const vb = cv[EDGE_HI[e]];
                const t = (level - va) / (vb - va);
                id = o.pos.length / 3;
                // The same arithmetic as extractIsosurface, so both give identical vertices.
                o.pos.data[o.pos.length++] = -extent + h * (gi + (axis === 0 ? t : 0));
                o.pos.data[o.pos.length++] = -extent + h * (gj + (axis === 1 ? t : 0));
                o.pos.data[o.pos.length++] = -extent + h * (gk + (axis === 2 ? t : 0));
                o.ids.set(key, id);
              }
              ev[e] = id;
            }
            // Bits mark inside corners, so Bourke's triangles wind clockwise seen from outside: emit (a, c, b).
            for (let t = ci * 16; t < ci * 16 + 15 && TRI_TABLE[t] >= 0; t += 3) {
              o.idx.data[o.idx.length++] = ev[TRI_TABLE[t]];
              o.idx.data[o.idx.length++] = ev[TRI_TABLE[t + 2]];
              o.idx.data[o.idx.length++] = ev[TRI_TABLE[t + 1]];
            }
          }
        }
    }
  }
  if (info) Object.assign(info, stats);
  return out.map((o) => {
    const positions = o.pos.toArray();
    return { positions, normals: new Float32Array(positions.length), indices: o.idx.toArray() };
  });
}
