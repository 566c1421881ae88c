import type { JobPayload } from '../../pipeline/mesh-job';

export interface EnqueueOptions {
  attempts: number;
  backoff: { type: 'exponential' | 'fixed'; delay: number };
  removeOnComplete?: { age: number; count: number };
  removeOnFail?: { age: number; count: number };
}

/** Port for the job queue. Only BullJobQueue talks to BullMQ. */
export abstract class JobQueue {
  /** Adds a job with the given id; resolves to the id BullMQ stored. */
  abstract add(queue: string, name: string, jobId: string, data: JobPayload, opts: EnqueueOptions): Promise<string>;
}
