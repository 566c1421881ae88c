import { Logger } from '@nestjs/common';
import { Queue } from 'bullmq';
import type Redis from 'ioredis';
import type { DataSource } from 'typeorm';
import { QUEUES, THUMBNAIL } from '@psiform/contracts';
import { DEFAULT_JOB_OPTIONS, JOB_ROUTES, JobsStore } from '@psiform/server';
import type { MeshDone } from '../mesh/mesh.processor';

/** figures.thumbnail_asset_id; the only code of the worker that writes the figures table. */
export class ThumbnailStore {
  constructor(private readonly ds: DataSource) {}

  /** Points the figure at the thumbnail when the version is still its current one; false otherwise. */
  async setThumbnail(figureId: string, figureVersionId: string, assetId: string): Promise<boolean> {
    const [, count] = (await this.ds.query(
      `UPDATE figures f SET thumbnail_asset_id = $1
        FROM figure_versions v
       WHERE f.id = $2 AND v.id = $3 AND v.figure_id = f.id AND v.number = f.current_version`,
      [assetId, figureId, figureVersionId],
    )) as [unknown, number];
    return count > 0;
  }
}

/**
 * After each successful mesh job: a render job (own Job row, requested by nobody) for a 320 × 240 px thumbnail.
 * It runs on the render queue, so the mesh job completes without waiting for Chromium; a failure only leaves
 * the figure without a thumbnail (logged; the render job row says why).
 */
export class ThumbnailScheduler {
  private readonly log = new Logger('Thumbnails');
  private queue: Queue | undefined;

  constructor(
    private readonly jobs: JobsStore,
    private readonly connection: Redis,
  ) {}

  schedule = async (done: MeshDone): Promise<void> => {
    const row = await this.jobs.insert({
      type: 'render',
      publicationId: done.publicationId,
      figureId: done.figureId,
      figureVersionId: done.figureVersionId,
      requestedBy: null,
      params: { format: 'png', thumbnail: true, widthPx: THUMBNAIL.widthPx, heightPx: THUMBNAIL.heightPx, dpi: THUMBNAIL.dpi, afterMeshJob: done.jobId },
    });
    try {
      this.queue ??= new Queue(QUEUES.render, { connection: this.connection });
      const route = JOB_ROUTES.render;
      const bull = await this.queue.add(route.name, { jobId: row.id }, { ...DEFAULT_JOB_OPTIONS, attempts: 2, jobId: row.id });
      await this.jobs.setBullJobId(row.id, bull.id ?? row.id);
    } catch (err) {
      await this.jobs.remove(row.id).catch(() => undefined);
      this.log.warn(`thumbnail for figure ${done.figureId} not queued: ${(err as Error).message}`);
    }
  };

  async close(): Promise<void> {
    await this.queue?.close().catch(() => undefined);
  }
}
