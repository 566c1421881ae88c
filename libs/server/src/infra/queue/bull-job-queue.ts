import { Inject, Injectable, type OnApplicationShutdown } from '@nestjs/common';
import { Queue } from 'bullmq';
import Redis from 'ioredis';
import { APP_CONFIG } from '../../config/config.tokens';
import type { AppConfig } from '../../config/config';
import type { JobPayload } from '../../pipeline/mesh-job';
import { JobQueue, type EnqueueOptions } from './job-queue';
import { requestRedisOptions } from '../redis/request-redis';

@Injectable()
export class BullJobQueue extends JobQueue implements OnApplicationShutdown {
  private readonly queues = new Map<string, Queue>();
  private connection: Redis | undefined;

  constructor(@Inject(APP_CONFIG) private readonly config: AppConfig) {
    super();
  }

  private queue(name: string): Queue {
    let q = this.queues.get(name);
    if (!q) {
      // Fail an add quickly while Redis is down or stalled (the caller answers 503) instead of waiting for it.
      this.connection ??= new Redis(this.config.redis.url, requestRedisOptions());
      this.connection.on('error', () => undefined); // reported by /api/health
      q = new Queue(name, { connection: this.connection });
      q.on('error', () => undefined);
      this.queues.set(name, q);
    }
    return q;
  }

  async add(queue: string, name: string, jobId: string, data: JobPayload, opts: EnqueueOptions): Promise<string> {
    const job = await this.queue(queue).add(name, data, { jobId, ...opts });
    return job.id ?? jobId;
  }

  async onApplicationShutdown(): Promise<void> {
    await Promise.all([...this.queues.values()].map((q) => q.close().catch(() => undefined)));
    this.queues.clear();
    await this.connection?.quit().catch(() => this.connection?.disconnect());
  }
}
