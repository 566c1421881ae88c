// Surfaces made exact to a stated tolerance: vertices projected onto the analytic level set, normals from the
// analytic gradient, and edges split until every chord lies within the tolerance of the true surface.
//
// The level set of each phase is written F(p) = 0 with F > 0 inside:
//   '+'       F = psi - c            (real states)
//   '-'       F = -psi - c           (real states)
//   'complex' F = |psi| - c,  grad F = (Re psi grad Re psi + Im psi grad Im psi) / |psi|
// The distance of a point from the surface is estimated to first order by |F| / |grad F| (G. Taubin, "Estimation
// of planar curves, surfaces and nonplanar space curves defined by implicit equations", IEEE PAMI 13(11), 1991):
// the measure the bench and the tests use, and the one refinement drives below the tolerance.
//
// Projection: Newton's method along the gradient, p <- p - F grad F / |grad F|² (the first-order closest point,
// Hartmann, "On the curvature of curves and surfaces defined by normalforms", CAGD 16, 1999), safeguarded: a step
// never exceeds the distance the vertex may move (half a grid step, or half the split edge), a step that does
// not reduce |F| is halved (backtracking), and a vertex whose Newton iteration fails keeps its place.
// Refinement: conforming red-green splitting (R. E. Bank, A. H. Sherman, A. Weiser, "Refinement algorithms and
// data structures for regular local mesh refinement", Scientific Computing, 1983): an edge whose chord midpoint
// lies farther than the tolerance from the surface gets a new vertex (projected); a triangle with 1, 2 or 3
// split edges becomes 2, 3 or 4 triangles, so neighbours always agree and a watertight mesh stays watertight.

import { EdgeTable, GrowableUint32, type Mesh } from './mesh';
import type { Phase } from './orbital-surfaces';

const { abs, atan2, floor, hypot, max, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/** What projection needs from @psiform/orbitals' CompiledState: gradient with the value (out of length 8). */
export interface AnalyticField {
  readonly isReal: boolean;
  /** out[0..5] = grad Re psi, grad Im psi; out[6], out[7] = Re psi, Im psi. */
  gradient(x: number, y: number, z: number, out: Float64Array): void;
}

/** F (positive inside) and grad F at a point, for one phase's level set. */
export interface LevelFunction {
  /** Writes grad F into g[0..2] and returns F; also leaves Re psi, Im psi in psi[0..1]. */
  (x: number, y: number, z: number, g: Float64Array): number;
  psi: Float64Array;
}

export function levelFunction(field: AnalyticField, phase: Phase, c: number): LevelFunction {
  if (!(c > 0) || !Number.isFinite(c)) throw new RangeError(`the level must be a positive |psi| (got ${c})`);
  const w = new Float64Array(8);
  const psi = new Float64Array(2);
  const sign = phase === '-' ? -1 : 1;
  const fn = ((x: number, y: number, z: number, g: Float64Array): number => {
    field.gradient(x, y, z, w);
    psi[0] = w[6];
    psi[1] = w[7];
    if (phase !== 'complex') {
      g[0] = sign * w[0];
      g[1] = sign * w[1];
      g[2] = sign * w[2];
      return sign * w[6] - c;
    }
    const m = hypot(w[6], w[7]);
    if (m === 0) {
      g[0] = g[1] = g[2] = 0;
      return -c;
    }
    g[0] = (w[6] * w[0] + w[7] * w[3]) / m;
    g[1] = (w[6] * w[1] + w[7] * w[4]) / m;
    g[2] = (w[6] * w[2] + w[7] * w[5]) / m;
    return m - c;
  }) as LevelFunction;
  fn.psi = psi;
  return fn;
}

/** First-order distance |F| / |grad F| of a point from the level set (Infinity where grad F = 0 and F != 0). */
export function levelDistance(F: LevelFunction, x: number, y: number, z: number, g = new Float64Array(3)): number {
  const f = F(x, y, z, g);
  const gl = hypot(g[0], g[1], g[2]);
  return f === 0 ? 0 : gl > 0 ? abs(f) / gl : Infinity;
}

const NEWTON_STEPS = 12;

/**
 * Moves the point p (in place, float64) onto F = 0 by safeguarded Newton steps, never farther than maxMove from
 * where it started. Returns the final first-order distance (Infinity when it failed; p is then restored). On
 * return g holds grad F at p and psi[0..1] psi there (so callers need no further evaluation for the normal).
 */
export function projectPoint(F: LevelFunction, p: Float64Array, maxMove: number, g = new Float64Array(3), psi = new Float64Array(2)): number {
  const x0 = p[0], y0 = p[1], z0 = p[2];
  const gt = trialGrad;
  let f = F(p[0], p[1], p[2], g);
  psi[0] = F.psi[0];
  psi[1] = F.psi[1];
  const f0 = f;
  for (let it = 0; it < NEWTON_STEPS; it++) {
    const g2 = g[0] * g[0] + g[1] * g[1] + g[2] * g[2];
    if (!(g2 > 0) || !Number.isFinite(g2)) break;
    const d = abs(f) / sqrt(g2);
    // Converged well below float32 storage precision relative to the point's size.
    if (d <= 1e-9 * (1 + abs(p[0]) + abs(p[1]) + abs(p[2]))) return d;
    let sx = (-f * g[0]) / g2, sy = (-f * g[1]) / g2, sz = (-f * g[2]) / g2;
    // Near a critical point the Newton step is huge: shorten it to half the allowed move, then backtrack.
    const len = hypot(sx, sy, sz);
    if (len > 0.5 * maxMove) {
      const k = (0.5 * maxMove) / len;
      sx *= k;
      sy *= k;
      sz *= k;
    }
    let accepted = false;
    for (let half = 0; half < 6; half++) {
      const nx = p[0] + sx, ny = p[1] + sy, nz = p[2] + sz;
      if (hypot(nx - x0, ny - y0, nz - z0) <= maxMove) {
        const fn = F(nx, ny, nz, gt);
        if (abs(fn) < abs(f)) {
          p[0] = nx;
          p[1] = ny;
          p[2] = nz;
          g[0] = gt[0];
          g[1] = gt[1];
          g[2] = gt[2];
          psi[0] = F.psi[0];
          psi[1] = F.psi[1];
          f = fn;
          accepted = true;
          break;
        }
      }
      sx /= 2;
      sy /= 2;
      sz /= 2;
    }
    if (!accepted) break;
  }
  const gl = hypot(g[0], g[1], g[2]);
  const d = f === 0 ? 0 : gl > 0 ? abs(f) / gl : Infinity;
  if (!Number.isFinite(d) || !Number.isFinite(f)) {
    p[0] = x0;
    p[1] = y0;
    p[2] = z0;
    return abs(f0) === 0 ? 0 : Infinity;
  }
  return d;
}
const trialGrad = new Float64Array(3);

export interface ProjectInfo {
  /** Largest first-order distance left after projection, a0; vertices whose Newton iteration failed. */
  maxDistance: number;
  failed: number;
}

/**
 * Projects every vertex of `mesh` onto the phase's level set (in place) and writes outward unit normals -grad F
 * from the analytic gradient; complex surfaces also get arg psi per vertex. maxMove: how far a vertex may move
 * (a0), e.g. the grid step it was extracted on.
 */
export function projectMesh(mesh: Mesh, F: LevelFunction, maxMove: number, phase: Phase, info?: ProjectInfo): Mesh {
  const P = mesh.positions;
  const Nn = mesh.normals;
  const V = P.length / 3;
  const p = new Float64Array(3);
  const g = new Float64Array(3);
  const phaseAngle = phase === 'complex' ? (mesh.phaseAngle && mesh.phaseAngle.length === V ? mesh.phaseAngle : new Float32Array(V)) : undefined;
  const psi = new Float64Array(2);
  let maxD = 0;
  let failed = 0;
  for (let v = 0; v < V; v++) {
    p[0] = P[3 * v];
    p[1] = P[3 * v + 1];
    p[2] = P[3 * v + 2];
    const d = projectPoint(F, p, maxMove, g, psi);
    if (!Number.isFinite(d)) {
      failed++;
      F(p[0], p[1], p[2], g);
      psi[0] = F.psi[0];
      psi[1] = F.psi[1];
    } else if (d > maxD) maxD = d;
    P[3 * v] = p[0];
    P[3 * v + 1] = p[1];
    P[3 * v + 2] = p[2];
    normalInto(g, Nn, v);
    if (phaseAngle) phaseAngle[v] = atan2(psi[1], psi[0]);
  }
  if (phaseAngle) mesh.phaseAngle = phaseAngle;
  fillMissingNormals(mesh);
  if (info) {
    info.maxDistance = maxD;
    info.failed = failed;
  }
  return mesh;
}

/**
 * Where grad F vanishes or is undefined (|psi| = 0 on a singular line a coarse mesh spans), the vertex gets the
 * normalised sum of its triangles' normals (right-hand rule, outward for our meshes), else +z: glTF needs unit normals.
 */
export function fillMissingNormals(mesh: Mesh): void {
  const N = mesh.normals;
  const P = mesh.positions;
  const I = mesh.indices;
  const V = P.length / 3;
  const missing = new Uint8Array(V);
  let any = false;
  for (let v = 0; v < V; v++) {
    const l = hypot(N[3 * v], N[3 * v + 1], N[3 * v + 2]);
    if (!(l > 0.5) || !Number.isFinite(l)) {
      missing[v] = 1;
      N[3 * v] = N[3 * v + 1] = N[3 * v + 2] = 0;
      any = true;
    }
  }
  if (!any) return;
  for (let t = 0; t < I.length; t += 3) {
    const a = I[t], b = I[t + 1], c = I[t + 2];
    if (!missing[a] && !missing[b] && !missing[c]) continue;
    const ux = P[3 * b] - P[3 * a], uy = P[3 * b + 1] - P[3 * a + 1], uz = P[3 * b + 2] - P[3 * a + 2];
    const wx = P[3 * c] - P[3 * a], wy = P[3 * c + 1] - P[3 * a + 1], wz = P[3 * c + 2] - P[3 * a + 2];
    const nx = uy * wz - uz * wy, ny = uz * wx - ux * wz, nz = ux * wy - uy * wx;
    for (const v of [a, b, c]) {
      if (!missing[v]) continue;
      N[3 * v] += nx;
      N[3 * v + 1] += ny;
      N[3 * v + 2] += nz;
    }
  }
  for (let v = 0; v < V; v++) {
    if (!missing[v]) continue;
    const l = hypot(N[3 * v], N[3 * v + 1], N[3 * v + 2]);
    if (l > 0) for (let k = 0; k < 3; k++) N[3 * v + k] /= l;
    else N[3 * v + 2] = 1;
  }
}

/** Outward unit normal -grad F / |grad F| into Nn at vertex v (left as it was where grad F vanishes). */
function normalInto(g: Float64Array, Nn: Float32Array, v: number): void {
  const l = hypot(g[0], g[1], g[2]);
  if (l > 0 && Number.isFinite(l)) {
    Nn[3 * v] = -g[0] / l;
    Nn[3 * v + 1] = -g[1] / l;
    Nn[3 * v + 2] = -g[2] / l;
  }
}

export interface RefineOptions {
  /** Largest allowed distance (a0) of any vertex, edge midpoint or triangle centroid from the surface. */
  tolerance: number;
  /** Stop splitting at this many triangles (the result then says the tolerance was not reached). */
  maxTriangles?: number;
  /** Rounds of splitting at most (each round halves the split edges). */
  maxRounds?: number;
  /**
   * Edges shorter than this (a0) are not split further: where a chord this short still misses the surface, the
   * mesh spans a detail it does not resolve (a closed ring hole, a singular line), and splitting cannot converge.
   * Default 0 (off).
   */
  minEdge?: number;
}

export interface RefineInfo {
  tolerance: number;
  /** Largest first-order distance of the final mesh's vertices, edge midpoints and centroids (a0). */
  maxDeviation: number;
  rounds: number;
  trianglesBefore: number;
  trianglesAfter: number;
  /** True when the triangle, round or shortest-edge limit stopped refinement before the tolerance was met. */
  limited: boolean;
}

/**
 * Splits edges and triangles of an already projected mesh until every edge midpoint and triangle centroid lies
 * within `tolerance` of the level set (see the file comment). Returns a new mesh; normals analytic. Each round
 * checks only the triangles the previous round made (the others passed already), so the work follows the
 * final mesh's size.
 */
export function refineMesh(mesh: Mesh, F: LevelFunction, phase: Phase, opts: RefineOptions, info?: RefineInfo): Mesh {
  if (!(opts.tolerance > 0) || !Number.isFinite(opts.tolerance)) throw new RangeError(`tolerance must be a positive length in a0 (got ${opts.tolerance})`);
  // Refine to 1 % below the tolerance: the mesh is stored in float32, whose rounding (a relative 6e-8 of the
  // coordinates) may move a chord by a few parts in a thousand of a tight tolerance.
  const tol = 0.99 * opts.tolerance;
  const maxTriangles = opts.maxTriangles ?? 4_000_000;
  const maxRounds = opts.maxRounds ?? 12;
  const minEdge2 = (opts.minEdge ?? 0) ** 2;
  let stuck = false;
  let stuckWorst = 0;
  const V0 = mesh.positions.length / 3;
  if (V0 >= KEY) throw new RangeError(`refineMesh handles fewer than ${KEY} vertices`);
  const pos = new Grow64(mesh.positions.length * 2);
  for (let i = 0; i < mesh.positions.length; i++) pos.push(mesh.positions[i]);
  const nor = new Grow64(mesh.normals.length * 2);
  for (let i = 0; i < mesh.normals.length; i++) nor.push(mesh.normals[i]);
  const ang = phase === 'complex' ? new Grow64(V0 * 2) : null;
  if (ang) for (let v = 0; v < V0; v++) ang.push(mesh.phaseAngle?.[v] ?? 0);
  let tri = mesh.indices;
  let fresh = new Uint8Array(tri.length / 3).fill(1);
  const P = () => pos.data;
  const g = new Float64Array(3);
  const p = new Float64Array(3);
  const psi = new Float64Array(2);
  const trianglesBefore = tri.length / 3;
  let rounds = 0;
  let accepted = 0; // largest distance checked and kept
  let worstMarked: number;
  let limited = false;
  const dev = (x: number, y: number, z: number) => levelDistance(F, x, y, z, g);
  for (;;) {
    const T = tri.length / 3;
    const X = P();
    // Per edge key: CHECKED (within tolerance), MARKED (to split), then the new vertex's id.
    const edges = new EdgeTable();
    let marked = 0;
    worstMarked = 0;
    for (let t = 0; t < T; t++) {
      if (!fresh[t]) continue;
      const ia = tri[3 * t], ib = tri[3 * t + 1], ic = tri[3 * t + 2];
      for (let e = 0; e < 3; e++) {
        const a = e === 0 ? ia : e === 1 ? ib : ic;
        const b = e === 0 ? ib : e === 1 ? ic : ia;
        const key = a < b ? a * KEY + b : b * KEY + a;
        if (edges.get(key) !== NONE) continue;
        const d = dev(0.5 * (X[3 * a] + X[3 * b]), 0.5 * (X[3 * a + 1] + X[3 * b + 1]), 0.5 * (X[3 * a + 2] + X[3 * b + 2]));
        if (d > tol && (X[3 * a] - X[3 * b]) ** 2 + (X[3 * a + 1] - X[3 * b + 1]) ** 2 + (X[3 * a + 2] - X[3 * b + 2]) ** 2 < minEdge2) {
          stuck = true;
          edges.set(key, CHECKED);
          if (d > stuckWorst) stuckWorst = d;
        } else if (d > tol) {
          edges.set(key, MARKED);
          marked++;
          if (d > worstMarked) worstMarked = d;
        } else {
          edges.set(key, CHECKED);
          if (d > accepted) accepted = d;
        }
      }
      const d = dev((X[3 * ia] + X[3 * ib] + X[3 * ic]) / 3, (X[3 * ia + 1] + X[3 * ib + 1] + X[3 * ic + 1]) / 3, (X[3 * ia + 2] + X[3 * ib + 2] + X[3 * ic + 2]) / 3);
      if (d <= tol) {
        if (d > accepted) accepted = d;
        continue;
      }
      if (d > worstMarked) worstMarked = d;
      // A triangle whose centre bulges away from the surface: split its longest edge (unless one is split already).
      let bestKey = -1;
      let bestLen = -1;
      let any = false;
      for (let e = 0; e < 3; e++) {
        const a = e === 0 ? ia : e === 1 ? ib : ic;
        const b = e === 0 ? ib : e === 1 ? ic : ia;
        const key = a < b ? a * KEY + b : b * KEY + a;
        if (edges.get(key) === MARKED) any = true;
        const len = (X[3 * a] - X[3 * b]) ** 2 + (X[3 * a + 1] - X[3 * b + 1]) ** 2 + (X[3 * a + 2] - X[3 * b + 2]) ** 2;
        if (len > bestLen) {
          bestLen = len;
          bestKey = key;
        }
      }
      if (!any && bestLen >= minEdge2) {
        edges.set(bestKey, MARKED);
        marked++;
      } else if (!any) stuck = true;
    }
    if (marked === 0) {
      limited ||= stuck;
      break;
    }
    if (rounds >= maxRounds || T + 3 * marked > maxTriangles) {
      limited = true;
      break;
    }
    rounds++;
    // New vertices: chord midpoints projected onto the surface (moving at most half the edge).
    const markedKeys: number[] = [];
    edges.forEach((key, val) => {
      if (val === MARKED) markedKeys.push(key);
    });
    for (const key of markedKeys) {
      const a = floor(key / KEY);
      const b = key - a * KEY;
      const Y = P();
      p[0] = 0.5 * (Y[3 * a] + Y[3 * b]);
      p[1] = 0.5 * (Y[3 * a + 1] + Y[3 * b + 1]);
      p[2] = 0.5 * (Y[3 * a + 2] + Y[3 * b + 2]);
      const half = 0.5 * hypot(Y[3 * a] - Y[3 * b], Y[3 * a + 1] - Y[3 * b + 1], Y[3 * a + 2] - Y[3 * b + 2]);
      const d = projectPoint(F, p, half, g, psi);
      if (!Number.isFinite(d)) {
        F(p[0], p[1], p[2], g);
        psi[0] = F.psi[0];
        psi[1] = F.psi[1];
      }
      const id = pos.length / 3;
      pos.push(p[0]);
      pos.push(p[1]);
      pos.push(p[2]);
      const gl = hypot(g[0], g[1], g[2]) || 1;
      nor.push(-g[0] / gl);
      nor.push(-g[1] / gl);
      nor.push(-g[2] / gl);
      ang?.push(atan2(psi[1], psi[0]));
      edges.set(key, id);
    }
    const out = new GrowableUint32(tri.length * 2);
    const outFresh = new GrowableUint32(tri.length);
    const emit = (a: number, b: number, c: number, isNew: number) => {
      out.reserve(3);
      out.data[out.length++] = a;
      out.data[out.length++] = b;
      out.data[out.length++] = c;
      outFresh.reserve(1);
      outFresh.data[outFresh.length++] = isNew;
    };
    const X2 = P();
    const d2 = (a: number, b: number) => (X2[3 * a] - X2[3 * b]) ** 2 + (X2[3 * a + 1] - X2[3 * b + 1]) ** 2 + (X2[3 * a + 2] - X2[3 * b + 2]) ** 2;
    const v = [0, 0, 0];
    const m = [0, 0, 0];
    for (let t = 0; t < T; t++) {
      v[0] = tri[3 * t];
      v[1] = tri[3 * t + 1];
      v[2] = tri[3 * t + 2];
      let count = 0;
      for (let e = 0; e < 3; e++) {
        const a = v[e];
        const b = v[(e + 1) % 3];
        const id = edges.get(a < b ? a * KEY + b : b * KEY + a);
        m[e] = id >= 0 ? id : -1; // m[e] on edge v[e] v[e+1]
        if (id >= 0) count++;
      }
      if (count === 0) emit(v[0], v[1], v[2], 0);
      else if (count === 3) {
        emit(v[0], m[0], m[2], 1);
        emit(m[0], v[1], m[1], 1);
        emit(m[2], m[1], v[2], 1);
        emit(m[0], m[1], m[2], 1);
      } else if (count === 1) {
        const e = m[0] >= 0 ? 0 : m[1] >= 0 ? 1 : 2;
        const a = v[e], b = v[(e + 1) % 3], c = v[(e + 2) % 3], k = m[e];
        emit(a, k, c, 1);
        emit(k, b, c, 1);
      } else {
        // Two split edges: rotate so the unsplit one is (c, a); corner triangle at b, and the quad a, mab, mbc, c
        // cut along its shorter diagonal.
        const u = m[0] < 0 ? 0 : m[1] < 0 ? 1 : 2;
        const e = (u + 1) % 3;
        const a = v[e], b = v[(e + 1) % 3], c = v[(e + 2) % 3];
        const mab = m[e], mbc = m[(e + 1) % 3];
        emit(mab, b, mbc, 1);
        if (d2(a, mbc) <= d2(mab, c)) {
          emit(a, mab, mbc, 1);
          emit(a, mbc, c, 1);
        } else {
          emit(a, mab, c, 1);
          emit(mab, mbc, c, 1);
        }
      }
    }
    tri = out.toArray();
    fresh = Uint8Array.from(outFresh.data.subarray(0, outFresh.length));
  }
  const positions = Float32Array.from(pos.data.subarray(0, pos.length));
  const result: Mesh = { positions, normals: Float32Array.from(nor.data.subarray(0, nor.length)), indices: tri };
  if (ang) result.phaseAngle = Float32Array.from(ang.data.subarray(0, ang.length));
  fillMissingNormals(result);
  const maxDeviation = limited ? max(accepted, worstMarked, stuckWorst) : accepted;
  if (info) Object.assign(info, { tolerance: opts.tolerance, maxDeviation, rounds, trianglesBefore, trianglesAfter: tri.length / 3, limited } satisfies RefineInfo);
  return result;
}

/** Edge keys lo * KEY + hi stay exact doubles for fewer than 2^26 vertices. */
const KEY = 2 ** 26;
const NONE = -1;
const MARKED = -2;
const CHECKED = -3;

class Grow64 {
  data: Float64Array;
  length = 0;
  constructor(cap: number) {
    this.data = new Float64Array(max(16, cap));
  }
  push(x: number): void {
    if (this.length === this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = x;
  }
}



/**
 * Largest first-order distance |F| / |grad F| (a0) of the mesh's vertices, edge midpoints and triangle centroids
 * from the level set: the geometric error the bench reports and refinement drives below its tolerance.
 */
export function meshDeviation(mesh: Mesh, F: LevelFunction, perTriangle?: Float64Array): { vertices: number; midpoints: number; centroids: number; max: number } {
  const P = mesh.positions;
  const I = mesh.indices;
  const g = new Float64Array(3);
  let vert = 0;
  let midp = 0;
  let cent = 0;
  for (let v = 0; v < P.length; v += 3) vert = max(vert, levelDistance(F, P[v], P[v + 1], P[v + 2], g));
  for (let t = 0; t < I.length; t += 3) {
    const a = 3 * I[t], b = 3 * I[t + 1], c = 3 * I[t + 2];
    let worst = 0;
    for (const [u, w] of [[a, b], [b, c], [c, a]]) {
      // each interior edge is met twice; the maximum does not mind
      worst = max(worst, levelDistance(F, 0.5 * (P[u] + P[w]), 0.5 * (P[u + 1] + P[w + 1]), 0.5 * (P[u + 2] + P[w + 2]), g));
    }
    midp = max(midp, worst);
    const dc = levelDistance(F, (P[a] + P[b] + P[c]) / 3, (P[a + 1] + P[b + 1] + P[c + 1]) / 3, (P[a + 2] + P[b + 2] + P[c + 2]) / 3, g);
    cent = max(cent, dc);
    // Each triangle's own worst point (midpoints, centroid), for callers that estimate refinement's cost.
    if (perTriangle) perTriangle[t / 3] = max(worst, dc);
  }
  return { vertices: vert, midpoints: midp, centroids: cent, max: max(vert, midp, cent) };
}
