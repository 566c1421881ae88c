import { Logger } from '@nestjs/common';
import { JOB_QUEUE, isJobName } from '@psiform/contracts';
import { JobQueue } from '../infra/queue/job-queue';
import { JobsStore } from '../jobs/jobs.repository';
import { OutboxStore } from './outbox.repository';

export interface OutboxSweeperSettings {
  /** How often the sweeper runs (ms). */
  everyMs: number;
  /** A relayed row or a queued job untouched this long gets its queue entry checked (ms). */
  staleMs: number;
}

export const DEFAULT_SWEEPER_SETTINGS: OutboxSweeperSettings = { everyMs: 30_000, staleMs: 60_000 };

/**
 * Re-drives what the queue lost. Runs in every worker process (rows are claimed with SKIP LOCKED):
 * - relayed outbox rows that are not done: if BullMQ no longer has their job (Redis restarted without its data, a
 *   flush) they go back to pending and the relay sends them again; if BullMQ finished them while this process could
 *   not record it, the row is marked accordingly;
 * - job rows left `queued` whose BullMQ job does not exist (written before the outbox existed, or by a process that
 *   died between insert and add): a fresh outbox row, under the job row's lock.
 */
export class OutboxSweeper {
  private readonly log = new Logger('OutboxSweeper');
  private timer: NodeJS.Timeout | undefined;
  private running: Promise<unknown> | undefined;

  constructor(
    private readonly outbox: OutboxStore,
    private readonly jobs: JobsStore,
    private readonly queue: JobQueue,
    private readonly settings: OutboxSweeperSettings = DEFAULT_SWEEPER_SETTINGS,
  ) {}

  onApplicationBootstrap(): void {
    this.timer = setInterval(() => {
      if (this.running) return;
      this.running = this.sweep()
        .catch((err: Error) => this.log.warn(`sweep: ${err.message}`))
        .finally(() => (this.running = undefined));
    }, this.settings.everyMs);
  }

  async beforeApplicationShutdown(): Promise<void> {
    clearInterval(this.timer);
    await this.running;
  }

  /** One pass; returns what it re-drove (for logs and tests). */
  async sweep(): Promise<{ redrivenRows: string[]; redrivenJobs: string[] }> {
    const redrivenRows: string[] = [];
    const redrivenJobs: string[] = [];
    for (const row of await this.outbox.claimStale(this.settings.staleMs, this.settings.staleMs, 100)) {
      const state = await this.queue.state(JOB_QUEUE[row.name], row.id);
      if (state === null) {
        await this.outbox.redrive(row.id, `its ${row.name} job was gone from the queue`);
        redrivenRows.push(row.id);
      } else if (state === 'completed') await this.outbox.markDone(row.id);
      else if (state === 'failed') await this.outbox.markFailed(row.id, 'the queue gave up on it');
    }
    for (const job of await this.jobs.staleQueued(this.settings.staleMs, 100)) {
      if (!isJobName(job.type)) continue;
      const outboxRow = job.bullJobId ? await this.outbox.findById(job.bullJobId) : null;
      if (outboxRow?.state === 'pending') continue; // the relay will send it
      const live = job.bullJobId ? await this.queue.state(JOB_QUEUE[job.type], job.bullJobId) : null;
      const legacy = live === null ? await this.queue.state(JOB_QUEUE[job.type], job.id) : null; // rows queued before the outbox used their own id
      if (live !== null || legacy !== null) continue;
      if (await this.jobs.redriveQueued(job.id)) redrivenJobs.push(job.id);
    }
    if (redrivenRows.length || redrivenJobs.length) this.log.warn(`re-drove ${redrivenRows.length} outbox row(s) and ${redrivenJobs.length} queued job(s) whose queue entry was gone`);
    return { redrivenRows, redrivenJobs };
  }
}
