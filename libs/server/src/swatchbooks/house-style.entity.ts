import { Column, Entity, PrimaryColumn } from 'typeorm';
import { UuidColumn, UpdatedAt } from '../db/columns';

/** A publication's house style: the pinned swatchbook and the colour rules of its review. */
@Entity({ name: 'house_styles' })
export class HouseStyleEntity {
  @PrimaryColumn({ name: 'publication_id', type: 'uuid' }) publicationId: string;
  @UuidColumn('swatchbook_id') swatchbookId: string;
  @Column({ name: 'require_colour_signoff', type: 'boolean', default: false }) requireColourSignOff: boolean;
  @Column({ name: 'allow_override', type: 'boolean', default: false }) allowOverride: boolean;
  @UuidColumn('updated_by', true) updatedBy: string | null;
  @UpdatedAt() updatedAt: Date;
  /** Set while the pinned swatchbook was pinned past failing colour checks: the written reason (audited too). */
  @Column({ name: 'override_reason', type: 'text', nullable: true }) overrideReason: string | null;
  @UuidColumn('override_by', true) overrideBy: string | null;
  @Column({ name: 'override_at', type: 'timestamptz', nullable: true }) overrideAt: Date | null;
  /** The error-level failures the reason went past, as the checks worded them. */
  @Column({ name: 'override_failures', type: 'jsonb', nullable: true }) overrideFailures: string[] | null;
  @Column({ name: 'override_swatchbook_version', type: 'int', nullable: true }) overrideSwatchbookVersion: number | null;
}
