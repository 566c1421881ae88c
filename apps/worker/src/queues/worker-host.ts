import { Inject, Injectable, Logger, type BeforeApplicationShutdown, type OnApplicationBootstrap } from '@nestjs/common';
import { Worker, type Job } from 'bullmq';
import type Redis from 'ioredis';
import { WORKER_CONFIG } from '../config/config.tokens';
import type { WorkerConfig } from '../config/config';
import { REDIS_CONNECTION } from '../infra/redis-connection';
import { JOB_PROCESSORS, type JobProcessor } from './job-processor';

/**
 * Starts one BullMQ Worker per registered processor; closes them (finishing active jobs) on shutdown.
 * Several worker processes may share one Redis: BullMQ hands each job to one of them, and the stalled-job
 * check (every lockMs) re-queues the jobs of a process that died, whose locks were no longer renewed.
 */
@Injectable()
export class WorkerHost implements OnApplicationBootstrap, BeforeApplicationShutdown {
  private readonly log = new Logger('WorkerHost');
  private readonly workers: Worker[] = [];

  constructor(
    @Inject(WORKER_CONFIG) private readonly config: WorkerConfig,
    @Inject(REDIS_CONNECTION) private readonly connection: Redis,
    @Inject(JOB_PROCESSORS) private readonly processors: JobProcessor[],
  ) {}

  onApplicationBootstrap(): void {
    for (const p of this.processors) {
      const lockDuration = p.lockMs ?? this.config.lockMs;
      const worker = new Worker(p.queue, (job) => p.process(job), {
        connection: this.connection,
        concurrency: p.concurrency ?? this.config.concurrency,
        lockDuration,
        stalledInterval: lockDuration,
        maxStalledCount: 2,
      });
      worker.on('failed', (job: Job | undefined, err: Error) => {
        this.log.warn(`job ${p.queue}/${job?.name ?? '?'}#${job?.id ?? '?'} failed: ${err.message}`);
        if (job && p.onFailed) void this.reportFailure(p, job, err);
      });
      worker.on('error', (err) => this.log.error(`worker for ${p.queue}: ${err.message}`));
      this.workers.push(worker);
    }
    this.log.log(`processing ${this.processors.map((p) => p.queue).join(', ')} with concurrency ${this.config.concurrency}`);
  }

  private async reportFailure(p: JobProcessor, job: Job, err: Error): Promise<void> {
    try {
      const final = (await job.getState()) === 'failed';
      await p.onFailed!(job, err, final);
    } catch (e) {
      this.log.error(`reporting the failure of ${p.queue}#${job.id}: ${(e as Error).message}`);
    }
  }

  /** Resolves once every worker is running (connected to Redis). */
  async waitUntilReady(): Promise<void> {
    await Promise.all(this.workers.map((w) => w.waitUntilReady()));
  }

  async beforeApplicationShutdown(): Promise<void> {
    await Promise.all(this.workers.splice(0).map((w) => w.close()));
  }
}
