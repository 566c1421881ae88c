import { Logger } from '@nestjs/common';
import { JOB_QUEUE } from '@psiform/contracts';
import { JobQueue } from '../infra/queue/job-queue';
import { JOB_OPTIONS } from '../jobs/job-options';
import { OutboxStore } from './outbox.repository';
import type { OutboxEntity } from './outbox.entity';

export interface OutboxRelaySettings {
  /** How often pending rows are looked for (ms). */
  pollMs: number;
  /** Rows per transaction. */
  batch: number;
  /** An add that takes longer (a paused Redis) counts as failed; the row stays pending. */
  sendTimeoutMs: number;
}

export const DEFAULT_RELAY_SETTINGS: OutboxRelaySettings = { pollMs: 200, batch: 50, sendTimeoutMs: 3000 };

/** Wait before the next try of a row whose relay failed: 0.5 s, 1 s, 2 s … at most 10 s. */
export const relayRetryMs = (attempts: number) => Math.min(500 * 2 ** (attempts - 1), 10_000);

/**
 * Moves pending outbox rows to BullMQ (job id = row id, so a row sent twice is still one job) and marks them relayed.
 * Runs in the api and in every worker process (the worker's own follow-up jobs go through the outbox too); rows are
 * claimed FOR UPDATE SKIP LOCKED, so two relays never send one row at the same time. While Redis is down rows simply
 * stay pending and are sent when it is back: nothing is lost and no request waits for Redis.
 */
export class OutboxRelay {
  private readonly log = new Logger('OutboxRelay');
  private timer: NodeJS.Timeout | undefined;
  private running: Promise<void> | undefined;
  private stopped = true;
  private failing = false;

  constructor(
    private readonly store: OutboxStore,
    private readonly queue: JobQueue,
    private readonly settings: OutboxRelaySettings = DEFAULT_RELAY_SETTINGS,
  ) {}

  onApplicationBootstrap(): void {
    this.stopped = false;
    this.schedule(0);
  }

  async beforeApplicationShutdown(): Promise<void> {
    this.stopped = true;
    clearTimeout(this.timer);
    await this.running;
  }

  /** One pass; resolves to the number of rows relayed. */
  async relayOnce(): Promise<number> {
    return this.store.relayDue(this.settings.batch, relayRetryMs, (row) => this.send(row));
  }

  private async send(row: OutboxEntity): Promise<void> {
    const base = JOB_OPTIONS[row.name];
    if (!base) throw new Error(`outbox row ${row.id} names no job of the contract: ${row.name}`);
    const opts = row.maxAttempts ? { ...base, attempts: row.maxAttempts } : base;
    let timer: NodeJS.Timeout | undefined;
    const timeout = new Promise<never>((_, reject) => {
      timer = setTimeout(() => reject(new Error(`the queue did not answer within ${this.settings.sendTimeoutMs} ms`)), this.settings.sendTimeoutMs);
    });
    try {
      await Promise.race([this.queue.add(JOB_QUEUE[row.name], row.name, row.id, row.payload, opts), timeout]);
    } finally {
      clearTimeout(timer);
    }
  }

  private schedule(ms: number): void {
    if (this.stopped) return;
    this.timer = setTimeout(() => {
      this.running = this.tick().finally(() => (this.running = undefined));
    }, ms);
  }

  private async tick(): Promise<void> {
    let full = false;
    try {
      const n = await this.relayOnce();
      full = n >= this.settings.batch;
      if (this.failing) this.log.log('outbox relay running again');
      this.failing = false;
    } catch (err) {
      // The database is down: keep trying; log once per outage.
      if (!this.failing) this.log.warn(`outbox relay: ${(err as Error).message}`);
      this.failing = true;
    }
    this.schedule(full ? 0 : this.settings.pollMs);
  }
}
