import type { Mesh } from './mesh';

const { floor, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export interface MeshStats {
  vertices: number;
  /** Vertices referenced by at least one triangle (used for the Euler characteristic). */
  usedVertices: number;
  triangles: number;
  /** Distinct undirected edges. */
  edges: number;
  area: number;
  /** Signed volume by the divergence theorem; positive when the mesh is outward-oriented. */
  volume: number;
  components: number;
  /** V - E + F over used vertices (2 per sphere-like closed component, 0 per torus). */
  euler: number;
  /** Every edge shared by exactly two triangles that traverse it in opposite directions. */
  watertight: boolean;
  boundaryEdges: number;
  nonManifoldEdges: number;
  misorientedEdges: number;
  /** Triangles with zero area (e.g. flat caps on the box corners). */
  degenerateTriangles: number;
  bbox: { min: [number, number, number]; max: [number, number, number] } | null;
}

/**
 * Statistics of an indexed triangle mesh. Edges are classified by sorting directed-edge keys
 * (no hash maps, no per-edge objects), components by union-find over shared vertices.
 */
export function meshStats(mesh: Mesh): MeshStats {
  const P = mesh.positions;
  const I = mesh.indices;
  const V = P.length / 3;
  const F = I.length / 3;
  if (!Number.isInteger(V) || !Number.isInteger(F)) throw new RangeError('mesh arrays must hold whole xyz triples / triangles');

  let area = 0;
  let vol = 0;
  let degenerate = 0;
  for (let f = 0; f < F; f++) {
    const a = I[3 * f] * 3;
    const b = I[3 * f + 1] * 3;
    const c = I[3 * f + 2] * 3;
    const ax = P[a], ay = P[a + 1], az = P[a + 2];
    const bx = P[b], by = P[b + 1], bz = P[b + 2];
    const cx = P[c], cy = P[c + 1], cz = P[c + 2];
    const ux = bx - ax, uy = by - ay, uz = bz - az;
    const vx = cx - ax, vy = cy - ay, vz = cz - az;
    const nx = uy * vz - uz * vy;
    const ny = uz * vx - ux * vz;
    const nz = ux * vy - uy * vx;
    const dbl = sqrt(nx * nx + ny * ny + nz * nz);
    if (dbl === 0) degenerate++;
    area += 0.5 * dbl;
    // Divergence theorem: V = sum over faces of a . (b x c) / 6.
    vol += (ax * (by * cz - bz * cy) + ay * (bz * cx - bx * cz) + az * (bx * cy - by * cx)) / 6;
  }

  // Directed edge key = (min * V + max) * 2 + (a > b). A closed, consistently oriented mesh has
  // every undirected edge exactly twice: once each way, i.e. keys 2m and 2m+1.
  const keys = new Float64Array(3 * F);
  for (let f = 0; f < F; f++) {
    for (let e = 0; e < 3; e++) {
      const a = I[3 * f + e];
      const b = I[3 * f + ((e + 1) % 3)];
      keys[3 * f + e] = a < b ? (a * V + b) * 2 : (b * V + a) * 2 + 1;
    }
  }
  keys.sort();
  let edges = 0;
  let boundary = 0;
  let nonManifold = 0;
  let misoriented = 0;
  for (let i = 0; i < keys.length; ) {
    const und = floor(keys[i] / 2);
    let j = i;
    let fwd = 0;
    let back = 0;
    while (j < keys.length && floor(keys[j] / 2) === und) {
      if (keys[j] % 2 === 0) fwd++;
      else back++;
      j++;
    }
    edges++;
    const count = j - i;
    if (count === 1) boundary++;
    else if (count > 2) nonManifold++;
    else if (fwd !== 1 || back !== 1) misoriented++;
    i = j;
  }

  // Union-find over vertices joined by triangles.
  const parent = new Int32Array(V);
  for (let v = 0; v < V; v++) parent[v] = -1; // -1: not referenced
  const find = (x: number): number => {
    let r = x;
    while (parent[r] !== r) r = parent[r];
    while (parent[x] !== r) {
      const n = parent[x];
      parent[x] = r;
      x = n;
    }
    return r;
  };
  for (let i = 0; i < I.length; i++) if (parent[I[i]] === -1) parent[I[i]] = I[i];
  for (let f = 0; f < F; f++) {
    const a = find(I[3 * f]);
    const b = find(I[3 * f + 1]);
    const c = find(I[3 * f + 2]);
    if (b !== a) parent[b] = a;
    if (c !== a && find(c) !== a) parent[find(c)] = a;
  }
  let used = 0;
  let components = 0;
  const min: [number, number, number] = [Infinity, Infinity, Infinity];
  const max: [number, number, number] = [-Infinity, -Infinity, -Infinity];
  for (let v = 0; v < V; v++) {
    if (parent[v] === -1) continue;
    used++;
    if (find(v) === v) components++;
    for (let d = 0; d < 3; d++) {
      const x = P[3 * v + d];
      if (x < min[d]) min[d] = x;
      if (x > max[d]) max[d] = x;
    }
  }

  return {
    vertices: V,
    usedVertices: used,
    triangles: F,
    edges,
    area,
    volume: vol,
    components,
    euler: used - edges + F,
    watertight: F > 0 && boundary === 0 && nonManifold === 0 && misoriented === 0,
    boundaryEdges: boundary,
    nonManifoldEdges: nonManifold,
    misorientedEdges: misoriented,
    degenerateTriangles: degenerate,
    bbox: used > 0 ? { min, max } : null,
  };
}
