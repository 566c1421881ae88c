import { Column, Entity } from 'typeorm';
import { IdColumn, UuidColumn, CreatedAt } from '../db/columns';

/** One batch re-render of a publication's figures after a swatchbook change. */
@Entity({ name: 'batches' })
export class BatchEntity {
  @IdColumn() id: string;
  @UuidColumn('publication_id') publicationId: string;
  @UuidColumn('swatchbook_id') swatchbookId: string;
  @Column({ name: 'swatchbook_version', type: 'int' }) swatchbookVersion: number;
  @UuidColumn('requested_by', true) requestedBy: string | null;
  /** The written reason when the swatchbook failed its colour checks at error level and the batch went ahead. */
  @Column({ name: 'override_reason', type: 'text', nullable: true }) overrideReason: string | null;
  @CreatedAt() createdAt: Date;
}

/** A figure of the batch: queued (a new version and its mesh job) or skipped (with the reason). */
@Entity({ name: 'batch_items' })
export class BatchItemEntity {
  @IdColumn() id: string;
  @UuidColumn('batch_id') batchId: string;
  @UuidColumn('figure_id') figureId: string;
  @Column({ type: 'varchar', length: 20 }) status: 'queued' | 'skipped';
  @Column({ type: 'text', nullable: true }) reason: string | null;
  @UuidColumn('job_id', true) jobId: string | null;
  @UuidColumn('figure_version_id', true) figureVersionId: string | null;
}
