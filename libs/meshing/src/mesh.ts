const { imul, max } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

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

/** A growable typed array: doubles its capacity, so appends are amortised O(1); `data` is read into locals by kernels. */
class Growable<T extends Float32Array | Uint32Array | Uint8Array> {
  data: T;
  length = 0;
  constructor(
    private readonly make: (n: number) => T,
    capacity: number,
  ) {
    this.data = make(max(4, capacity));
  }
  reserve(extra: number): void {
    const need = this.length + extra;
    if (need <= this.data.length) return;
    let cap = this.data.length * 2;
    while (cap < need) cap *= 2;
    const next = this.make(cap);
    next.set(this.data.subarray(0, this.length) as never);
    this.data = next;
  }
  /** Exact-length copy (drops the spare capacity). */
  toArray(): T {
    return this.data.slice(0, this.length) as T;
  }
}

export class GrowableFloat32 extends Growable<Float32Array> {
  constructor(capacity = 1024) {
    super((n) => new Float32Array(n), capacity);
  }
}

export class GrowableUint32 extends Growable<Uint32Array> {
  constructor(capacity = 1024) {
    super((n) => new Uint32Array(n), capacity);
  }
}

export class GrowableUint8 extends Growable<Uint8Array> {
  constructor(capacity = 1024) {
    super((n) => new Uint8Array(n), capacity);
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

/**
 * Edge key (a non-negative integer below 2^52, e.g. lattice point × 3 + axis, or vertex a × 2^26 + vertex b) -> int32:
 * open addressing with linear probing on typed arrays (Knuth, TAOCP vol. 3,
 * sec. 6.4, algorithm L), several times faster than a Map (whose large-number keys are heap
 * objects) for the millions of lookups of a fine grid or a refinement round.
 */
export class EdgeTable {
  private keys: Float64Array;
  private vals: Int32Array;
  size = 0;
  private mask: number;
  /** capacity: expected number of keys (the table starts at twice that, a power of two). */
  constructor(capacity = 8192) {
    let cap = 1 << 14;
    while (cap < 2 * capacity && cap < 1 << 28) cap *= 2;
    this.keys = new Float64Array(cap).fill(-1);
    this.vals = new Int32Array(cap);
    this.mask = cap - 1;
  }
  private slot(key: number): number {
    // Fibonacci hashing of the key's low and high 26 bits.
    const lo = key % 67108864;
    const hi = (key - lo) / 67108864;
    let i = (imul(lo ^ imul(hi, 0x27d4eb2d), 0x9e3779b1) >>> 0) & this.mask;
    while (this.keys[i] !== -1 && this.keys[i] !== key) i = (i + 1) & this.mask;
    return i;
  }
  /** The value stored for key, or -1 when there is none (so -1 is never stored as a value). */
  get(key: number): number {
    const i = this.slot(key);
    return this.keys[i] === key ? this.vals[i] : -1;
  }
  set(key: number, val: number): void {
    if (2 * (this.size + 1) > this.keys.length) this.grow();
    const i = this.slot(key);
    if (this.keys[i] !== key) {
      this.keys[i] = key;
      this.size++;
    }
    this.vals[i] = val;
  }
  /** Calls fn for every stored key and value (in table order). */
  forEach(fn: (key: number, val: number) => void): void {
    for (let i = 0; i < this.keys.length; i++) if (this.keys[i] !== -1) fn(this.keys[i], this.vals[i]);
  }
  private grow(): void {
    const ok = this.keys;
    const ov = this.vals;
    this.keys = new Float64Array(ok.length * 2).fill(-1);
    this.vals = new Int32Array(ok.length * 2);
    this.mask = this.keys.length - 1;
    this.size = 0;
    for (let i = 0; i < ok.length; i++) if (ok[i] !== -1) this.set(ok[i], ov[i]);
  }
}
