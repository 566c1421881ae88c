import { Logger } from '@nestjs/common';
import { UnrecoverableError } from 'bullmq';
import { parseRecipe, type ExportStage, type Recipe } from '@psiform/contracts';
import { AssetStore, JobsStore, ObjectStorage, meshKey, type JobContext, type JobPayload, type NewAsset } from '@psiform/server';
import type { ProcessorJob } from '../queues/job-processor';
import { buildMesh, gridLabel } from '../mesh/mesh-assets';
import type { MeshDone } from '../mesh/mesh.processor';

/** Progress (0..100) on entering each stage of a render or export job. */
export const EXPORT_PROGRESS: Record<ExportStage, number> = { queued: 0, meshing: 5, rendering: 30, encoding: 70, storing: 90, done: 100 };

export interface TrackedJob {
  id: string;
  ctx: JobContext;
  params: Record<string, unknown>;
  /** Writes the stage (and its progress) to the Job row. */
  stage(s: Exclude<ExportStage, 'queued' | 'done'>): Promise<void>;
  /** Figure versions whose mesh this job computed (ensureMesh), for the after-mesh hook once the rows are stored. */
  meshed?: string[];
}

export interface TrackedResult {
  jobId: string;
  assetIds: string[];
}

/**
 * The life of a render/export Job row, as the mesh processor keeps it: active on the first stage, back to queued
 * with the error while attempts remain, failed on the last attempt or an UnrecoverableError, completed with the
 * asset rows in one transaction (JobsStore.complete). A completed row is never redone.
 */
export async function runTracked(
  jobs: JobsStore,
  job: ProcessorJob<JobPayload>,
  work: (t: TrackedJob) => Promise<{ timings: Record<string, number>; assets: NewAsset[] }>,
  afterMesh?: AfterMesh,
): Promise<TrackedResult & { assets: NewAsset[] }> {
  const id = job.data?.jobId;
  if (typeof id !== 'string') throw new UnrecoverableError('job without a jobId');
  const ctx = await jobs.loadContext(id);
  if (!ctx) throw new UnrecoverableError(`job ${id} no longer exists`);
  if (ctx.job.state === 'completed') return { jobId: id, assetIds: ctx.job.assetIds, assets: [] };
  const attempt = job.attemptsMade + 1;
  const attempts = job.opts?.attempts ?? 1;
  let active = false;
  const stage = async (s: Exclude<ExportStage, 'queued' | 'done'>) => {
    if (!active) {
      active = true;
      await jobs.markActive(id, attempt, s, EXPORT_PROGRESS[s]);
    } else await jobs.setStage(id, s, EXPORT_PROGRESS[s]);
  };
  try {
    const tracked: TrackedJob = { id, ctx, params: (ctx.job.params ?? {}) as Record<string, unknown>, stage, meshed: [] };
    const { timings, assets } = await work(tracked);
    const assetIds = await jobs.complete(id, timings, assets);
    if (afterMesh) await afterNewMeshes(afterMesh, id, ctx, tracked.meshed ?? [], assets, assetIds);
    return { jobId: id, assetIds, assets };
  } catch (err) {
    const e = err as Error;
    const final = e instanceof UnrecoverableError || attempt >= attempts;
    if (final) await jobs.fail(id, readable(e));
    else await jobs.requeue(id, `attempt ${attempt} of ${attempts} failed: ${readable(e)}; retrying`);
    throw err;
  }
}

/** What a mesh job calls once its mesh is stored (the worker schedules the figure's thumbnail there). */
export type AfterMesh = (done: MeshDone) => Promise<void>;

/**
 * The after-mesh hook for every figure version whose mesh this job made (ensureMesh's new GLB rows), as a mesh job
 * calls it: every figure with a mesh gets its thumbnail, whichever job made the mesh (a render, an export, a figure
 * set's panels). Thumbnail renders are skipped (they never start another); errors are logged, never fail the job.
 */
export async function afterNewMeshes(afterMesh: AfterMesh, jobId: string, ctx: JobContext, meshed: string[], assets: NewAsset[], assetIds: string[]): Promise<void> {
  const params = (ctx.job.params ?? {}) as { thumbnail?: boolean; panels?: { figureId?: string; figureVersionId?: string }[] };
  if (params.thumbnail) return;
  const figureOf = (versionId: string): string | undefined =>
    ctx.version?.id === versionId ? ctx.figure?.id : params.panels?.find((p) => p.figureVersionId === versionId)?.figureId;
  for (const versionId of new Set(meshed)) {
    const figureId = figureOf(versionId);
    if (!figureId) continue;
    const ids = assets.map((x, k) => (x.figureVersionId === versionId && (x.kind === 'glb' || x.kind === 'stl') ? assetIds[k] : null)).filter((x): x is string => x !== null);
    await afterMesh({ jobId, figureId, figureVersionId: versionId, publicationId: ctx.job.publicationId, assetIds: ids }).catch((e: Error) =>
      new Logger('AfterMesh').warn(`after the mesh made by job ${jobId}: ${e.message}`),
    );
  }
}

export function readable(e: Error): string {
  const msg = e?.message || String(e);
  return msg.length > 2000 ? `${msg.slice(0, 2000)}…` : msg;
}

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
  t.meshed?.push(version.id);
  return { glb: built.files.glb, stl: async () => built.files.stl, stats: built.stats, newAssets: built.assets, existing: {}, meshMs: Math.round(performance.now() - t0) };
}
