// The optimised GLB for screens, beside the archival one: decimated within a screen tolerance (checked against the
// analytic surface, not trusted), then quantised and compressed with EXT_meshopt_compression.
//
// * Decimation: meshoptimizer's simplifier (edge collapse with quadric error metrics, M. Garland & P. Heckbert,
//   "Surface simplification using quadric error metrics", SIGGRAPH 1997) with an absolute error target. It only
//   removes vertices, so the vertices left stay exactly on the surface; chords that now stray beyond the budget
//   (the quadric error measures distance to the removed planes, not to the curved surface) are split again by
//   refineMesh, then deviation (meshDeviation) and topology (meshStats) are checked; a result that fails, or is
//   not smaller, is retried with half the error (or the surface is kept undecimated).
// * Compression: @gltf-transform/functions meshopt() (reorder, KHR_mesh_quantization with 16-bit positions over
//   each mesh's bounds, EXT_meshopt_compression). Quantisation moves a vertex by at most √3/2 of a step, step =
//   largest bounding-box side / 65535, so that much of the tolerance is reserved for it.
// Why screens get their own tolerance: a viewer shows the figure at most a screen's height across, so a quarter
// of a pixel of a 2160-pixel display is invisible there, while the archival GLB keeps the print tolerance.

import { encodeGlb, type EncodeSurface, type GlbOptions } from './encoders';
import type { Mesh } from './mesh';
import type { Phase } from './orbital-surfaces';
import { levelFunction, meshDeviation, refineMesh, type AnalyticField, type RefineInfo } from './refine';
import { meshStats } from './stats';
import { printTolerance } from './tolerance';

const { atan2, max, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/** The display a screen GLB is made for: a quarter pixel at this many pixels across the narrower side. */
export const SCREEN_PIXELS = 2160;

/** Screen tolerance (a0): a quarter pixel of a SCREEN_PIXELS display showing the whole surface (orthographic). */
export function screenTolerance(surfaceHalfWidth: number): number {
  return printTolerance({ widthPx: SCREEN_PIXELS, heightPx: SCREEN_PIXELS, camera: { projection: 'orthographic' } }, surfaceHalfWidth);
}

export interface ScreenGlbOptions extends GlbOptions {
  /** The analytic field and |psi| level the surfaces lie on (checks the decimated chords). */
  field: AnalyticField;
  isovalue: number;
  /** Largest deviation (a0) allowed in the screen file. */
  tolerance: number;
}

export interface ScreenGlbInfo {
  tolerance: number;
  /** Bound on the movement from 16-bit quantisation (a0). */
  quantisation: number;
  /** Largest measured deviation of the decimated surfaces (vertices, chord midpoints, centroids) plus quantisation. */
  maxDeviation: number;
  trianglesBefore: number;
  trianglesAfter: number;
}

/** Keeps only the vertices the indices use (positions, normals, phase angles), renumbered in order of use. */
function compact(mesh: Mesh, indices: Uint32Array): Mesh {
  const V = mesh.positions.length / 3;
  const map = new Int32Array(V).fill(-1);
  let n = 0;
  for (let i = 0; i < indices.length; i++) if (map[indices[i]] < 0) map[indices[i]] = n++;
  const positions = new Float32Array(3 * n);
  const normals = new Float32Array(3 * n);
  const phaseAngle = mesh.phaseAngle ? new Float32Array(n) : undefined;
  for (let v = 0; v < V; v++) {
    const w = map[v];
    if (w < 0) continue;
    for (let k = 0; k < 3; k++) {
      positions[3 * w + k] = mesh.positions[3 * v + k];
      normals[3 * w + k] = mesh.normals[3 * v + k];
    }
    if (phaseAngle) phaseAngle[w] = mesh.phaseAngle![v];
  }
  const out = new Uint32Array(indices.length);
  for (let i = 0; i < indices.length; i++) out[i] = map[indices[i]];
  return phaseAngle ? { positions, normals, indices: out, phaseAngle } : { positions, normals, indices: out };
}

function quantisationBound(mesh: Mesh): number {
  const P = mesh.positions;
  let ext = 0;
  for (let k = 0; k < 3; k++) {
    let lo = Infinity, hi = -Infinity;
    for (let v = k; v < P.length; v += 3) {
      if (P[v] < lo) lo = P[v];
      if (P[v] > hi) hi = P[v];
    }
    if (hi > lo) ext = max(ext, hi - lo);
  }
  return (sqrt(3) / 2) * (ext / 65535);
}

/** The screen GLB (see the file comment); `info` gets what was achieved. */
export async function encodeScreenGlb(surfaces: readonly EncodeSurface[], opts: ScreenGlbOptions, info?: ScreenGlbInfo): Promise<Uint8Array> {
  if (!(opts.tolerance > 0) || !Number.isFinite(opts.tolerance)) throw new RangeError(`tolerance must be a positive length in a0 (got ${opts.tolerance})`);
  const { MeshoptSimplifier, MeshoptEncoder } = await import('meshoptimizer');
  // ESM imports together (their types must come from the same build of @gltf-transform/core).
  const { Logger, WebIO } = await import('@gltf-transform/core');
  const { meshopt } = await import('@gltf-transform/functions');
  const { EXTMeshoptCompression, KHRMeshQuantization } = await import('@gltf-transform/extensions');
  await MeshoptSimplifier.ready;
  await MeshoptEncoder.ready;
  const out: ScreenGlbInfo = { tolerance: opts.tolerance, quantisation: 0, maxDeviation: 0, trianglesBefore: 0, trianglesAfter: 0 };
  const simplified: EncodeSurface[] = [];
  for (const s of surfaces) {
    const m = s.mesh;
    out.trianglesBefore += m.indices.length / 3;
    if (m.indices.length === 0) {
      simplified.push(s);
      continue;
    }
    const F = levelFunction(opts.field, s.phase as Phase, opts.isovalue);
    const q = quantisationBound(m);
    out.quantisation = max(out.quantisation, q);
    const budget = opts.tolerance - q;
    const before = meshStats(m);
    let best: Mesh = m;
    let dev = meshDeviation(m, F).max;
    for (let err = budget, tries = 0; err > 0 && tries < 5; err /= 2, tries++) {
      const [idx] = MeshoptSimplifier.simplify(m.indices, m.positions, 3, 0, err, ['ErrorAbsolute', 'LockBorder']);
      // The quadric error bounds the distance to the old triangles' planes, not the chords' distance from the
      // curved surface: split again where a chord leaves the budget (new vertices projected onto the surface).
      const ri = {} as RefineInfo;
      const cand = refineMesh(compact(m, idx), F, s.phase as Phase, { tolerance: budget, maxTriangles: m.indices.length / 3 }, ri);
      if (ri.limited || cand.indices.length >= m.indices.length) continue;
      const st = meshStats(cand);
      const d = meshDeviation(cand, F).max;
      if (d <= budget && st.components === before.components && st.euler === before.euler && st.boundaryEdges === before.boundaryEdges) {
        best = cand;
        dev = d;
        break;
      }
    }
    out.maxDeviation = max(out.maxDeviation, dev + q);
    out.trianglesAfter += best.indices.length / 3;
    simplified.push({ phase: s.phase, mesh: best });
  }
  const extras = { ...(opts.extras ?? {}), screen: { ...out, pixels: SCREEN_PIXELS, compression: 'EXT_meshopt_compression, KHR_mesh_quantization (16-bit positions)' } };
  const plain = await encodeGlb(simplified, { ...opts, extras });
  const io = new WebIO().registerExtensions([EXTMeshoptCompression, KHRMeshQuantization]).registerDependencies({ 'meshopt.encoder': MeshoptEncoder });
  const doc = await io.readBinary(plain);
  doc.setLogger(new Logger(Logger.Verbosity.WARN));
  await doc.transform(meshopt({ encoder: MeshoptEncoder, level: 'medium', quantizePosition: 16, quantizationVolume: 'mesh' }));
  if (info) Object.assign(info, out);
  return io.writeBinary(doc);
}

/**
 * The screen GLB made from an archival GLB (encodeGlb's layout: one mesh per phase, extras.phase): for bundles
 * of figures whose archival mesh is already stored. arg psi of complex surfaces is taken from the field again.
 */
export async function screenGlbFromArchival(archival: Uint8Array, opts: Omit<ScreenGlbOptions, 'extras'>, info?: ScreenGlbInfo): Promise<Uint8Array> {
  const { WebIO } = await import('@gltf-transform/core');
  const doc = await new WebIO().readBinary(archival);
  const surfaces: EncodeSurface[] = [];
  const w = new Float64Array(8);
  for (const mesh of doc.getRoot().listMeshes()) {
    const phase = (mesh.getExtras() as { phase?: Phase }).phase;
    if (phase !== '+' && phase !== '-' && phase !== 'complex') continue; // the nodal outline is not a surface
    const prim = mesh.listPrimitives()[0];
    const positions = new Float32Array(prim.getAttribute('POSITION')!.getArray() as Float32Array);
    const normals = new Float32Array(prim.getAttribute('NORMAL')!.getArray() as Float32Array);
    const indices = new Uint32Array(prim.getIndices()!.getArray() as Uint32Array);
    const m: Mesh = { positions, normals, indices };
    if (phase === 'complex') {
      m.phaseAngle = new Float32Array(positions.length / 3);
      for (let v = 0; v < m.phaseAngle.length; v++) {
        opts.field.gradient(positions[3 * v], positions[3 * v + 1], positions[3 * v + 2], w);
        m.phaseAngle[v] = atan2(w[7], w[6]);
      }
    }
    surfaces.push({ phase, mesh: m });
  }
  const extras = ((doc.getRoot().getExtras() as { psiform?: Record<string, unknown> }).psiform ?? {}) as Record<string, unknown>;
  const rest = { ...extras };
  delete rest.model; // encodeGlb writes the model note itself
  return encodeScreenGlb(surfaces, { ...opts, extras: rest }, info);
}
