/** Lengths in Bohr radii (a0), the unit of every grid and mesh in this package. */
export type Bohr = number & { readonly __unit?: 'bohr' };

/**
 * Indexed triangle mesh on flat typed arrays (no per-vertex objects).
 * positions/normals: xyz per vertex; indices: three vertex ids per triangle, counter-clockwise
 * seen from outside (right-hand rule gives the outward normal).
 */
export interface Mesh {
  positions: Float32Array;
  normals: Float32Array;
  indices: Uint32Array;
  /** arg psi at each vertex in radians (complex states only). */
  phaseAngle?: Float32Array;
}

export function vertexCount(mesh: Mesh): number {
  return mesh.positions.length / 3;
}

export function triangleCount(mesh: Mesh): number {
  return mesh.indices.length / 3;
}

/** Growable Float32 buffer: doubles its capacity, so appends are amortised O(1). */
export class GrowableFloat32 {
  data: Float32Array;
  length = 0;
  constructor(capacity = 1024) {
    this.data = new Float32Array(Math.max(4, capacity));
  }
  reserve(extra: number): void {
    const need = this.length + extra;
    if (need <= this.data.length) return;
    let cap = this.data.length * 2;
    while (cap < need) cap *= 2;
    const next = new Float32Array(cap);
    next.set(this.data.subarray(0, this.length));
    this.data = next;
  }
  /** Exact-length copy (drops the spare capacity). */
  toArray(): Float32Array {
    return this.data.slice(0, this.length);
  }
}

/** Growable Uint32 buffer, as GrowableFloat32. */
export class GrowableUint32 {
  data: Uint32Array;
  length = 0;
  constructor(capacity = 1024) {
    this.data = new Uint32Array(Math.max(4, capacity));
  }
  reserve(extra: number): void {
    const need = this.length + extra;
    if (need <= this.data.length) return;
    let cap = this.data.length * 2;
    while (cap < need) cap *= 2;
    const next = new Uint32Array(cap);
    next.set(this.data.subarray(0, this.length));
    this.data = next;
  }
  toArray(): Uint32Array {
    return this.data.slice(0, this.length);
  }
}

/** Concatenate meshes into one (indices offset). phaseAngle kept only if every part has it. */
export function mergeMeshes(parts: readonly Mesh[]): Mesh {
  let nv = 0;
  let ni = 0;
  for (const m of parts) {
    nv += m.positions.length;
    ni += m.indices.length;
  }
  const positions = new Float32Array(nv);
  const normals = new Float32Array(nv);
  const indices = new Uint32Array(ni);
  const withPhase = parts.length > 0 && parts.every((m) => m.phaseAngle !== undefined);
  const phaseAngle = withPhase ? new Float32Array(nv / 3) : undefined;
  let vo = 0;
  let io = 0;
  for (const m of parts) {
    positions.set(m.positions, vo);
    normals.set(m.normals, vo);
    if (phaseAngle && m.phaseAngle) phaseAngle.set(m.phaseAngle, vo / 3);
    const base = vo / 3;
    for (let i = 0; i < m.indices.length; i++) indices[io + i] = m.indices[i] + base;
    vo += m.positions.length;
    io += m.indices.length;
  }
  return phaseAngle ? { positions, normals, indices, phaseAngle } : { positions, normals, indices };
}
