import { MESH_STAGES, QUEUES } from '@psiform/contracts';

export type MeshStage = (typeof MESH_STAGES)[number];

/** BullMQ payload of every Psiform job: the Job row carries the rest. */
export interface JobPayload {
  jobId: string;
}

/** Queue and BullMQ job name per job type. Render and export jobs add rows here. */
export const JOB_ROUTES = {
  mesh: { queue: QUEUES.mesh, name: 'mesh' },
  render: { queue: QUEUES.render, name: 'render' },
  export: { queue: QUEUES.export, name: 'export' },
} as const;
export type RoutedJobType = keyof typeof JOB_ROUTES;

/** Retries with exponential backoff (1 s, 2 s); kept finished jobs are trimmed. */
export const DEFAULT_JOB_OPTIONS = {
  attempts: 3,
  backoff: { type: 'exponential' as const, delay: 1000 },
  removeOnComplete: { age: 24 * 3600, count: 2000 },
  removeOnFail: { age: 7 * 24 * 3600, count: 2000 },
};

/** Progress (0..100) reported on entering each stage. */
export const MESH_PROGRESS: Record<MeshStage, number> = {
  queued: 0,
  sampling: 5,
  threshold: 40,
  extracting: 50,
  encoding: 75,
  storing: 90,
  done: 100,
};
