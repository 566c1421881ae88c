import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';

/** A reviewer's or illustrator's remark on a figure, optionally on one version and pinned to a point (0..1). */
@Entity({ name: 'comments' })
export class CommentEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'figure_id', type: 'uuid' })
  figureId: string;

  @Column({ name: 'figure_version_id', type: 'uuid', nullable: true })
  figureVersionId: string | null;

  @Column({ name: 'author_id', type: 'uuid' })
  authorId: string;

  @Column({ type: 'text' })
  body: string;

  @Column({ name: 'pin_x', type: 'double precision', nullable: true })
  pinX: number | null;

  @Column({ name: 'pin_y', type: 'double precision', nullable: true })
  pinY: number | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
