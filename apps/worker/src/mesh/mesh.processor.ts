import { Injectable, Logger } from '@nestjs/common';
import { UnrecoverableError } from 'bullmq';
import { parseRecipe, QUEUES } from '@psiform/contracts';
import { AssetStore, ENGINE_VERSION, JobsStore, MESH_PROGRESS, ObjectStorage, type JobPayload, type MeshStage } from '@psiform/server';
import type { JobProcessor, ProcessorJob } from '../queues/job-processor';
import { buildMesh } from './mesh-assets';

export interface MeshDone {
  jobId: string;
  figureId: string;
  figureVersionId: string;
  publicationId: string;
  assetIds: string[];
}

export interface MeshResult {
  jobId: string;
  assetIds: string[];
}

/**
 * Mesh jobs: sampling -> threshold -> extracting -> encoding -> storing -> done, each stage written to the Job
 * row (what the api streams). Outputs go to content-derived keys (recipe hash, engine version, grid), stored
 * idempotently, and the asset rows plus the completion are one transaction, so a retried or re-delivered job
 * (a killed worker) ends with the same single pair of glb/stl rows.
 */
@Injectable()
export class MeshJobProcessor implements JobProcessor<JobPayload, MeshResult> {
  readonly queue = QUEUES.mesh;
  private readonly log = new Logger('MeshJob');

  constructor(
    private readonly jobs: JobsStore,
    private readonly assets: AssetStore,
    private readonly storage: ObjectStorage,
    private readonly engineVersion: string = ENGINE_VERSION,
    /** Called after a successful completion (the worker schedules the figure's thumbnail here); errors are logged. */
    private readonly afterMesh?: (done: MeshDone) => Promise<void>,
  ) {}

  async process(job: ProcessorJob<JobPayload>): Promise<MeshResult> {
    const id = job.data?.jobId;
    if (typeof id !== 'string') throw new UnrecoverableError('mesh job without a jobId');
    const ctx = await this.jobs.loadContext(id);
    if (!ctx) throw new UnrecoverableError(`job ${id} no longer exists`);
    if (ctx.job.state === 'completed') return { jobId: id, assetIds: ctx.job.assetIds };
    const attempt = job.attemptsMade + 1;
    const attempts = job.opts?.attempts ?? 1;
    try {
      if (!ctx.version || !ctx.figure) throw new UnrecoverableError('the figure version of this job no longer exists');
      const parsed = parseRecipe(ctx.version.recipe);
      if (!parsed.ok) throw new UnrecoverableError(`the stored recipe is not valid: ${parsed.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
      const recipe = parsed.recipe;
      const version = ctx.version;
      const built = await buildMesh(
        { assets: this.assets, storage: this.storage, engineVersion: this.engineVersion },
        { recipe, version, publicationId: ctx.job.publicationId },
        (stage) => (stage === 'sampling' ? this.jobs.markActive(id, attempt, 'sampling', MESH_PROGRESS.sampling) : this.stage(id, stage)),
      );
      const { timings, assets: out } = built;
      const assetIds = await this.jobs.complete(id, timings, out);
      if (this.afterMesh) {
        // Thumbnails and the like: never fail (or delay the completion of) the mesh job.
        const figureId = ctx.figure.id;
        await this.afterMesh({ jobId: id, figureId, figureVersionId: version.id, publicationId: ctx.job.publicationId, assetIds }).catch((e: Error) =>
          this.log.warn(`after mesh job ${id}: ${e.message}`),
        );
      }
      return { jobId: id, assetIds };
    } catch (err) {
      const e = err as Error;
      const final = e instanceof UnrecoverableError || attempt >= attempts;
      if (final) await this.jobs.fail(id, readable(e));
      else await this.jobs.requeue(id, `attempt ${attempt} of ${attempts} failed: ${readable(e)}; retrying`);
      throw err;
    }
  }

  async onFailed(job: ProcessorJob<JobPayload>, error: Error, final: boolean): Promise<void> {
    // Covers failures the processor never saw (a job that stalled more often than allowed).
    if (final && typeof job.data?.jobId === 'string') await this.jobs.fail(job.data.jobId, readable(error));
  }

  private stage(id: string, stage: MeshStage): Promise<void> {
    return this.jobs.setStage(id, stage, MESH_PROGRESS[stage]);
  }
}

function readable(e: Error): string {
  const msg = e?.message || String(e);
  return msg.length > 2000 ? `${msg.slice(0, 2000)}…` : msg;
}
