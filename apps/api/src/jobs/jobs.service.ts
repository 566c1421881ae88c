import { Injectable, NotFoundException } from '@nestjs/common';
import type { JobDto, SurfaceWarningDto, UserDto } from '@psiform/contracts';
import { JobsStore, type NewJob, type JobEntity, AssetStore, toAssetDto } from '@psiform/server';
import { MembershipService } from '../publications/membership.service';

const FINAL: ReadonlySet<string> = new Set(['completed', 'failed']);

export interface WatchOptions {
  pollMs?: number;
  signal?: AbortSignal;
}

/**
 * Job requests of the api's features, and reading jobs back. A request is a Job row plus its outbox row in one
 * transaction (JobsStore.request, the one enqueue path): no request waits for Redis, and none is lost when Redis is
 * down (the relay sends it when it is back). Every request is its own job, so asking again after completion works;
 * repeated work is cheap because outputs live under content-derived keys.
 */
@Injectable()
export class JobsService {
  constructor(
    private readonly store: JobsStore,
    private readonly assets: AssetStore,
    private readonly membership: MembershipService,
  ) {}

  enqueue(job: NewJob): Promise<JobEntity> {
    return this.store.request(job);
  }

  /** The job for a member of its publication; 404 for everyone else (and for unknown ids). */
  async requireJob(user: Pick<UserDto, 'id' | 'role'>, id: string): Promise<JobEntity> {
    const job = await this.store.findById(id);
    if (!job || !(await this.membership.canAccess(user, job.publicationId))) throw new NotFoundException(`job ${id} not found`);
    return job;
  }

  async get(user: Pick<UserDto, 'id' | 'role'>, id: string): Promise<JobDto> {
    return this.toDto(await this.requireJob(user, id));
  }

  /**
   * Snapshots of the job on every change (state, stage, progress, error), in order, ending with the final
   * state. Reads the row the worker updates, every pollMs; stages the worker passes through faster than
   * that are skipped, never reordered.
   */
  async *watch(id: string, opts: WatchOptions = {}): AsyncGenerator<JobDto> {
    const pollMs = opts.pollMs ?? 250;
    let last = '';
    while (!opts.signal?.aborted) {
      const job = await this.store.findById(id);
      if (!job) return;
      const key = `${job.state}|${job.stage}|${job.progress}|${job.error ?? ''}|${job.attempts}`;
      if (key !== last) {
        last = key;
        yield await this.toDto(job);
      }
      if (FINAL.has(job.state)) return;
      await sleep(pollMs, opts.signal);
    }
  }

  async toDto(job: JobEntity): Promise<JobDto> {
    const assets = await this.assets.findByIds(job.assetIds ?? []);
    // The result says what the figure cannot show (box cuts the surface, grid too coarse) without reading the assets.
    const warnings = new Map<string, SurfaceWarningDto>();
    for (const a of assets) for (const w of (a.stats as { warnings?: SurfaceWarningDto[] } | null)?.warnings ?? []) warnings.set(`${w.code}\n${w.message}`, w);
    return {
      id: job.id,
      type: job.type,
      state: job.state,
      progress: job.progress,
      stage: job.stage,
      error: job.error,
      figureId: job.figureId,
      assets: assets.map(toAssetDto),
      warnings: [...warnings.values()],
      timings: job.timings,
      createdAt: job.createdAt.toISOString(),
      updatedAt: job.updatedAt.toISOString(),
    };
  }
}

function sleep(ms: number, signal?: AbortSignal): Promise<void> {
  return new Promise((resolve) => {
    const t = setTimeout(done, ms);
    function done() {
      clearTimeout(t);
      signal?.removeEventListener('abort', done);
      resolve();
    }
    signal?.addEventListener('abort', done, { once: true });
  });
}
