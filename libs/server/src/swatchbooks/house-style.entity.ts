import { Column, Entity, PrimaryColumn, UpdateDateColumn } from 'typeorm';

/** A publication's house style: the pinned swatchbook and the colour rules of its review. */
@Entity({ name: 'house_styles' })
export class HouseStyleEntity {
  @PrimaryColumn({ name: 'publication_id', type: 'uuid' })
  publicationId: string;

  @Column({ name: 'swatchbook_id', type: 'uuid' })
  swatchbookId: string;

  @Column({ name: 'require_colour_signoff', type: 'boolean', default: false })
  requireColourSignOff: boolean;

  @Column({ name: 'allow_override', type: 'boolean', default: false })
  allowOverride: boolean;

  @Column({ name: 'updated_by', type: 'uuid', nullable: true })
  updatedBy: string | null;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
