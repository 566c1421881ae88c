import { UnrecoverableError } from 'bullmq';
import { parseRecipe, type ExportStage, type Recipe } from '@psiform/contracts';
import { AssetStore, ObjectStorage, meshKey, type JobContext, type NewAsset, type TrackedRun } from '@psiform/server';
import { buildMesh, gridLabel } from '../mesh/mesh-assets';

/**
 * Helpers of render and export jobs (their lifecycle is the job runner's, libs/server jobs/job-runner.ts).
 * Progress (0..100) on entering each stage of a render or export job.
 */
export const EXPORT_PROGRESS: Record<ExportStage, number> = { queued: 0, meshing: 5, rendering: 30, encoding: 70, storing: 90, done: 100 };

/** What ensureMesh needs of a running render/export job: its row and the stage reporter (the runner's). */
export type TrackedJob = Pick<TrackedRun<'render' | 'export'>, 'id' | 'ctx' | 'stage' | 'madeMesh'>;

/** The job's figure version and its parsed recipe, or an UnrecoverableError. */
export function versionOf(ctx: JobContext): { version: NonNullable<JobContext['version']>; recipe: Recipe } {
  if (!ctx.version || !ctx.figure) throw new UnrecoverableError('the figure version of this job no longer exists');
  const parsed = parseRecipe(ctx.version.recipe);
  if (!parsed.ok) throw new UnrecoverableError(`the stored recipe is not valid: ${parsed.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
  return { version: ctx.version, recipe: parsed.recipe };
}

export interface VersionMesh {
  glb: Uint8Array;
  /** Loads the STL (read from storage, or the freshly built bytes). */
  stl: () => Promise<Uint8Array>;
  /** The mesh assets' stats (isovalue, enclosed, grid, surfaces, ...). */
  stats: Record<string, unknown>;
  /** Asset rows to insert with the job's completion when the mesh was built by this job (else empty). */
  newAssets: NewAsset[];
  /** Existing glb / stl rows (when the mesh was there). */
  existing: { glb?: NewAsset; stl?: NewAsset };
  meshMs: number;
}

/**
 * The version's mesh: its stored glb/stl when it has them (preferring this engine's keys), else computed here by the
 * mesh pipeline's own code (stage "meshing"), stored under the same content-derived keys, rows added on completion.
 */
export async function ensureMesh(
  deps: { assets: AssetStore; storage: ObjectStorage; engineVersion: string },
  t: TrackedJob,
  version: NonNullable<JobContext['version']>,
  recipe: Recipe,
): Promise<VersionMesh> {
  const rows = await deps.assets.findForVersion(version.id);
  const label = gridLabel(recipe);
  const pick = (kind: 'glb' | 'stl') =>
    rows.find((a) => a.kind === kind && a.storageKey === meshKey(version.recipeHash, deps.engineVersion, label, kind)) ?? [...rows].reverse().find((a) => a.kind === kind);
  const glbRow = pick('glb');
  const stlRow = pick('stl');
  const asNew = (a: NonNullable<typeof glbRow>): NewAsset => ({ figureVersionId: a.figureVersionId, publicationId: a.publicationId, kind: a.kind, storageKey: a.storageKey, bytes: a.bytes, sha256: a.sha256, stats: a.stats });
  if (glbRow && stlRow) {
    const glb = await deps.storage.get(glbRow.storageKey);
    return { glb, stl: () => deps.storage.get(stlRow.storageKey), stats: (glbRow.stats ?? {}) as Record<string, unknown>, newAssets: [], existing: { glb: asNew(glbRow), stl: asNew(stlRow) }, meshMs: 0 };
  }
  const t0 = performance.now();
  await t.stage('meshing');
  const built = await buildMesh(deps, { recipe, version, publicationId: t.ctx.job.publicationId }, async () => undefined);
  t.madeMesh(version.id);
  return { glb: built.files.glb, stl: async () => built.files.stl, stats: built.stats, newAssets: built.assets, existing: {}, meshMs: Math.round(performance.now() - t0) };
}
