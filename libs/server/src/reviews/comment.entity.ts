import { Column, Entity } from 'typeorm';
import { IdColumn, UuidColumn, CreatedAt } from '../db/columns';

/** A reviewer's or illustrator's remark on a figure, optionally on one version and pinned to a point (0..1). */
@Entity({ name: 'comments' })
export class CommentEntity {
  @IdColumn() id: string;
  @UuidColumn('figure_id') figureId: string;
  @UuidColumn('figure_version_id', true) figureVersionId: string | null;
  @UuidColumn('author_id') authorId: string;
  @Column({ type: 'text' }) body: string;
  @Column({ name: 'pin_x', type: 'double precision', nullable: true }) pinX: number | null;
  @Column({ name: 'pin_y', type: 'double precision', nullable: true }) pinY: number | null;
  @CreatedAt() createdAt: Date;
}
