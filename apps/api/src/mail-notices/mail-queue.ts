import { Inject, Injectable, type OnApplicationShutdown } from '@nestjs/common';
import { Queue } from 'bullmq';
import Redis from 'ioredis';
import { MAIL_NOTICE_JOB, QUEUES, type MailNoticeJob } from '@psiform/contracts';
import { APP_CONFIG, requestRedisOptions, type AppConfig } from '@psiform/server';

/**
 * Retries of a notice: 8 attempts, exponential backoff from 1 s (1, 2, 4 ... 64 s, about two minutes in
 * all), so an SMTP server that is down for a moment loses nothing.
 */
export const MAIL_JOB_OPTIONS = {
  attempts: 8,
  backoff: { type: 'exponential' as const, delay: 1000 },
  removeOnComplete: { age: 24 * 3600, count: 5000 },
  removeOnFail: { age: 7 * 24 * 3600, count: 5000 },
};

/** Port for queueing notices; the worker's mail processor sends them. */
export abstract class MailQueue {
  abstract add(job: MailNoticeJob): Promise<string>;
}

@Injectable()
export class BullMailQueue extends MailQueue implements OnApplicationShutdown {
  private queue: Queue | undefined;
  private connection: Redis | undefined;

  constructor(@Inject(APP_CONFIG) private readonly config: AppConfig) {
    super();
  }

  private get q(): Queue {
    if (!this.queue) {
      this.connection = new Redis(this.config.redis.url, requestRedisOptions());
      this.connection.on('error', () => undefined); // reported by /api/health
      this.queue = new Queue(QUEUES.mail, { connection: this.connection });
      this.queue.on('error', () => undefined);
    }
    return this.queue;
  }

  async add(job: MailNoticeJob): Promise<string> {
    const j = await this.q.add(MAIL_NOTICE_JOB, job, MAIL_JOB_OPTIONS);
    return j.id ?? '';
  }

  async onApplicationShutdown(): Promise<void> {
    await this.queue?.close().catch(() => undefined);
    await this.connection?.quit().catch(() => this.connection?.disconnect());
  }
}
