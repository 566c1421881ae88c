import type { Job } from 'bullmq';

/** What a processor sees of a BullMQ job. */
export type ProcessorJob<Data> = Pick<Job<Data>, 'id' | 'name' | 'data' | 'attemptsMade' | 'opts'>;

/** One queue's job handler. Processors are plain classes (unit-testable); WorkerHost wires them to BullMQ. */
export interface JobProcessor<Data = unknown, Result = unknown> {
  readonly queue: string;
  /** BullMQ lock duration for this queue (ms); the WorkerHost default when absent. */
  readonly lockMs?: number;
  /** Jobs of this queue run at once per process; the WorkerHost default (WORKER_CONCURRENCY) when absent. */
  readonly concurrency?: number;
  process(job: ProcessorJob<Data>): Promise<Result>;
  /**
   * Called by WorkerHost whenever BullMQ reports the job failed (also when it stalled too often and the
   * processor never saw the error); `final` is true when no retry follows.
   */
  onFailed?(job: ProcessorJob<Data>, error: Error, final: boolean): Promise<void>;
}

export const JOB_PROCESSORS = Symbol('JOB_PROCESSORS');
