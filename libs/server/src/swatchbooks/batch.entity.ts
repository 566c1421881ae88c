import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';

/** One batch re-render of a publication's figures after a swatchbook change. */
@Entity({ name: 'batches' })
export class BatchEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'publication_id', type: 'uuid' })
  publicationId: string;

  @Column({ name: 'swatchbook_id', type: 'uuid' })
  swatchbookId: string;

  @Column({ name: 'swatchbook_version', type: 'int' })
  swatchbookVersion: number;

  @Column({ name: 'requested_by', type: 'uuid', nullable: true })
  requestedBy: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}

/** A figure of the batch: queued (a new version and its mesh job) or skipped (with the reason). */
@Entity({ name: 'batch_items' })
export class BatchItemEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'batch_id', type: 'uuid' })
  batchId: string;

  @Column({ name: 'figure_id', type: 'uuid' })
  figureId: string;

  @Column({ type: 'varchar', length: 20 })
  status: 'queued' | 'skipped';

  @Column({ type: 'text', nullable: true })
  reason: string | null;

  @Column({ name: 'job_id', type: 'uuid', nullable: true })
  jobId: string | null;

  @Column({ name: 'figure_version_id', type: 'uuid', nullable: true })
  figureVersionId: string | null;
}
