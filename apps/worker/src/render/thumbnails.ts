import { Logger } from '@nestjs/common';
import { THUMBNAIL } from '@psiform/contracts';
import { JobsStore, type MeshDone } from '@psiform/server';

/**
 * After each job that stored a new mesh (the runner's after-mesh hook: mesh jobs, and renders, exports and figure
 * sets that meshed first): a render job (own Job row, requested by nobody) for a 320 × 240 px thumbnail,
 * requested through the outbox like every job (JobsStore.request: row + outbox row in one transaction). It runs on the
 * render queue, so the mesh job completes without waiting for Chromium; a failure only leaves the figure without a
 * thumbnail (logged; the render job row says why).
 */
export class ThumbnailScheduler {
  private readonly log = new Logger('Thumbnails');

  constructor(private readonly jobs: JobsStore) {}

  schedule = async (done: MeshDone): Promise<void> => {
    try {
      await this.jobs.request({
        type: 'render',
        publicationId: done.publicationId,
        figureId: done.figureId,
        figureVersionId: done.figureVersionId,
        requestedBy: null,
        params: { format: 'png', thumbnail: true, widthPx: THUMBNAIL.widthPx, heightPx: THUMBNAIL.heightPx, dpi: THUMBNAIL.dpi, afterMeshJob: done.jobId },
        maxAttempts: 2,
      });
    } catch (err) {
      this.log.warn(`thumbnail for figure ${done.figureId} not requested: ${(err as Error).message}`);
    }
  };
}
