import type { Recipe, RecipeSource } from '@psiform/contracts';
import {
  autoExtent,
  checkGridFits,
  compileState,
  enclosedFractionAt,
  enclosedThreshold,
  type CompiledState,
  type OrbitalState,
} from '@psiform/orbitals';
import { sampleGridParallel, type SamplingBuffers } from '@psiform/orbitals/node';
import {
  encodeGlb,
  encodeStl,
  extractIsosurface,
  extractNodalSurface,
  extractOrbitalSurfaces,
  levelBetweenSamples,
  meshStats,
  parseNrrdHeader,
  type Mesh,
  type MeshStats,
  type Phase,
  type Rgb,
} from '@psiform/meshing';

/**
 * The mesh job's computation in separate stages (sample -> threshold -> extract -> encode) so the worker can
 * report each one. For computed recipes the stages follow @psiform/meshing's buildOrbitalMesh step for step
 * (mesh-pipeline.spec.ts checks that both give the same isovalue and meshes); uploaded cubes are meshed with
 * extractIsosurface directly, as they have no analytic state.
 */
export type Field =
  | { kind: 'orbital'; compiled: CompiledState; re: Float32Array; im: Float32Array | null; grid: { n: number; extent: number } }
  | { kind: 'cube'; data: Float32Array; source: Extract<RecipeSource, { kind: 'upload' }> };

export interface Threshold {
  /** |psi| level of the surfaces. */
  isovalue: number;
  /** Probability inside the surfaces on the sampled grid. */
  enclosed: number;
  /** Complex orbital states: |psi|² buffer reused by the extraction. */
  absBuffer?: Float32Array;
}

export interface Surface {
  phase: Phase;
  mesh: Mesh;
}

export function stateOf(recipe: Recipe): OrbitalState {
  return { Z: recipe.content.Z, terms: recipe.content.terms.map((t) => ({ n: t.n, l: t.l, m: t.m, basis: t.basis, re: t.re, im: t.im })) };
}

/** Grid label used in storage keys: "96" for computed cubes, "40x40x48" for uploads. */
export function gridLabel(recipe: Recipe): string {
  return recipe.source?.kind === 'upload' ? recipe.source.sizes.join('x') : String(recipe.grid.n);
}

/**
 * Samples psi for a computed recipe on worker threads (@psiform/orbitals/node); `into` reuses output buffers across
 * jobs (the field's arrays are views into them, so they must stay with this job until it is done).
 */
export async function sampleComputed(recipe: Recipe, opts: { threads?: number; into?: SamplingBuffers } = {}): Promise<Field> {
  const state = stateOf(recipe);
  const compiled = compileState(state);
  const n = recipe.grid.n;
  checkGridFits(n, !compiled.isReal);
  const extent = recipe.grid.extent === 'auto' ? Number(autoExtent(state)) : recipe.grid.extent;
  const { re, im } = await sampleGridParallel(state, { n, extent: extent as never }, opts);
  return { kind: 'orbital', compiled, re, im: compiled.isReal ? null : im, grid: { n, extent } };
}

/** Reads an uploaded cube (a stored NRRD file) back into a float32 field. */
export function cubeFromNrrd(bytes: Uint8Array, source: Extract<RecipeSource, { kind: 'upload' }>): Field {
  const h = parseNrrdHeader(bytes);
  if (h.sizes.join('x') !== source.sizes.join('x')) throw new Error(`stored cube is ${h.sizes.join('x')}, the recipe says ${source.sizes.join('x')}`);
  const count = h.dataBytes / 4;
  const data = new Float32Array(count);
  const dv = new DataView(bytes.buffer, bytes.byteOffset + h.dataOffset, h.dataBytes);
  for (let i = 0; i < count; i++) data[i] = dv.getFloat32(4 * i, true);
  return { kind: 'cube', data, source };
}

function squareInPlaceKeepingSign(re: Float32Array): Uint8Array {
  const sign = new Uint8Array((re.length + 7) >> 3);
  for (let i = 0; i < re.length; i++) {
    const v = re[i];
    if (v < 0) sign[i >> 3] |= 1 << (i & 7);
    re[i] = v * v;
  }
  return sign;
}

function restoreFromSquares(re: Float32Array, sign: Uint8Array): void {
  for (let i = 0; i < re.length; i++) {
    const a = Math.sqrt(re[i]);
    re[i] = sign[i >> 3] & (1 << (i & 7)) ? -a : a;
  }
}

/** Enclosed-probability rule on a density: the sample threshold t, the fraction inside, and the meshed level. */
function enclosedOnDensity(density: Float32Array, fraction: number): { level: number; enclosed: number } {
  const t = enclosedThreshold(density, fraction);
  return { level: levelBetweenSamples(density, t), enclosed: enclosedFractionAt(density, t) };
}

/** The surface rule: isovalue (|psi| level) and the enclosed probability on this grid. */
export function threshold(field: Field, surface: Recipe['surface']): Threshold {
  if (field.kind === 'orbital' && !field.compiled.isReal) {
    const { re, im } = field;
    const abs = new Float32Array(re.length);
    for (let i = 0; i < re.length; i++) abs[i] = re[i] * re[i] + im![i] * im![i];
    if (surface.rule === 'enclosed') {
      const r = enclosedOnDensity(abs, surface.fraction);
      return { isovalue: Math.sqrt(r.level), enclosed: r.enclosed, absBuffer: abs };
    }
    return { isovalue: surface.value, enclosed: enclosedFractionAt(abs, surface.value * surface.value), absBuffer: abs };
  }
  if (field.kind === 'cube' && field.source.quantity === 'density') {
    const d = field.data;
    if (surface.rule === 'enclosed') {
      const r = enclosedOnDensity(d, surface.fraction);
      return { isovalue: Math.sqrt(r.level), enclosed: r.enclosed };
    }
    return { isovalue: surface.value, enclosed: enclosedFractionAt(d, surface.value * surface.value) };
  }
  // Real psi (orbital or uploaded): threshold psi² in place, signs kept in a bit mask, then restored
  // (exact for float32: sqrt(x²) = |x|; same approach as buildOrbitalMesh).
  const re = field.kind === 'orbital' ? field.re : field.data;
  if (surface.rule === 'enclosed') {
    const sign = squareInPlaceKeepingSign(re);
    try {
      const r = enclosedOnDensity(re, surface.fraction);
      return { isovalue: Math.sqrt(r.level), enclosed: r.enclosed };
    } finally {
      restoreFromSquares(re, sign);
    }
  }
  const c2 = surface.value * surface.value;
  let tot = 0;
  let inside = 0;
  for (let i = 0; i < re.length; i++) {
    const d = re[i] * re[i];
    tot += d;
    if (d > c2) inside += d;
  }
  return { isovalue: surface.value, enclosed: tot > 0 ? inside / tot : 0 };
}

/** Scales an index-space mesh (spacing 1, origin 0) to the cube's spacing and origin; normals follow 1/d. */
function toWorld(mesh: Mesh, spacing: readonly number[], origin: readonly number[]): Mesh {
  const P = mesh.positions;
  const N = mesh.normals;
  for (let v = 0; v < P.length / 3; v++) {
    let l = 0;
    for (let k = 0; k < 3; k++) {
      P[3 * v + k] = origin[k] + spacing[k] * P[3 * v + k];
      N[3 * v + k] /= spacing[k];
      l += N[3 * v + k] * N[3 * v + k];
    }
    l = Math.sqrt(l) || 1;
    for (let k = 0; k < 3; k++) N[3 * v + k] /= l;
  }
  return mesh;
}

export function extract(field: Field, t: Threshold): Surface[] {
  if (field.kind === 'orbital') {
    return extractOrbitalSurfaces(field.compiled, { re: field.re, im: field.im }, field.grid, t.isovalue, { absBuffer: t.absBuffer });
  }
  const { sizes, spacing, origin, quantity } = field.source;
  const dims = { nx: sizes[0], ny: sizes[1], nz: sizes[2] };
  const unit = { origin: [0, 0, 0] as [number, number, number], spacing: 1 };
  if (quantity === 'density') {
    const level = t.isovalue * t.isovalue;
    return [{ phase: '+', mesh: toWorld(extractIsosurface(field.data, dims, unit, level, { inside: 'above' }), spacing, origin) }];
  }
  return [
    { phase: '+', mesh: toWorld(extractIsosurface(field.data, dims, unit, t.isovalue, { inside: 'above' }), spacing, origin) },
    { phase: '-', mesh: toWorld(extractIsosurface(field.data, dims, unit, -t.isovalue, { inside: 'below' }), spacing, origin) },
  ];
}

/** Nodal surfaces (psi = 0) where they cut the figure, for stage.material.nodalOutline: computed real states only. */
export function nodalSurface(field: Field, t: Threshold, recipe: Recipe): Mesh | null {
  if (!recipe.stage?.material?.nodalOutline || field.kind !== 'orbital' || !field.compiled.isReal) return null;
  return extractNodalSurface(field.re, field.grid, t.isovalue);
}

export function surfaceStats(surfaces: Surface[]): Array<{ phase: Phase } & MeshStats> {
  return surfaces.map((s) => ({ phase: s.phase, ...meshStats(s.mesh) }));
}

function hexToRgb(hex: string): Rgb {
  const v = parseInt(hex.slice(1), 16);
  return [((v >> 16) & 255) / 255, ((v >> 8) & 255) / 255, (v & 255) / 255];
}

/** Our own colour wheel for arg psi: hue follows the angle at fixed saturation and value (HSV to sRGB). */
export function phaseWheel(angle: number): Rgb {
  const h = ((angle + Math.PI) / (2 * Math.PI)) * 6;
  const s = 0.65;
  const v = 0.85;
  const c = v * s;
  const x = c * (1 - Math.abs((h % 2) - 1));
  const m = v - c;
  const [r, g, b] = h < 1 ? [c, x, 0] : h < 2 ? [x, c, 0] : h < 3 ? [0, c, x] : h < 4 ? [0, x, c] : h < 5 ? [x, 0, c] : [c, 0, x];
  return [r + m, g + m, b + m];
}

export async function encode(
  surfaces: Surface[],
  recipe: Recipe,
  extras: Record<string, unknown>,
  engineVersion: string,
  nodal: Mesh | null = null,
): Promise<{ glb: Uint8Array; stl: Uint8Array }> {
  const colors = { '+': hexToRgb(recipe.palette.positive), '-': hexToRgb(recipe.palette.negative) };
  // The nodal mesh goes into the GLB only (an outline for the scene); the STL is the printable lobes.
  const glb = await encodeGlb(surfaces, { version: engineVersion, extras, colors, colorWheel: phaseWheel, nodal });
  const stl = encodeStl(surfaces);
  return { glb, stl };
}
