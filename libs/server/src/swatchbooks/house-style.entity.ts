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
}
