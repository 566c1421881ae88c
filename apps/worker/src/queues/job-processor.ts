import type { Job } from 'bullmq';

/** One queue's job handler. Processors are plain classes (unit-testable); WorkerHost wires them to BullMQ. */
export interface JobProcessor<Data = unknown, Result = unknown> {
  readonly queue: string;
  process(job: Pick<Job<Data, Result>, 'id' | 'name' | 'data'>): Promise<Result>;
}

export const JOB_PROCESSORS = Symbol('JOB_PROCESSORS');
