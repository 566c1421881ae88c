import { Column, Entity } from 'typeorm';
import { IdColumn, UuidColumn } from '../db/columns';

/** One submission of a proof for review; open until changes are requested or it is approved. */
@Entity({ name: 'review_rounds' })
export class ReviewRoundEntity {
  @IdColumn() id: string;
  @UuidColumn('figure_id') figureId: string;
  @UuidColumn('figure_version_id') figureVersionId: string;
  @UuidColumn('submitted_by', true) submittedBy: string | null;
  @Column({ name: 'submitted_at', type: 'timestamptz', default: () => 'now()' }) submittedAt: Date;
  @UuidColumn('editor_approved_by', true) editorApprovedBy: string | null;
  @Column({ name: 'editor_approved_at', type: 'timestamptz', nullable: true }) editorApprovedAt: Date | null;
  @UuidColumn('colour_signed_off_by', true) colourSignedOffBy: string | null;
  @Column({ name: 'colour_signed_off_at', type: 'timestamptz', nullable: true }) colourSignedOffAt: Date | null;
  @Column({ name: 'closed_at', type: 'timestamptz', nullable: true }) closedAt: Date | null;
  @Column({ type: 'varchar', length: 20, nullable: true }) outcome: 'changes_requested' | 'approved' | null;
}
