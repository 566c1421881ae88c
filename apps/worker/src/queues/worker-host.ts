import { Inject, Injectable, Logger, type BeforeApplicationShutdown, type OnApplicationBootstrap } from '@nestjs/common';
import { Worker } from 'bullmq';
import type Redis from 'ioredis';
import { WORKER_CONFIG } from '../config/config.tokens';
import type { WorkerConfig } from '../config/config';
import { REDIS_CONNECTION } from '../infra/redis-connection';
import { JOB_PROCESSORS, type JobProcessor } from './job-processor';

/** Starts one BullMQ Worker per registered processor; closes them (finishing active jobs) on shutdown. */
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
      const worker = new Worker(p.queue, (job) => p.process(job), { connection: this.connection, concurrency: this.config.concurrency });
      worker.on('failed', (job, err) => this.log.warn(`job ${p.queue}/${job?.name ?? '?'}#${job?.id ?? '?'} failed: ${err.message}`));
      worker.on('error', (err) => this.log.error(`worker for ${p.queue}: ${err.message}`));
      this.workers.push(worker);
    }
    this.log.log(`processing ${this.processors.map((p) => p.queue).join(', ')} with concurrency ${this.config.concurrency}`);
  }

  /** Resolves once every worker is running (connected to Redis). */
  async waitUntilReady(): Promise<void> {
    await Promise.all(this.workers.map((w) => w.waitUntilReady()));
  }

  async beforeApplicationShutdown(): Promise<void> {
    await Promise.all(this.workers.splice(0).map((w) => w.close()));
  }
}
