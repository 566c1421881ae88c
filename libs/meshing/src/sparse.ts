// Coarse-to-fine extraction: marching cubes on a fine cube grid without sampling the whole grid.
//
// The grid (n points per side over ±extent) is cut into blocks of `blockCells`³ cells. An octree over the blocks
// asks the field for a SAFE enclosure of its values over each box (interval bound, @psiform/orbitals fieldBound);
// a box whose enclosure excludes every level cannot hold a cell the surface crosses, so it is dropped with all
// its children. Only the blocks left are sampled (their points, bit-identical to the dense grid's) and meshed.
// Because no crossed cell is ever dropped, the mesh equals dense marching cubes on the same grid (Lorensen &
// Cline 1987; tables from Bourke, mc-tables.ts) vertex for vertex, while the work follows the surface's area.
// Blocks are visited in z-slabs; values and edge-vertex ids live in rings of B + 1 lattice planes (slot = plane mod
// (B + 1)), each entry stamped with its plane, so nothing is cleared and no hashing is needed (the slab caches of
// the dense kernel, marching-cubes.ts, made sparse). A block does not sample a face its lower neighbour (x, y or z)
// already sampled, so each lattice point near the surface is evaluated about once. Shared edges get one vertex, so
// the mesh is indexed and watertight where the surface is closed.
// Octree culling of empty space for isosurfaces: J. Wilhelms & A. Van Gelder, "Octrees for faster isosurface
// generation", ACM Trans. Graph. 11(3), 1992; interval bounds instead of min/max trees: T. Duff, "Interval
// arithmetic and recursive subdivision for implicit functions and constructive solid geometry", SIGGRAPH 1992.

import { cubeCase, emitCellTriangles, setCorners } from './marching-cubes';
import { CDX, CDY, CDZ, EDGE_AXIS, EDGE_HI, EDGE_LO, EDGE_TABLE } from './mc-tables';
import { GrowableFloat32, GrowableUint32, type Mesh } from './mesh';
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
  if (L > 8) throw new RangeError(`at most 8 levels at once (got ${L})`);
  const h = (2 * extent) / (n - 1);
  const cells = n - 1;
  const nb = Math.ceil(cells / B);
  const stats: SparseInfo = { blocksTotal: nb * nb * nb, boxesTested: 0, blocksActive: 0, pointsSampled: 0 };
  const coord = (i: number) => -extent + i * h;

  // 1. Octree over blocks: keep the blocks whose bound admits a level. masks[block] bit q: level q may cross.
  const masks = new Uint8Array(nb * nb * nb);
  let nActive = 0;
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
      masks[x0 + nb * (y0 + nb * z0)] = mask;
      nActive++;
      return;
    }
    const xm = x1 - x0 > 1 ? (x0 + x1) >> 1 : x1;
    const ym = y1 - y0 > 1 ? (y0 + y1) >> 1 : y1;
    const zm = z1 - z0 > 1 ? (z0 + z1) >> 1 : z1;
    for (let zi = 0; zi < (zm < z1 ? 2 : 1); zi++)
      for (let yi = 0; yi < (ym < y1 ? 2 : 1); yi++)
        for (let xi = 0; xi < (xm < x1 ? 2 : 1); xi++)
          visit(xi ? xm : x0, xi || xm === x1 ? x1 : xm, yi ? ym : y0, yi || ym === y1 ? y1 : ym, zi ? zm : z0, zi || zm === z1 ? z1 : zm);
  };
  visit(0, nb, 0, nb, 0, nb);
  stats.blocksActive = nActive;

  // 2. Sample and mesh the active blocks in z, y, x order (the output does not depend on the octree's order).
  const S = B + 1;
  const R = S; // planes in the rings
  const plane = n * n;
  // Values at (i, j, k): vals[(j R + k mod R) n + i]: rows of x, the R planes' rows of one j side by side, so a
  // block's rows are copied whole and the corners of a cell lie within a few rows of memory.
  const vals = new Float32Array(R * plane);
  const nR = n * R;
  // Offsets of the 8 corners of cell (0, 0, k) for each plane slot of k (Bourke's corner order, mc-tables.ts).
  const cornerTab = new Int32Array(8 * R);
  for (let sl0 = 0; sl0 < R; sl0++)
    for (let c = 0; c < 8; c++) cornerTab[8 * sl0 + c] = CDY[c] * nR + (CDZ[c] ? (sl0 + 1) % R : sl0) * n + CDX[c];
  let box = new Float32Array(S * S * S * 4);
  // Vertex ids of lattice edges, per level: the edge from point (i, j, k) along axis a belongs to the block that
  // holds the point with local coordinates (i mod B, j mod B, k mod B) < B, in a record of 3 B³ L ids in a pool.
  // A block's cells reach points of its own slab and of the next, so two pools (by slab parity) are enough and
  // are reused slab after slab: a few MB however fine the grid (a table over the whole lattice, or a hash, would
  // touch tens of MB of fresh memory at 512³, which costs more here than the marching itself).
  const nbo = nb + 1; // the last lattice point may begin a block of its own
  // A record starts with one base per level: the level's vertex count when the record was (re)used. Vertex ids only
  // grow, so an entry (id + 1) is current exactly when it exceeds the base: reused records need no clearing.
  const rec = L + 3 * B * B * B * L;
  let perSlab = 0;
  for (let bz = 0, i = 0; bz < nb; bz++) {
    let c = 0;
    for (let q = 0; q < nb * nb; q++, i++) if (masks[i] !== 0) c++;
    perSlab = Math.max(perSlab, c);
  }
  // Records a slab needs: its active blocks and the neighbours their cells reach (about 3 each; grown if more).
  const pools = [0, 1].map(() => ({ slab: -1, count: 0, data: new Int32Array(rec * (3 * perSlab + 64)), map: new Int32Array(nbo * nbo), stamp: new Int32Array(nbo * nbo) }));
  const poolFor = (bz: number) => {
    const p = pools[bz & 1];
    if (p.slab !== bz) {
      p.slab = bz;
      p.count = 0;
    }
    return p;
  };
  /** Offset in pool.data of the record of block (bx, by) of slab bz (created empty on first use). */
  const recordOf = (p: (typeof pools)[number], bx: number, by: number, bz: number): number => {
    const key = bx + nbo * by;
    if (p.stamp[key] === bz + 1) return p.map[key];
    if ((p.count + 1) * rec > p.data.length) {
      const next = new Int32Array(p.data.length * 2);
      next.set(p.data.subarray(0, p.count * rec));
      p.data = next;
    }
    const off = p.count++ * rec;
    for (let q = 0; q < L; q++) p.data[off + q] = out[q].pos.length / 3;
    p.map[key] = off;
    p.stamp[key] = bz + 1;
    return off;
  };
  // Sized for about 2.5 B vertices per active block over all levels (a surface crossing a block of B³ cells meets
  // about 2 B² edges, each shared by about 4 cells, and many blocks are active only because the bound is not tight):
  // buffers then grow once or twice at most, and no fresh memory is touched in vain (page faults cost here).
  const guess = Math.max(1024, Math.ceil((nActive * B * 2.5) / L));
  const out = levels.map(() => ({ pos: new GrowableFloat32(guess * 3), idx: new GrowableUint32(guess * 6) }));
  const cv = new Float64Array(8);
  const ev = new Uint32Array(12);
  const owner = new Int32Array(8); // records of this block and its +x, +y, +z neighbours (bits 1, 2, 4), -1: not yet
  const start: [number, number, number] = [0, 0, 0];
  const size: [number, number, number] = [0, 0, 0];
  const active = (bx: number, by: number, bz: number) => bx >= 0 && by >= 0 && bz >= 0 && masks[bx + nb * (by + nb * bz)] !== 0;
  for (let bz = 0; bz < nb; bz++) {
    const here = poolFor(bz);
    const above = poolFor(bz + 1);
    for (let by = 0; by < nb; by++) {
      for (let bx = 0; bx < nb; bx++) {
        const mask = masks[bx + nb * (by + nb * bz)];
        if (mask === 0) continue;
        owner.fill(-1);
        const i0 = bx * B, j0 = by * B, k0 = bz * B;
        const sx = Math.min(S, n - i0), sy = Math.min(S, n - j0), sz = Math.min(S, n - k0);
        const row0 = nb * (by + nb * bz);
        // The lower faces an active neighbour already sampled are skipped: their values are still in the rings (the
        // -x and -y neighbours in this slab, the -z neighbour in the slab just before, whose top plane keeps its slot).
        const dy = active(bx, by - 1, bz) ? 1 : 0;
        const dz = active(bx, by, bz - 1) ? 1 : 0;
        const prev = bx > 0 && masks[row0 + bx - 1] !== 0;
        if (!prev || dy !== (active(bx - 1, by - 1, bz) ? 1 : 0) || dz !== (active(bx - 1, by, bz - 1) ? 1 : 0)) {
          // First block of a run of active blocks along x with the same faces to skip: sample the run in one box
          // (long rows cost less per point than short ones).
          let end = bx;
          while (end + 1 < nb && masks[row0 + end + 1] !== 0 && (active(end + 1, by - 1, bz) ? 1 : 0) === dy && (active(end + 1, by, bz - 1) ? 1 : 0) === dz) end++;
          const dx = prev ? 1 : 0;
          const ux = Math.min((end - bx + 1) * B + 1, n - i0) - dx, uy = sy - dy, uz = sz - dz;
          if (box.length < ux * uy * uz) box = new Float32Array(ux * S * S);
          start[0] = i0 + dx;
          start[1] = j0 + dy;
          start[2] = k0 + dz;
          size[0] = ux;
          size[1] = uy;
          size[2] = uz;
          field.sample(start, size, box);
          stats.pointsSampled += ux * uy * uz;
          for (let k = 0, b = 0; k < uz; k++) {
            const slot = (k0 + dz + k) % R;
            for (let j = 0; j < uy; j++) {
              const row = (j0 + dy + j) * nR + slot * n + i0 + dx;
              for (let i = 0; i < ux; i++, b++) vals[row + i] = box[b];
            }
          }
        }
        let vmin = Infinity;
        let vmax = -Infinity;
        for (let k = 0; k < sz; k++) {
          const slot = (k0 + k) % R;
          for (let j = 0; j < sy; j++) {
            const row = (j0 + j) * nR + slot * n + i0;
            for (let i = 0; i < sx; i++) {
              const v = vals[row + i];
              if (v < vmin) vmin = v;
              if (v > vmax) vmax = v;
            }
          }
        }
        for (let q = 0; q < L; q++) {
          const level = levels[q].level;
          if ((mask & (1 << q)) === 0 || level < vmin || level > vmax) continue;
          const o = out[q];
          // Room for this block at once (12 edge vertices and 5 triangles per cell at most), not per vertex.
          const nc = (sx - 1) * (sy - 1) * (sz - 1);
          o.pos.reserve(3 * 12 * nc);
          o.idx.reserve(15 * nc);
          const pos = o.pos.data;
          const idx = o.idx.data;
          const s = levels[q].inside === 'above' ? 1 : -1;
          const sl = s * level;
          for (let k = 0; k < sz - 1; k++) {
            const gk = k0 + k;
            const ct = 8 * (gk % R);
            const o0 = cornerTab[ct], o1 = cornerTab[ct + 1], o2 = cornerTab[ct + 2], o3 = cornerTab[ct + 3];
            const o4 = cornerTab[ct + 4], o5 = cornerTab[ct + 5], o6 = cornerTab[ct + 6], o7 = cornerTab[ct + 7];
            for (let j = 0; j < sy - 1; j++) {
              const gj = j0 + j;
              for (let i = 0; i < sx - 1; i++) {
                const gi = i0 + i;
                const b = gj * nR + gi;
                const v0 = vals[b + o0], v1 = vals[b + o1], v2 = vals[b + o2], v3 = vals[b + o3];
                const v4 = vals[b + o4], v5 = vals[b + o5], v6 = vals[b + o6], v7 = vals[b + o7];
                const ci = cubeCase(s, sl, v0, v1, v2, v3, v4, v5, v6, v7);
                if (ci === 0 || ci === 255) continue;
                setCorners(cv, v0, v1, v2, v3, v4, v5, v6, v7);
                const em = EDGE_TABLE[ci];
                for (let e = 0; e < 12; e++) {
                  if ((em & (1 << e)) === 0) continue;
                  const lo = EDGE_LO[e];
                  const axis = EDGE_AXIS[e];
                  const pk = gk + CDZ[lo];
                  const pi = gi + CDX[lo];
                  const pj = gj + CDY[lo];
                  // Local coordinates in the owning block: this block, or its +x / +y / +z neighbour at local 0.
                  let li = pi - i0;
                  let lj = pj - j0;
                  let lk = pk - k0;
                  let w = 0;
                  if (li === B) {
                    li = 0;
                    w |= 1;
                  }
                  if (lj === B) {
                    lj = 0;
                    w |= 2;
                  }
                  if (lk === B) {
                    lk = 0;
                    w |= 4;
                  }
                  const pool = w & 4 ? above : here;
                  let r0 = owner[w];
                  if (r0 < 0) r0 = owner[w] = recordOf(pool, bx + (w & 1), by + ((w >> 1) & 1), bz + (w >> 2));
                  const slot = r0 + L + (((lk * B + lj) * B + li) * 3 + axis) * L + q;
                  const known = pool.data[slot];
                  if (known > pool.data[r0 + q]) {
                    ev[e] = known - 1;
                    continue;
                  }
                  const va = cv[lo];
                  const vb = cv[EDGE_HI[e]];
                  const t = (level - va) / (vb - va);
                  const id = o.pos.length / 3;
                  // The same arithmetic as extractIsosurface, so both give identical vertices.
                  pos[o.pos.length++] = -extent + h * (pi + (axis === 0 ? t : 0));
                  pos[o.pos.length++] = -extent + h * (pj + (axis === 1 ? t : 0));
                  pos[o.pos.length++] = -extent + h * (pk + (axis === 2 ? t : 0));
                  pool.data[slot] = id + 1;
                  ev[e] = id;
                }
                o.idx.length = emitCellTriangles(ci, ev, idx, o.idx.length);
              }
            }
          }
        }
      }
    }
  }
  if (info) Object.assign(info, stats);
  // Views of the buffers, not copies: a copy of a 512³ surface's arrays costs more than marching it (fresh pages).
  return out.map((o) => {
    const positions = o.pos.data.subarray(0, o.pos.length);
    return { positions, normals: new Float32Array(positions.length), indices: o.idx.data.subarray(0, o.idx.length) };
  });
}
