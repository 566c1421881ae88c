import { Column, Entity, JoinColumn, ManyToOne } from 'typeorm';
import { IdColumn, UuidColumn, CreatedAt, UpdatedAt } from '../db/columns';
import type { JobDto, JobState } from '@psiform/contracts';
import { FigureEntity } from '../figures/figure.entity';
import { FigureVersionEntity } from '../figures/figure-version.entity';
import { UserEntity } from '../users/user.entity';

export type JobType = JobDto['type'];

/**
 * A unit of background work (mesh now; render and export later). The api inserts it (queued) and enqueues
 * a BullMQ job whose id is this row's id; the worker reports state, stage and progress here, which is
 * what GET /api/jobs/:id and its event stream read.
 */
@Entity({ name: 'jobs' })
export class JobEntity {
  @IdColumn() id: string;
  @Column({ type: 'varchar', length: 20 }) type: JobType;
  @Column({ type: 'varchar', length: 20, default: 'queued' }) state: JobState;
  /** 0..100. */
  @Column({ type: 'int', default: 0 }) progress: number;
  @Column({ type: 'varchar', length: 40, default: 'queued' }) stage: string;
  @Column({ type: 'text', nullable: true }) error: string | null;
  @Column({ type: 'jsonb', nullable: true }) timings: Record<string, number> | null;
  @UuidColumn('figure_id', true) figureId: string | null;
  @ManyToOne(() => FigureEntity, { onDelete: 'CASCADE', nullable: true }) @JoinColumn({ name: 'figure_id' }) figure?: FigureEntity | null;
  @UuidColumn('figure_version_id', true) figureVersionId: string | null;
  @ManyToOne(() => FigureVersionEntity, { onDelete: 'CASCADE', nullable: true }) @JoinColumn({ name: 'figure_version_id' }) figureVersion?: FigureVersionEntity | null;
  /** Publication the job belongs to (access checks). */
  @UuidColumn('publication_id') publicationId: string;
  @UuidColumn('requested_by', true) requestedBy: string | null;
  @ManyToOne(() => UserEntity, { onDelete: 'SET NULL', nullable: true }) @JoinColumn({ name: 'requested_by' }) requester?: UserEntity | null;
  @Column({ name: 'bull_job_id', type: 'varchar', length: 100, nullable: true }) bullJobId: string | null;
  /** Attempts started so far (BullMQ retries with backoff). */
  @Column({ type: 'int', default: 0 }) attempts: number;
  /** Assets this job produced (they may be shared with other jobs of equal content). */
  /** What render/export jobs are asked for (format, size, dpi, ...); null for mesh jobs. Migration StudioExports. */
  @Column({ type: 'jsonb', nullable: true }) params: Record<string, unknown> | null;
  @Column({ name: 'asset_ids', type: 'uuid', array: true, default: () => `'{}'` }) assetIds: string[];
  @CreatedAt() createdAt: Date;
  @UpdatedAt() updatedAt: Date;
}
