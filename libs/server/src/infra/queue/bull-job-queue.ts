import { Inject, Injectable, type OnApplicationShutdown } from '@nestjs/common';
import { Queue } from 'bullmq';
import type Redis from 'ioredis';
import { APP_CONFIG } from '../../config/config.tokens';
import type { AppConfig } from '../../config/config';
import type { JobOptions } from '../../jobs/job-options';
import { closeRedis, openRedis } from '../redis/redis-connection';
import { JobQueue } from './job-queue';

/** BullMQ producer side; the worker builds one directly from its own config (`new BullJobQueue({ redis })`). */
@Injectable()
export class BullJobQueue extends JobQueue implements OnApplicationShutdown {
  private readonly queues = new Map<string, Queue>();
  private connection: Redis | undefined;

  constructor(@Inject(APP_CONFIG) private readonly config: Pick<AppConfig, 'redis'>) {
    super();
  }

  private queue(name: string): Queue {
    let q = this.queues.get(name);
    if (!q) {
      // 'requests' (request-redis.ts): an add fails quickly while Redis is down or stalled; the outbox row simply
      // stays pending until it is back.
      this.connection ??= openRedis(this.config.redis.url, 'requests', 'Queue');
      q = new Queue(name, { connection: this.connection });
      q.on('error', () => undefined);
      this.queues.set(name, q);
    }
    return q;
  }

  async add(queue: string, name: string, jobId: string, data: Record<string, unknown>, opts: JobOptions): Promise<string> {
    const job = await this.queue(queue).add(name, data, { jobId, ...opts });
    return job.id ?? jobId;
  }

  async state(queue: string, jobId: string): Promise<string | null> {
    const s = await this.queue(queue).getJobState(jobId);
    return s === 'unknown' ? null : s;
  }

  async onApplicationShutdown(): Promise<void> {
    await Promise.all([...this.queues.values()].map((q) => q.close().catch(() => undefined)));
    this.queues.clear();
    await closeRedis(this.connection);
    this.connection = undefined;
  }
}
