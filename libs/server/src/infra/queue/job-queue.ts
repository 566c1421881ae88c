import type { JobOptions } from '../../jobs/job-options';

/** Port for the job queue. Only BullJobQueue talks to BullMQ; only the outbox relay and sweeper call it. */
export abstract class JobQueue {
  /** Adds a job with the given id (adding an id that is already queued is a no-op); resolves to the stored id. */
  abstract add(queue: string, name: string, jobId: string, data: Record<string, unknown>, opts: JobOptions): Promise<string>;
  /** The queue's state of a job ('waiting', 'active', 'completed', 'failed', 'delayed', …), or null when it has none. */
  abstract state(queue: string, jobId: string): Promise<string | null>;
}
