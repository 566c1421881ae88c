import { Column, Entity, PrimaryGeneratedColumn } from 'typeorm';

/** One submission of a proof for review; open until changes are requested or it is approved. */
@Entity({ name: 'review_rounds' })
export class ReviewRoundEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'figure_id', type: 'uuid' })
  figureId: string;

  @Column({ name: 'figure_version_id', type: 'uuid' })
  figureVersionId: string;

  @Column({ name: 'submitted_by', type: 'uuid', nullable: true })
  submittedBy: string | null;

  @Column({ name: 'submitted_at', type: 'timestamptz', default: () => 'now()' })
  submittedAt: Date;

  @Column({ name: 'editor_approved_by', type: 'uuid', nullable: true })
  editorApprovedBy: string | null;

  @Column({ name: 'editor_approved_at', type: 'timestamptz', nullable: true })
  editorApprovedAt: Date | null;

  @Column({ name: 'colour_signed_off_by', type: 'uuid', nullable: true })
  colourSignedOffBy: string | null;

  @Column({ name: 'colour_signed_off_at', type: 'timestamptz', nullable: true })
  colourSignedOffAt: Date | null;

  @Column({ name: 'closed_at', type: 'timestamptz', nullable: true })
  closedAt: Date | null;

  @Column({ type: 'varchar', length: 20, nullable: true })
  outcome: 'changes_requested' | 'approved' | null;
}
