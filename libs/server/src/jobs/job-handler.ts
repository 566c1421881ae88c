import { JOB_NAMES, type JobName, type JobOf, type TrackedJobName } from '@psiform/contracts';
import type { JobContext } from './jobs.repository';
import type { NewAsset } from '../assets/asset-store';

/** One run of a job that has a row in the jobs table (mesh, render, export). */
export interface TrackedRun<N extends TrackedJobName> {
  /** The Job row id. */
  readonly id: string;
  /** The payload, checked against the job contract. */
  readonly data: JobOf<N>;
  readonly params: JobOf<N>['params'];
  /** The row with its figure and version, loaded before the handler runs. */
  readonly ctx: JobContext;
  /** 1-based try number and how many tries the job has. */
  readonly attempt: number;
  readonly attempts: number;
  /** Writes a stage and its progress (the handler's `progress` table) to the row; the first call marks it active. */
  stage(stage: string): Promise<void>;
  /**
   * Tells the runner this run computed the mesh of a figure version (a mesh job, or a render/export/figure set that
   * meshed first): once the completion is stored, the runner calls the after-mesh hook (the figure's thumbnail).
   */
  madeMesh(figureVersionId: string): void;
}

/** A mesh stored by a completed job: what the after-mesh hook gets. */
export interface MeshDone {
  jobId: string;
  figureId: string;
  figureVersionId: string;
  publicationId: string;
  /** The mesh's asset rows (glb, stl). */
  assetIds: string[];
}

/** Called once per figure version whose mesh a job made (the worker schedules the figure's thumbnail). */
export type AfterMesh = (done: MeshDone) => Promise<void>;

/** What a tracked handler hands back: the runner stores the asset rows and completes the row in ONE transaction. */
export interface TrackedOutcome {
  timings: Record<string, number>;
  assets: NewAsset[];
}

interface HandlerBase<N extends JobName> {
  readonly name: N;
  /** false: this process does not take these jobs (e.g. notices without SMTP_URL); they wait for one that does. */
  readonly enabled?: boolean;
  /** Jobs of this name at once per process (default WORKER_CONCURRENCY). */
  readonly concurrency?: number;
  /** BullMQ lock of an active job, ms (default WORKER_LOCK_MS). */
  readonly lockMs?: number;
}

/**
 * A handler of a job with a row. The runner owns its lifecycle: payload check, idempotent completion (a completed row is
 * never redone), progress, retries (back to queued with the error while tries remain), failure recording.
 */
export interface TrackedJobHandler<N extends TrackedJobName = TrackedJobName> extends HandlerBase<N> {
  readonly kind: 'tracked';
  /** Progress (0..100) on entering each stage. */
  readonly progress: Readonly<Record<string, number>>;
  run(job: TrackedRun<N>): Promise<TrackedOutcome>;
  /** After the completion committed (pointers, follow-up jobs). Errors are logged and never fail the job. */
  afterComplete?(job: TrackedRun<N>, assetIds: string[]): Promise<void>;
}

/** A handler of a job without a row (notices, pings). Its outbox row (if any) records done/failed. */
export interface PlainJobHandler<N extends JobName = JobName> extends HandlerBase<N> {
  readonly kind: 'plain';
  run(data: JobOf<N>, info: { id: string; attempt: number; attempts: number }): Promise<unknown>;
}

export type JobHandler = { [N in TrackedJobName]: TrackedJobHandler<N> }[TrackedJobName] | { [N in JobName]: PlainJobHandler<N> }[JobName];

/** Injection token: every handler of a worker process, registered in its module (apps/worker worker.module.ts). */
export const JOB_HANDLERS = Symbol('JOB_HANDLERS');

/**
 * Start-up check (after immich's job repository): every job name of the contract has exactly one handler. A worker that
 * would silently drop a job kind, or run one twice, refuses to start.
 */
export function checkHandlers(handlers: readonly JobHandler[]): void {
  const problems: string[] = [];
  for (const name of JOB_NAMES) {
    const n = handlers.filter((h) => h.name === name).length;
    if (n === 0) problems.push(`job "${name}" has no handler`);
    if (n > 1) problems.push(`job "${name}" has ${n} handlers`);
  }
  for (const h of handlers) if (!(JOB_NAMES as readonly string[]).includes(h.name)) problems.push(`handler for "${h.name}", which is not a job of the contract`);
  if (problems.length) throw new Error(`job handlers: ${problems.join('; ')}`);
}
