import { UnrecoverableError } from 'bullmq';
import type { Recipe } from '@psiform/contracts';
import { AssetStore, CONTENT_TYPES, ObjectStorage, meshKey, type MeshStage, type NewAsset } from '@psiform/server';
import { encodeGlb, encodeStl, parseNrrdHeader, printTolerance, recipeToSurfaces, summariseSurfaces, type Mesh, type PhaseSurface, type SurfaceStage } from '@psiform/meshing';
import { SamplingBufferPool, sampleGridParallel, type SamplingBuffers } from '@psiform/orbitals/node';

export interface MeshBuildInput {
  recipe: Recipe;
  version: { id: string; recipeHash: string };
  publicationId: string;
}

export interface MeshBuild {
  /** glb then stl, stored; rows to insert with the job's completion. */
  assets: NewAsset[];
  files: { glb: Uint8Array; stl: Uint8Array };
  surfaces: PhaseSurface[];
  /** The stats written on both assets: @psiform/meshing summariseSurfaces plus provenance. */
  stats: Record<string, unknown>;
  timings: Record<string, number>;
}

const ms = (x: number) => Math.round(x * 10) / 10;

/**
 * Sampling buffers reused by every mesh build of this process (issue "Stays up and stays scoped": a worker's RSS grew
 * by about 200 MB per 384³ job because each job's fresh SharedArrayBuffer stayed reachable from the idle sampling
 * threads). A set is made only when every existing one is in use; 64 is only a ceiling.
 */
const samplingBuffers = new SamplingBufferPool(64);

/** Grid label used in storage keys: "96" or "auto" for computed cubes, "40x40x48" for uploads. */
export function gridLabel(recipe: Recipe): string {
  return recipe.source?.kind === 'upload' ? recipe.source.sizes.join('x') : String(recipe.grid.n);
}

/** The pipeline's stages that are job stages (refining and statistics are reported inside 'extracting'). */
const JOB_STAGE: Partial<Record<SurfaceStage, Exclude<MeshStage, 'queued' | 'done'>>> = { sampling: 'sampling', threshold: 'threshold', extracting: 'extracting' };

/**
 * The mesh of a figure version: @psiform/meshing's recipeToSurfaces (the one recipe → surfaces function), then
 * encoding (GLB with the recipe's colours, STL) and storing under content-derived keys; the caller inserts the rows.
 * `stage` is awaited on entering each job stage.
 */
export async function buildMesh(
  deps: { assets: AssetStore; storage: ObjectStorage; engineVersion: string },
  input: MeshBuildInput,
  stage: (s: Exclude<MeshStage, 'queued' | 'done'>) => Promise<void>,
): Promise<MeshBuild> {
  if (input.recipe.source?.kind === 'upload') return buildMeshWith(deps, input, stage, null);
  // One set of buffers per cube of the plan (the outer box and any finer inner cubes, told apart by half-width):
  // the pipeline keeps every cube's field until the surfaces are merged, so two cubes must never share a set.
  // A refinement of a cube re-samples into that cube's set (its old field is no longer read). All are held until
  // the files are encoded, and given back whatever happens.
  const held = new Map<number, SamplingBuffers>();
  try {
    return await buildMeshWith(deps, input, stage, async (extent) => {
      let b = held.get(extent);
      if (!b) held.set(extent, (b = await samplingBuffers.acquire()));
      return b;
    });
  } finally {
    for (const b of held.values()) samplingBuffers.release(b);
  }
}

async function buildMeshWith(
  deps: { assets: AssetStore; storage: ObjectStorage; engineVersion: string },
  input: MeshBuildInput,
  stage: (s: Exclude<MeshStage, 'queued' | 'done'>) => Promise<void>,
  buffersFor: ((extent: number) => Promise<SamplingBuffers>) | null,
): Promise<MeshBuild> {
  const { recipe, version, publicationId } = input;
  const total = performance.now();
  const cube = recipe.source?.kind === 'upload' ? await uploadedCube(deps, recipe) : undefined;
  let result;
  try {
    // The 3D-file tolerance: the stored GLB/STL are the archival meshes every print render starts from (a finer
    // print re-meshes, see printGlb). The pooled dense sampler gives the same meshes as coarse-to-fine sampling
    // (one extractor, libs/meshing sparse.ts).
    result = await recipeToSurfaces(recipe, {
      cube,
      tolerance: 'file',
      sample: async (state, grid) => sampleGridParallel(state, { n: grid.n, extent: grid.extent as never }, { into: buffersFor ? await buffersFor(Number(grid.extent)) : undefined }),
      onStage: async (s) => {
        const js = JOB_STAGE[s];
        if (js) await stage(js);
      },
    });
  } catch (err) {
    // A recipe the engine refuses (no surface at that |psi|, a state whose coefficients cancel) will not get better on retry.
    if (err instanceof RangeError) throw new UnrecoverableError(err.message);
    throw err;
  }
  const summary = summariseSurfaces(result);
  const provenance = {
    engineVersion: deps.engineVersion,
    recipeHash: version.recipeHash,
    source: recipe.source?.kind === 'upload' ? { kind: 'upload', quantity: recipe.source.quantity, sha256: recipe.source.sha256 } : { kind: 'computed' },
  };
  const t = result.timings_ms;
  const timings: Record<string, number> = {
    sample: ms(t.plan + t.sampling),
    threshold: ms(t.threshold),
    extract: ms(t.extracting + t.refining),
    stats: ms(t.statistics),
  };

  await stage('encoding');
  let t0 = performance.now();
  const surfaces = result.surfaces.filter((s) => s.mesh.indices.length > 0).map((s) => ({ phase: s.phase, mesh: s.mesh }));
  const extras = { ...summary, ...provenance, label: recipe.label ?? null };
  const files = await encode(surfaces, recipe, extras, deps.engineVersion, result.nodal ?? null);
  timings.encode = ms(performance.now() - t0);

  await stage('storing');
  t0 = performance.now();
  const label = gridLabel(recipe);
  const out: NewAsset[] = [];
  const statsJson = { ...summary, ...provenance, timings_ms: { ...timings } };
  for (const kind of ['glb', 'stl'] as const) {
    const stored = await deps.assets.storeObject(meshKey(version.recipeHash, deps.engineVersion, label, kind), files[kind], CONTENT_TYPES[kind]);
    out.push({ figureVersionId: version.id, publicationId, kind, storageKey: stored.key, bytes: stored.bytes, sha256: stored.sha256, stats: statsJson });
  }
  timings.store = ms(performance.now() - t0);
  timings.total = ms(performance.now() - total);
  return { assets: out, files, surfaces, stats: statsJson, timings };
}

/** GLB (colours from the recipe's palette and phase mode, the summary in the root extras) and STL. */
export async function encode(surfaces: PhaseSurface[], recipe: Recipe, extras: Record<string, unknown>, engineVersion: string, nodal: Mesh | null = null): Promise<{ glb: Uint8Array; stl: Uint8Array }> {
  const colouring = { palette: recipe.palette, mode: recipe.phase?.mode };
  // The nodal mesh goes into the GLB only (an outline for the scene); the STL is the printable lobes.
  const glb = await encodeGlb(surfaces, { version: engineVersion, extras, colouring, nodal });
  const stl = encodeStl(surfaces);
  return { glb, stl };
}

/** Reads an uploaded cube (a stored NRRD file) back into float32 values. */
async function uploadedCube(deps: { assets: AssetStore; storage: ObjectStorage }, recipe: Recipe): Promise<Float32Array> {
  const src = recipe.source;
  if (src?.kind !== 'upload') throw new Error('not an upload recipe');
  const asset = await deps.assets.findById(src.assetId);
  if (!asset) throw new UnrecoverableError(`uploaded cube ${src.assetId} no longer exists`);
  if (asset.sha256 !== src.sha256) throw new UnrecoverableError('uploaded cube does not match the recipe (sha256)');
  const bytes = await deps.storage.get(asset.storageKey);
  const h = parseNrrdHeader(bytes);
  if (h.sizes.join('x') !== src.sizes.join('x')) throw new UnrecoverableError(`stored cube is ${h.sizes.join('x')}, the recipe says ${src.sizes.join('x')}`);
  const count = h.dataBytes / 4;
  const data = new Float32Array(count);
  const dv = new DataView(bytes.buffer, bytes.byteOffset + h.dataOffset, h.dataBytes);
  for (let i = 0; i < count; i++) data[i] = dv.getFloat32(4 * i, true);
  return data;
}

/**
 * A print needs its own mesh when the stored one is coarser than a quarter of its pixel (tolerance.ts
 * printTolerance, from the image size and the recipe's camera): then the surfaces are made again to that
 * tolerance by the one pipeline and encoded for this render only. Returns null when the stored GLB is fine enough
 * (or the figure is an uploaded cube, which has no analytic surface to refine onto).
 */
export async function printGlb(recipe: Recipe, stored: Record<string, unknown>, image: { widthPx: number; heightPx: number }, engineVersion: string): Promise<{ glb: Uint8Array; tolerance: number } | null> {
  if (recipe.source?.kind === 'upload') return null;
  const ref = stored.refinement as { tolerance?: number; surfaceHalfWidth?: number } | null | undefined;
  const output = { ...image, camera: recipe.stage.camera };
  if (ref?.surfaceHalfWidth && ref.tolerance !== undefined && ref.tolerance <= printTolerance(output, ref.surfaceHalfWidth)) return null;
  const result = await recipeToSurfaces(recipe, { output });
  const summary = summariseSurfaces(result);
  const surfaces = result.surfaces.filter((s) => s.mesh.indices.length > 0).map((s) => ({ phase: s.phase, mesh: s.mesh }));
  const colouring = { palette: recipe.palette, mode: recipe.phase?.mode };
  const glb = await encodeGlb(surfaces, { version: engineVersion, extras: { ...summary, label: recipe.label ?? null }, colouring, nodal: result.nodal ?? null });
  return { glb, tolerance: result.refinement?.tolerance ?? NaN };
}
