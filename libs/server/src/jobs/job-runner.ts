import { Logger } from '@nestjs/common';
import { UnrecoverableError, Worker, type Job } from 'bullmq';
import type Redis from 'ioredis';
import { JOB_QUEUE, parseJob, type JobOf, type TrackedJobName } from '@psiform/contracts';
import { JobsStore } from './jobs.repository';
import { OutboxStore } from '../outbox/outbox.repository';
import { cappedBackoffMs } from './job-options';
import { checkHandlers, type AfterMesh, type JobHandler, type PlainJobHandler, type TrackedJobHandler, type TrackedRun } from './job-handler';
import type { JobContext } from './jobs.repository';
import type { NewAsset } from '../assets/asset-store';

export interface JobRunnerSettings {
  /** Jobs at once per queue and process unless the handler says otherwise (WORKER_CONCURRENCY). */
  concurrency: number;
  /** BullMQ lock of an active job; also the stalled-job check interval (WORKER_LOCK_MS). */
  lockMs: number;
  /** After a job stored a mesh it made (any job kind): the figure's thumbnail. Absent: nothing follows. */
  afterMesh?: AfterMesh;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** A job's error as the row and the API show it (bounded). */
export function readable(e: unknown): string {
  const msg = (e as Error)?.message || String(e);
  return msg.length > 2000 ? `${msg.slice(0, 2000)}…` : msg;
}

/**
 * The one job runner: one BullMQ Worker per queue, dispatching by job name to the handler registered for it, and owning
 * every job's lifecycle so no processor writes it again:
 * - the payload is parsed with the job contract's schema (a malformed one fails at once, naming the field);
 * - idempotent completion: a tracked job whose row is completed, or a job whose outbox row is done, is not redone
 *   (a re-delivered notice is not sent twice);
 * - progress: `stage()` marks the row active on the first stage and writes each stage's progress;
 * - retries: while tries remain the row goes back to queued with "attempt k of n failed: …; retrying";
 * - failure recording: on the last try, an UnrecoverableError, or a job BullMQ gave up on after stalling, the row
 *   (and its outbox row) is failed with the message.
 * Several worker processes may share one Redis: BullMQ hands each job to one of them, and the stalled-job check (every
 * lockMs) re-queues the jobs of a process that died.
 */
export class JobRunner {
  private readonly log = new Logger('JobRunner');
  private readonly workers: Worker[] = [];
  private readonly byName = new Map<string, JobHandler>();
  private readonly lifecycle: JobLifecycle;

  constructor(
    private readonly connection: Redis,
    private readonly handlers: readonly JobHandler[],
    jobs: JobsStore,
    outbox: OutboxStore,
    private readonly settings: JobRunnerSettings,
  ) {
    checkHandlers(handlers);
    for (const h of handlers) this.byName.set(h.name, h);
    this.lifecycle = new JobLifecycle(jobs, outbox, settings.afterMesh);
  }

  /** Starts a Worker for every queue that has an enabled handler. */
  start(): void {
    const queues = new Map<string, JobHandler[]>();
    for (const h of this.handlers) {
      if (h.enabled === false) continue;
      const q = JOB_QUEUE[h.name];
      queues.set(q, [...(queues.get(q) ?? []), h]);
    }
    for (const [queue, hs] of queues) {
      const lockDuration = Math.max(...hs.map((h) => h.lockMs ?? this.settings.lockMs));
      const worker = new Worker(queue, (job) => this.lifecycle.process(queue, this.byName.get(job.name), job), {
        connection: this.connection,
        concurrency: Math.min(...hs.map((h) => h.concurrency ?? this.settings.concurrency)),
        lockDuration,
        stalledInterval: lockDuration,
        maxStalledCount: 2,
        settings: { backoffStrategy: (attemptsMade: number, type?: string, _err?: Error, job?: { opts?: { backoff?: unknown } }) => this.backoff(attemptsMade, type, job) },
      });
      worker.on('failed', (job: Job | undefined, err: Error) => {
        this.log.warn(`job ${queue}/${job?.name ?? '?'}#${job?.id ?? '?'} failed: ${err.message}`);
        if (job) void this.reportFailure(job, err);
      });
      worker.on('error', (err) => this.log.error(`worker for ${queue}: ${err.message}`));
      this.workers.push(worker);
    }
    this.log.log(`processing ${[...queues.keys()].join(', ')} with concurrency ${this.settings.concurrency}`);
  }

  /** Nest lifecycle (the worker module provides the runner): start after every module is ready. */
  onApplicationBootstrap(): void {
    this.start();
  }

  /** Nest lifecycle: before the Redis connection and the data source close. */
  beforeApplicationShutdown(): Promise<void> {
    return this.close();
  }

  /** Resolves once every worker is connected to Redis. */
  async waitUntilReady(): Promise<void> {
    await Promise.all(this.workers.map((w) => w.waitUntilReady()));
  }

  /** Finishes active jobs and stops taking new ones. */
  async close(): Promise<void> {
    await Promise.all(this.workers.splice(0).map((w) => w.close()));
  }

  private async reportFailure(job: Job, err: Error): Promise<void> {
    try {
      await this.lifecycle.recordFailure(this.byName.get(job.name), job, err, (await job.getState()) === 'failed');
    } catch (e) {
      this.log.error(`recording the failure of ${job.name}#${job.id}: ${(e as Error).message}`);
    }
  }

  private backoff(attemptsMade: number, type: string | undefined, job: { opts?: { backoff?: unknown } } | undefined): number {
    const delay = (job?.opts?.backoff as { delay?: number } | undefined)?.delay ?? 1000;
    if (type === 'capped') return cappedBackoffMs(attemptsMade, delay);
    throw new Error(`unknown backoff type ${type}`);
  }
}

/** What the lifecycle reads of a BullMQ job. */
export type RunnerJob = Pick<Job, 'id' | 'name' | 'data' | 'attemptsMade' | 'opts'>;

/**
 * The lifecycle every job goes through (see JobRunner); a class of its own so handlers are unit-tested through exactly
 * the code the runner uses, with fake stores and no Redis.
 */
export class JobLifecycle {
  private readonly log = new Logger('JobLifecycle');

  constructor(
    private readonly jobs: JobsStore,
    private readonly outbox: OutboxStore,
    private readonly afterMesh?: AfterMesh,
  ) {}

  /** One job as BullMQ hands it over, to the handler registered for its name (undefined: none). */
  async process(queue: string, h: JobHandler | undefined, job: RunnerJob): Promise<unknown> {
    if (!h || JOB_QUEUE[h.name] !== queue) throw new UnrecoverableError(`unknown job name "${job.name}" on queue ${queue}`);
    const attempt = job.attemptsMade + 1;
    const attempts = job.opts?.attempts ?? 1;
    const parsed = parseJob(h.name, job.data);
    if (!parsed.ok) {
      const rowId = (job.data as { jobId?: unknown } | undefined)?.jobId;
      if (h.kind === 'tracked' && typeof rowId === 'string' && UUID.test(rowId)) await this.jobs.fail(rowId, parsed.message);
      throw new UnrecoverableError(parsed.message);
    }
    const outboxRow = job.id && UUID.test(job.id) ? await this.outbox.findById(job.id) : null;
    if (outboxRow?.state === 'done') return { alreadyDone: true };
    const result = h.kind === 'tracked' ? await this.runTracked(h as TrackedJobHandler, parsed.data as JobOf<TrackedJobName>, attempt, attempts) : await (h as PlainJobHandler).run(parsed.data as never, { id: job.id ?? '', attempt, attempts });
    if (outboxRow) await this.outbox.markDone(outboxRow.id);
    return result;
  }

  private async runTracked(h: TrackedJobHandler, data: JobOf<TrackedJobName>, attempt: number, attempts: number): Promise<{ jobId: string; assetIds: string[] }> {
    const id = data.jobId;
    const ctx = await this.jobs.loadContext(id);
    if (!ctx) throw new UnrecoverableError(`job ${id} no longer exists`);
    if (ctx.job.state === 'completed') return { jobId: id, assetIds: ctx.job.assetIds };
    let active = false;
    const stage = async (s: string) => {
      const progress = h.progress[s] ?? 0;
      if (!active) {
        active = true;
        await this.jobs.markActive(id, attempt, s, progress);
      } else await this.jobs.setStage(id, s, progress);
    };
    const meshed: string[] = [];
    const run = { id, data, params: data.params, ctx, attempt, attempts, stage, madeMesh: (v: string) => void meshed.push(v) } as TrackedRun<TrackedJobName>;
    let assetIds: string[];
    let assets: NewAsset[];
    try {
      const outcome = await h.run(run as never);
      assets = outcome.assets;
      assetIds = await this.jobs.complete(id, outcome.timings, assets);
    } catch (err) {
      const final = err instanceof UnrecoverableError || attempt >= attempts;
      if (final) await this.jobs.fail(id, readable(err));
      else await this.jobs.requeue(id, `attempt ${attempt} of ${attempts} failed: ${readable(err)}; retrying`);
      throw err;
    }
    if (h.afterComplete) await h.afterComplete(run as never, assetIds).catch((e: Error) => this.log.warn(`after ${h.name} job ${id}: ${e.message}`));
    if (this.afterMesh) await afterNewMeshes(this.afterMesh, id, ctx, meshed, assets, assetIds);
    return { jobId: id, assetIds };
  }

  /**
   * Whenever BullMQ reports a job failed, also when no handler saw the error (a job that stalled more often than
   * allowed); `final` is true when no retry follows: then the row and the outbox row are failed with the message.
   */
  async recordFailure(h: JobHandler | undefined, job: RunnerJob, err: Error, final: boolean): Promise<void> {
    if (!final) return;
    const rowId = (job.data as { jobId?: unknown } | undefined)?.jobId;
    if (h?.kind === 'tracked' && typeof rowId === 'string' && UUID.test(rowId)) await this.jobs.fail(rowId, readable(err));
    if (job.id && UUID.test(job.id)) await this.outbox.markFailed(job.id, readable(err));
  }
}

/**
 * The after-mesh hook for every figure version whose mesh a job made (TrackedRun.madeMesh), once its rows are stored:
 * every figure with a mesh gets its thumbnail, whichever job made the mesh (a mesh job, a render, an export, a figure
 * set's panels). Thumbnail renders are skipped (they never start another); errors are logged, never fail the job.
 */
export async function afterNewMeshes(afterMesh: AfterMesh, jobId: string, ctx: JobContext, meshed: readonly string[], assets: readonly NewAsset[], assetIds: readonly string[]): Promise<void> {
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
