// Coarse-to-fine extraction: marching cubes on a fine cube grid without sampling the whole grid.
//
// The grid (n points per side over ±extent) is cut into blocks of `blockCells`³ cells. An octree over the blocks
// asks the field for a SAFE enclosure of its values over each box (interval bound, @psiform/orbitals fieldBound);
// a box whose enclosure excludes every level cannot hold a cell the surface crosses, so it is dropped with all
// its children. Only the blocks left are sampled (their points, bit-identical to the dense grid's) and meshed.
// Because no crossed cell is ever dropped, the mesh equals dense marching cubes on the same grid (Lorensen &
// Cline 1987; tables from Bourke, mc-tables.ts) vertex for vertex, while the work follows the surface's area.
// Blocks are visited in z-slabs; values and edge-vertex ids live in rings of B + 1 lattice planes (slot = plane mod
// (B + 1)); an id is current when it is above the level's vertex count at the time its plane entered the ring, so
// nothing is cleared and no hashing is needed (the slab caches of the dense kernel, marching-cubes.ts, made sparse).
// Cube cases come from rows of inside bits (one int per row of a block), so the many cells a surface does not
// cross cost a few integer operations each. A block does not sample a face its lower neighbour (x, y or z)
// already sampled, so each lattice point near the surface is evaluated about once. Shared edges get one vertex, so
// the mesh is indexed and watertight where the surface is closed.
// Octree culling of empty space for isosurfaces: J. Wilhelms & A. Van Gelder, "Octrees for faster isosurface
// generation", ACM Trans. Graph. 11(3), 1992; interval bounds instead of min/max trees: T. Duff, "Interval
// arithmetic and recursive subdivision for implicit functions and constructive solid geometry", SIGGRAPH 1992.

import { emitCellTriangles } from './marching-cubes';
import { CDX, CDY, CDZ, EDGE_AXIS, EDGE_HI, EDGE_LO, EDGE_TABLE } from './mc-tables';
import { GrowableFloat32, GrowableUint32, GrowableUint8, type Mesh } from './mesh';
import type { CubeGrid } from './orbital-surfaces';

const { abs, ceil, fround, max, min } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

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

/**
 * A dense sampled field as blocks: every block is offered (the bound is unbounded) and the extractor skips the
 * levels outside each block's own sampled range, which is exact; values are read from the array.
 */
export function denseBlockField(f: Float32Array, n: number): BlockField {
  return {
    bound(_x0, _x1, _y0, _y1, _z0, _z1, out) {
      out[0] = -Infinity;
      out[1] = Infinity;
    },
    sample(start, size, out) {
      for (let k = 0, i = 0; k < size[2]; k++)
        for (let j = 0; j < size[1]; j++) {
          const row = start[0] + n * (start[1] + j + n * (start[2] + k));
          for (let q = 0; q < size[0]; q++, i++) out[i] = f[row + q];
        }
    },
  };
}

/**
 * Cube case (Bourke's corner order, bit c: corner c inside) of the 8 corner bits in lattice order (bit x + 2 y + 4 z
 * for the corner at offset (x, y, z)): the extractor reads corner bits from packed rows in lattice order.
 */
const NAT_TO_CASE = (() => {
  const t = new Uint8Array(256);
  for (let nat = 0; nat < 256; nat++) {
    let ci = 0;
    for (let c = 0; c < 8; c++) if (nat & (1 << (CDX[c] + 2 * CDY[c] + 4 * CDZ[c]))) ci |= 1 << c;
    t[nat] = ci;
  }
  return t;
})();

/**
 * Per edge: the lattice offset of its low corner and the unit step along its axis (Bourke's numbering), as doubles so
 * a vertex is gi + EOX[e] + EAX[e] t, the same arithmetic as extractIsosurface's gi + CDX[lo] + (axis === 0 ? t : 0).
 */
const EOX = new Float64Array(12), EOY = new Float64Array(12), EOZ = new Float64Array(12);
const EAX = new Float64Array(12), EAY = new Float64Array(12), EAZ = new Float64Array(12);
for (let e = 0; e < 12; e++) {
  EOX[e] = CDX[EDGE_LO[e]];
  EOY[e] = CDY[EDGE_LO[e]];
  EOZ[e] = CDZ[EDGE_LO[e]];
  EAX[e] = EDGE_AXIS[e] === 0 ? 1 : 0;
  EAY[e] = EDGE_AXIS[e] === 1 ? 1 : 0;
  EAZ[e] = EDGE_AXIS[e] === 2 ? 1 : 0;
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
 * The lattice-plane rings the blocks of a slab share (one per extraction): point values, edge-vertex offsets, and the
 * scratch of one block. A fixed-shape object so meshBlock reads it the same way on every call.
 */
interface Ring {
  n: number;
  /** Points per block side (B + 1) and planes in the rings (= S). */
  S: number;
  R: number;
  /** n R: values of one j (the R planes' rows side by side). */
  nR: number;
  extent: number;
  h: number;
  /** Values at (i, j, k): vals[(j R + k mod R) n + i]. */
  vals: Float32Array;
  /**
   * Per plane slot of a cell's k: offset of each of its 12 edges in a level's ids from the cell's 3 (j n + i), and
   * the edge's plane slot. ids[3 ((p mod R) n + j) n + 3 i + a] = id + 1 of the vertex on the lattice edge from
   * point (i, j, p) along axis a (a point's three axes side by side, so a cell's 12 edges lie in 4 short runs of
   * memory); current when above base[q R + p mod R], the level's vertex count when plane p entered the ring (ids only
   * grow), so nothing is ever cleared. 3 R n² ids per level (19 MB at 512³ with R = 6), touched only near the surface.
   */
  edgeTab: Int32Array;
  edgePlane: Int32Array;
  /** Per plane slot of a cell's k: offsets in vals of each edge's low and high corner from the cell's (j nR + i). */
  edgeLoOff: Int32Array;
  edgeHiOff: Int32Array;
  base: Int32Array;
  /** Inside bits of the block's rows of points (bit i: point i of the row is strictly inside). */
  rowBits: Int32Array;
  ev: Uint32Array;
  /** With mirror symmetry on an even grid, the middle cell layer's index (its cells are their own mirrors); else -1. */
  straddle: number;
}

/** One level's mesh under construction and its edge-vertex ids. */
interface LevelMesh {
  q: number;
  level: number;
  /** +1: inside is field > level; -1: field < level. */
  s: number;
  ids: Int32Array;
  pos: GrowableFloat32;
  idx: GrowableUint32;
  /**
   * With mirror symmetry: per triangle, bit a set when its cell is its own mirror along axis a (the middle cell
   * layer of an even grid, Ring.straddle); null otherwise.
   */
  flags: GrowableUint8 | null;
}

/** Copies a sampled box (x fastest) into the ring's rows: points (i0 + i, j0 + j, k0 + k), i < ux, j < uy, k < uz. */
function intoRing(g: Ring, box: Float32Array, i0: number, j0: number, k0: number, ux: number, uy: number, uz: number): void {
  const { n, R, nR, vals } = g;
  for (let k = 0, b = 0; k < uz; k++) {
    const slot = (k0 + k) % R;
    for (let j = 0; j < uy; j++) {
      const row = (j0 + j) * nR + slot * n + i0;
      for (let i = 0; i < ux; i++, b++) vals[row + i] = box[b];
    }
  }
}

/**
 * Marching cubes of one level over one block (points i0..i0+sx-1, ...; values already in the ring). Its own function,
 * kept small, so the engine compiles it once, quickly (one function holding the octree, the sampling and this loop
 * took over 100 ms to optimise, three times, measured here).
 */
function meshBlock(g: Ring, o: LevelMesh, i0: number, j0: number, k0: number, sx: number, sy: number, sz: number, ci0: number, cj0: number, ck0: number): void {
  const { n, S, R, nR, extent, h, vals, edgeTab, edgePlane, edgeLoOff, edgeHiOff, base, rowBits, ev, straddle: st } = g;
  // Tables in locals: a module import is a property load at every use in the compiled output.
  const natToCase = NAT_TO_CASE, edgeTable = EDGE_TABLE;
  const eox = EOX, eoy = EOY, eoz = EOZ, eax = EAX, eay = EAY, eaz = EAZ;
  const level = o.level;
  const s = o.s;
  const sl = s * level;
  const full = (1 << sx) - 1;
  // Inside bits row by row (the cube cases below are read from them); a level no point of the block is on either
  // side of makes no triangle here (as cubeCase: strictly beyond the level is inside).
  let any = 0;
  let all = full;
  for (let k = 0; k < sz; k++) {
    const slot = (k0 + k) % R;
    for (let j = 0; j < sy; j++) {
      const row = (j0 + j) * nR + slot * n + i0;
      let bits = 0;
      for (let i = 0; i < sx; i++) if (s * vals[row + i] > sl) bits |= 1 << i;
      rowBits[k * S + j] = bits;
      any |= bits;
      all &= bits;
    }
  }
  if (any === 0 || all === full) return;
  // Room for this block at once (12 edge vertices and 5 triangles per cell at most), not per vertex.
  const nc = (sx - 1) * (sy - 1) * (sz - 1);
  o.pos.reserve(3 * 12 * nc);
  o.idx.reserve(15 * nc);
  const pos = o.pos.data;
  const idx = o.idx.data;
  const ids = o.ids;
  const bq = o.q * R;
  let nv = o.pos.length / 3;
  let ni = o.idx.length;
  const fl = o.flags;
  let flags: Uint8Array | null = null;
  if (fl) {
    fl.reserve(5 * nc);
    flags = fl.data;
  }
  // Cells from (ci0, cj0, ck0) of the block on: with mirror symmetry the lower half of a middle block is not meshed.
  for (let k = ck0; k < sz - 1; k++) {
    const gk = k0 + k;
    const sk = gk % R;
    const et = 12 * sk;
    for (let j = cj0; j < sy - 1; j++) {
      const ra = rowBits[k * S + j], rb = rowBits[k * S + j + 1], rc = rowBits[(k + 1) * S + j], rd = rowBits[(k + 1) * S + j + 1];
      // Four rows of points all on one side: no cell of this row is crossed.
      if ((ra | rb | rc | rd) === 0 || (ra & rb & rc & rd) === full) continue;
      const gj = j0 + j;
      for (let i = ci0; i < sx - 1; i++) {
        // Corner bits in lattice order (x + 2 y + 4 z), then Bourke's corner order (NAT_TO_CASE).
        const nat = ((ra >> i) & 3) | (((rb >> i) & 3) << 2) | (((rc >> i) & 3) << 4) | (((rd >> i) & 3) << 6);
        if (nat === 0 || nat === 255) continue;
        const ci = natToCase[nat];
        const gi = i0 + i;
        const vb0 = gj * nR + gi;
        const lat = 3 * (gj * n + gi);
        // The cut edges only (lowest set bit first), not all twelve.
        for (let em = edgeTable[ci]; em !== 0; em &= em - 1) {
          const e = 31 - Math.clz32(em & -em);
          const te = et + e;
          const at = edgeTab[te] + lat;
          const known = ids[at];
          if (known > base[bq + edgePlane[te]]) {
            ev[e] = known - 1;
            continue;
          }
          const va = vals[vb0 + edgeLoOff[te]];
          const t = (level - va) / (vals[vb0 + edgeHiOff[te]] - va);
          const p3 = 3 * nv;
          // The same arithmetic as extractIsosurface, so both give identical vertices.
          pos[p3] = -extent + h * (gi + eox[e] + eax[e] * t);
          pos[p3 + 1] = -extent + h * (gj + eoy[e] + eay[e] * t);
          pos[p3 + 2] = -extent + h * (gk + eoz[e] + eaz[e] * t);
          ids[at] = nv + 1;
          ev[e] = nv++;
        }
        const n0 = ni;
        ni = emitCellTriangles(ci, ev, idx, ni);
        if (flags) {
          const f = (gi === st ? 1 : 0) | (gj === st ? 2 : 0) | (gk === st ? 4 : 0);
          for (let t = n0 / 3; t < ni / 3; t++) flags[t] = f;
        }
      }
    }
  }
  o.pos.length = 3 * nv;
  o.idx.length = ni;
  if (fl) fl.length = ni / 3;
}

export interface SparseOptions {
  /** Cells per block side (default 5). */
  blockCells?: number;
  /**
   * Mirror symmetry of the field about the grid's centre planes, per axis (x, y, z): +1 when field(-x, y, z) =
   * field(x, y, z), -1 when it is -field(x, y, z), 0 when neither is known. With any non-zero entry and an odd
   * blockCells, only the blocks on the upper side of each symmetric axis are bounded, sampled and meshed, and the
   * mesh is reflected (see extractSparse). An antisymmetric axis needs each level's negative among the levels (the
   * reflection of level c's surface is level -c's); otherwise symmetry is not used. The caller vouches for the
   * symmetry: it is not checked.
   */
  mirror?: readonly [number, number, number];
}

/**
 * Meshes of field = level for each level (no normals: zero vectors; the pipeline's projection writes analytic
 * ones). Cells at the grid's faces are not capped (as extractIsosurface with closeAtBoundary false).
 *
 * Mirror symmetry (opts.mirror): point i of an axis mirrors to point n - 1 - i. Blocks are laid so that their
 * boundaries are mirror images of each other (block b covers points b B - shift .. b B - shift + B, clipped, with
 * 2 (B - shift) = n - 1 mod B: solvable for odd B), so block b mirrors to block K - b. Only the blocks with
 * b >= K - b on every symmetric axis (the upper ones) are bounded, sampled and meshed, and only their cells on the
 * upper side of the centre (for an even n, the middle cell layer too: each of its cells is its own mirror, and its
 * lower plane takes the reflected values of its upper plane, so its surface is symmetric). Then, axis by axis, the
 * mesh is reflected (negated coordinate, reversed winding; across an antisymmetric axis level q's reflection is
 * its negative level's mesh), leaving out the middle layer's triangles; a reflected vertex on the seam plane (the
 * centre plane for odd n, the middle layer's upper plane for even n) is the target level's vertex on the seam
 * (same other coordinates, bit for bit: same values, same arithmetic), so the mesh is watertight across it. The
 * seam's crossings are the same on both sides by construction, so the reflected half always joins the upper one.
 * The work falls by about 2 per symmetric axis (8 for 3d_z²).
 */
export function extractSparse(field: BlockField, grid: CubeGrid, levels: readonly SparseLevel[], opts: SparseOptions = {}, info?: SparseInfo): Mesh[] {
  const { n, extent } = grid;
  if (!Number.isInteger(n) || n < 2) throw new RangeError(`grid.n must be an integer >= 2 (got ${n})`);
  if (!(extent > 0) || !Number.isFinite(extent)) throw new RangeError(`grid.extent must be > 0 (got ${extent})`);
  // 5³-cell blocks: against 4³ (measured in bench.mjs's coarse-to-fine section, 3d_z² at 512³, 8 fresh processes
  // each) a third fewer boxes to bound and blocks to visit outweigh a fifth more points sampled: about 10 % less time.
  const B = opts.blockCells ?? 5;
  // B + 1 points per row fit one int of inside bits (rowBits below).
  if (!Number.isInteger(B) || B < 1 || B > 30) throw new RangeError(`blockCells must be an integer from 1 to 30 (got ${B})`);
  const L = levels.length;
  if (L > 8) throw new RangeError(`at most 8 levels at once (got ${L})`);
  const h = (2 * extent) / (n - 1);
  const cells = n - 1;

  // Symmetry (see the doc comment): which axes, the level each level maps to across an antisymmetric axis.
  const mirror = opts.mirror ?? [0, 0, 0];
  if (mirror.length !== 3 || mirror.some((a) => a !== 0 && a !== 1 && a !== -1)) throw new RangeError('mirror must hold three entries, each -1, 0 or 1');
  const pair = levels.map((l) => levels.findIndex((m) => m.level === -l.level && m.inside !== l.inside));
  const sym = B % 2 === 1 && mirror.some((a) => a !== 0) && (mirror.every((a) => a !== -1) || pair.every((p) => p >= 0));
  const symX = sym && mirror[0] !== 0, symY = sym && mirror[1] !== 0, symZ = sym && mirror[2] !== 0;
  const shift = sym ? (B - (((n - 1) * ((B + 1) / 2)) % B)) % B : 0;
  const nb = ceil((cells + shift) / B);
  // Block b mirrors to block K - b (K = nb - 1 when symmetric); blocks lo.. are the upper ones.
  const K = (n - 1 + 2 * shift - B) / B;
  const lo = sym ? ceil(K / 2) : 0;
  const stats: SparseInfo = { blocksTotal: nb * nb * nb, boxesTested: 0, blocksActive: 0, pointsSampled: 0 };
  const coord = (i: number) => -extent + i * h;
  /** First point (= first cell) of block b, and one past its last cell (its last point). */
  const first = (b: number) => max(0, b * B - shift);
  const last = (b: number) => min(b * B - shift + B, cells);

  // 1. Octree over blocks: keep the blocks whose bound admits a level. masks[block] bit q: level q may cross.
  const masks = new Uint8Array(nb * nb * nb);
  let nActive = 0;
  const bnd = new Float64Array(3);
  const visit = (x0: number, x1: number, y0: number, y1: number, z0: number, z1: number): void => {
    // block ranges [x0, x1) ...; the box spans cells first(x0) .. last(x1 - 1)
    bnd[2] = 0;
    field.bound(coord(first(x0)), coord(last(x1 - 1)), coord(first(y0)), coord(last(y1 - 1)), coord(first(z0)), coord(last(z1 - 1)), bnd);
    stats.boxesTested++;
    let mask = 0;
    for (let q = 0; q < L; q++) {
      const lv = levels[q].level;
      if (bnd[0] <= lv && lv <= bnd[1] && abs(lv) >= bnd[2]) mask |= 1 << q;
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
  const lx = symX ? lo : 0, ly = symY ? lo : 0, lz = symZ ? lo : 0;
  visit(lx, nb, ly, nb, lz, nb);
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
  // Vertex ids of lattice edges, per level, in the same ring of R planes (see Ring.edgeTab).
  const ids = levels.map(() => new Int32Array(3 * R * plane));
  const base = new Int32Array(L * R);
  const edgeTab = new Int32Array(12 * R);
  const edgePlane = new Int32Array(12 * R);
  const edgeLoOff = new Int32Array(12 * R);
  const edgeHiOff = new Int32Array(12 * R);
  for (let sl0 = 0; sl0 < R; sl0++)
    for (let e = 0; e < 12; e++) {
      const lo0 = EDGE_LO[e];
      const p = (sl0 + CDZ[lo0]) % R;
      edgeTab[12 * sl0 + e] = 3 * ((p * n + CDY[lo0]) * n + CDX[lo0]) + EDGE_AXIS[e];
      edgePlane[12 * sl0 + e] = p;
      edgeLoOff[12 * sl0 + e] = cornerTab[8 * sl0 + lo0];
      edgeHiOff[12 * sl0 + e] = cornerTab[8 * sl0 + EDGE_HI[e]];
    }
  // Sized for about 2.5 B vertices per active block over all levels (a surface crossing a block of B³ cells meets
  // about 2 B² edges, each shared by about 4 cells, and many blocks are active only because the bound is not tight):
  // buffers then grow once or twice at most, and no fresh memory is touched in vain (page faults cost here).
  const guess = max(1024, ceil((nActive * B * 2.5) / L));
  // The middle cell layer of an even grid (its own mirror); -1 when the centre is a lattice plane (odd n).
  const straddle = sym && n % 2 === 0 ? n / 2 - 1 : -1;
  const ring: Ring = { n, S, R, nR, extent, h, vals, edgeTab, edgePlane, edgeLoOff, edgeHiOff, base, rowBits: new Int32Array(S * S), ev: new Uint32Array(12), straddle };
  const lv: LevelMesh[] = levels.map((l, q) => ({
    q,
    level: l.level,
    s: l.inside === 'above' ? 1 : -1,
    ids: ids[q],
    pos: new GrowableFloat32(guess * 3),
    idx: new GrowableUint32(guess * 6),
    flags: sym ? new GrowableUint8() : null,
  }));
  const start: [number, number, number] = [0, 0, 0];
  const size: [number, number, number] = [0, 0, 0];
  // Blocks outside the upper region are never visited (with symmetry): they count as inactive.
  const active = (bx: number, by: number, bz: number) => bx >= lx && by >= ly && bz >= lz && masks[bx + nb * (by + nb * bz)] !== 0;
  // The first cell meshed along an axis in block b: the lower half of a middle block lies below the centre.
  const centre = (n - 1) >> 1;
  const cellStart = (on: boolean, b: number) => (on && b === lo && first(b) < centre ? centre - first(b) : 0);
  for (let bz = lz; bz < nb; bz++) {
    const k0 = first(bz);
    // Planes entering the ring with this slab (its lowest plane came in with the slab before, as that one's top).
    for (let p = bz === lz ? k0 : k0 + 1; p <= last(bz); p++) for (let q = 0; q < L; q++) base[q * R + (p % R)] = lv[q].pos.length / 3;
    for (let by = ly; by < nb; by++) {
      for (let bx = lx; bx < nb; bx++) {
        const mask = masks[bx + nb * (by + nb * bz)];
        if (mask === 0) continue;
        const i0 = first(bx), j0 = first(by);
        const sx = last(bx) - i0 + 1, sy = last(by) - j0 + 1, sz = last(bz) - k0 + 1;
        const row0 = nb * (by + nb * bz);
        // The lower faces an active neighbour already sampled are skipped: their values are still in the rings (the
        // -x and -y neighbours in this slab, the -z neighbour in the slab just before, whose top plane keeps its slot).
        const dy = active(bx, by - 1, bz) ? 1 : 0;
        const dz = active(bx, by, bz - 1) ? 1 : 0;
        const prev = active(bx - 1, by, bz);
        if (!prev || dy !== (active(bx - 1, by - 1, bz) ? 1 : 0) || dz !== (active(bx - 1, by, bz - 1) ? 1 : 0)) {
          // First block of a run of active blocks along x with the same faces to skip: sample the run in one box
          // (long rows cost less per point than short ones).
          let end = bx;
          while (end + 1 < nb && masks[row0 + end + 1] !== 0 && (active(end + 1, by - 1, bz) ? 1 : 0) === dy && (active(end + 1, by, bz - 1) ? 1 : 0) === dz) end++;
          const dx = prev ? 1 : 0;
          const ux = last(end) - i0 + 1 - dx, uy = sy - dy, uz = sz - dz;
          if (box.length < ux * uy * uz) box = new Float32Array(ux * S * S);
          start[0] = i0 + dx;
          start[1] = j0 + dy;
          start[2] = k0 + dz;
          size[0] = ux;
          size[1] = uy;
          size[2] = uz;
          field.sample(start, size, box);
          stats.pointsSampled += ux * uy * uz;
          intoRing(ring, box, i0 + dx, j0 + dy, k0 + dz, ux, uy, uz);
        }
        if (straddle >= 0) reflectMiddle(ring, mirror, symX && bx === lo, symY && by === lo, symZ && bz === lo, i0, j0, k0, sx, sy, sz);
        const ci0 = cellStart(symX, bx), cj0 = cellStart(symY, by), ck0 = cellStart(symZ, bz);
        for (let q = 0; q < L; q++) if ((mask & (1 << q)) !== 0) meshBlock(ring, lv[q], i0, j0, k0, sx, sy, sz, ci0, cj0, ck0);
      }
    }
  }
  if (info) Object.assign(info, stats);
  if (sym) {
    // The seam: the centre plane (odd n) or the middle layer's planes (even n: upper plane reflects onto the lower).
    const srcPlane = straddle >= 0 ? straddle + 1 : centre;
    const dstPlane = straddle >= 0 ? straddle : centre;
    // Room for the whole mesh at once (each pass at most doubles every level with the largest level's part): the
    // passes then append in place, with no copies; pages never written cost nothing.
    let factor = 1;
    for (const on of [symX, symY, symZ]) if (on) factor *= 2;
    const nvMax = max(...lv.map((o) => o.pos.length / 3));
    const ntMax = max(...lv.map((o) => o.idx.length / 3));
    for (const o of lv) {
      o.pos.reserve(3 * nvMax * factor - o.pos.length);
      o.idx.reserve(3 * ntMax * factor - o.idx.length);
      o.flags!.reserve(ntMax * factor - o.flags!.length);
    }
    for (let a = 0; a < 3; a++) {
      if (!(a === 0 ? symX : a === 1 ? symY : symZ)) continue;
      reflectAcross(lv, a, mirror[a] < 0 ? pair : null, fround(coord(srcPlane)), fround(coord(dstPlane)));
    }
  }
  // Views of the buffers, not copies: a copy of a 512³ surface's arrays costs more than marching it (fresh pages).
  return lv.map((o) => {
    const positions = o.pos.data.subarray(0, o.pos.length);
    return { positions, normals: new Float32Array(positions.length), indices: o.idx.data.subarray(0, o.idx.length) };
  });
}

/**
 * The lower plane of the middle layer (point index mid = Ring.straddle) takes the reflected values of its upper plane (mid + 1)
 * along each axis whose middle block this is (x, then y, then z, so a point reflected along several axes reads an
 * already reflected value), negated across an antisymmetric axis: the layer's cells are then exact mirrors of
 * themselves, and the seam's crossings match on both sides.
 */
function reflectMiddle(g: Ring, mirror: readonly number[], mx: boolean, my: boolean, mz: boolean, i0: number, j0: number, k0: number, sx: number, sy: number, sz: number): void {
  const { n, R, nR, vals, straddle: mid } = g;
  if (mx) {
    const sg = mirror[0] < 0 ? -1 : 1;
    for (let k = 0; k < sz; k++) {
      const slot = (k0 + k) % R;
      for (let j = 0; j < sy; j++) {
        const row = (j0 + j) * nR + slot * n;
        vals[row + mid] = sg * vals[row + mid + 1];
      }
    }
  }
  if (my) {
    const sg = mirror[1] < 0 ? -1 : 1;
    for (let k = 0; k < sz; k++) {
      const slot = (k0 + k) % R;
      const lo = mid * nR + slot * n, hi = (mid + 1) * nR + slot * n;
      for (let i = i0; i < i0 + sx; i++) vals[lo + i] = sg * vals[hi + i];
    }
  }
  if (mz) {
    const sg = mirror[2] < 0 ? -1 : 1;
    const slo = (mid % R) * n, shi = ((mid + 1) % R) * n;
    for (let j = j0; j < j0 + sy; j++) for (let i = i0; i < i0 + sx; i++) vals[j * nR + slo + i] = sg * vals[j * nR + shi + i];
  }
}

/**
 * One mirror pass along axis a (see extractSparse), in place: each level keeps its triangles and gains the reflection
 * of its source's (itself, or with `pair` its negative level's) triangles outside the middle layer, as they were
 * before the pass; a source vertex with coordinate a equal to `src` (the seam) becomes the level's own vertex with
 * coordinate `dst` and the same other two coordinates, any other one a new vertex with coordinate a negated. Winding
 * is reversed (a reflection turns it). The buffers have room for the result (extractSparse reserved it).
 */
function reflectAcross(lv: readonly LevelMesh[], a: number, pair: readonly number[] | null, src: number, dst: number): void {
  const b1 = (a + 1) % 3, b2 = (a + 2) % 3;
  const bit = 1 << a;
  // Counts before the pass: a level may be another's source and be extended first.
  const nv0 = lv.map((o) => o.pos.length / 3);
  const nt0 = lv.map((o) => o.idx.length / 3);
  lv.forEach((target, q) => {
    const sq = pair ? pair[q] : q;
    const source = lv[sq];
    const pos = target.pos.data, idx = target.idx.data, flags = target.flags!.data;
    const SP = source.pos.data, SI = source.idx.data, SF = source.flags!.data;
    // The target's seam vertices by their other two coordinates (few: one plane's crossings).
    const seam = new Map<string, number>();
    for (let v = 0; v < nv0[q]; v++) if (pos[3 * v + a] === dst) seam.set(`${pos[3 * v + b1]},${pos[3 * v + b2]}`, v);
    const remap = new Int32Array(nv0[sq]).fill(-1);
    let nv = nv0[q];
    let ni = 3 * nt0[q];
    let nf = nt0[q];
    for (let t = 0; t < nt0[sq]; t++) {
      if ((SF[t] & bit) !== 0) continue;
      for (let c = 0; c < 3; c++) {
        const v = SI[3 * t + c];
        let id = remap[v];
        if (id < 0) {
          if (SP[3 * v + a] === src) id = seam.get(`${SP[3 * v + b1]},${SP[3 * v + b2]}`) ?? -1;
          if (id < 0) {
            id = nv++;
            pos[3 * id + a] = -SP[3 * v + a];
            pos[3 * id + b1] = SP[3 * v + b1];
            pos[3 * id + b2] = SP[3 * v + b2];
          }
          remap[v] = id;
        }
        // corners (0, 2, 1): the reflection turned the winding, this turns it back
        idx[ni + (c === 0 ? 0 : 3 - c)] = id;
      }
      ni += 3;
      flags[nf++] = SF[t];
    }
    target.pos.length = 3 * nv;
    target.idx.length = ni;
    target.flags!.length = nf;
  });
}
