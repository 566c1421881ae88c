import type { JobName } from '@psiform/contracts';

export interface JobOptions {
  attempts: number;
  /** 'capped': exponential from `delay`, never more than CAPPED_BACKOFF_MAX_MS between tries (JobRunner's strategy). */
  backoff: { type: 'exponential' | 'fixed' | 'capped'; delay: number };
  removeOnComplete?: { age: number; count: number };
  removeOnFail?: { age: number; count: number };
}

/** Longest wait between two tries of a 'capped' job. */
export const CAPPED_BACKOFF_MAX_MS = 60_000;

/** Delay before try `attemptsMade + 1` of a 'capped' job: 1 s, 2 s, 4 s … then once a minute. */
export function cappedBackoffMs(attemptsMade: number, delay: number): number {
  return Math.min(delay * 2 ** Math.max(0, attemptsMade - 1), CAPPED_BACKOFF_MAX_MS);
}

const KEEP = { removeOnComplete: { age: 24 * 3600, count: 2000 }, removeOnFail: { age: 7 * 24 * 3600, count: 2000 } };

/** Figure work: 3 tries, exponential backoff (1 s, 2 s). */
export const DEFAULT_JOB_OPTIONS: JobOptions = { attempts: 3, backoff: { type: 'exponential', delay: 1000 }, ...KEEP };

/**
 * Notices outlast a mail server that is down for an hour: 1 s, 2 s … 32 s, then a try a minute; 70 tries span about
 * 65 minutes (checked in job-options.spec.ts). Past that the row is failed and the sweeper's report names it.
 */
export const NOTICE_JOB_OPTIONS: JobOptions = { attempts: 70, backoff: { type: 'capped', delay: 1000 }, ...KEEP };

/** Per job name: how BullMQ retries it. A new job kind adds its line here (or takes the default). */
export const JOB_OPTIONS: Record<JobName, JobOptions> = {
  ping: { attempts: 1, backoff: { type: 'fixed', delay: 1000 }, removeOnComplete: { age: 3600, count: 100 }, removeOnFail: { age: 3600, count: 100 } },
  mesh: DEFAULT_JOB_OPTIONS,
  render: DEFAULT_JOB_OPTIONS,
  export: DEFAULT_JOB_OPTIONS,
  notice: NOTICE_JOB_OPTIONS,
};

/** Total wait across every retry of a job with these options (ms). */
export function totalBackoffMs(o: JobOptions): number {
  let sum = 0;
  for (let made = 1; made < o.attempts; made++) {
    sum += o.backoff.type === 'capped' ? cappedBackoffMs(made, o.backoff.delay) : o.backoff.type === 'fixed' ? o.backoff.delay : o.backoff.delay * 2 ** (made - 1);
  }
  return sum;
}
