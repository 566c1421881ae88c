import { MESH_STAGES } from '@psiform/contracts';

export type MeshStage = (typeof MESH_STAGES)[number];

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
