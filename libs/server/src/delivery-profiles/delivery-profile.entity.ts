import { Column, Entity, PrimaryColumn } from 'typeorm';
import { UuidColumn } from '../db/columns';
import type { DeliveryProfile } from '@psiform/contracts';

/** One delivery profile per publication (migration PrintProduction). */
@Entity({ name: 'delivery_profiles' })
export class DeliveryProfileEntity {
  @PrimaryColumn({ name: 'publication_id', type: 'uuid' }) publicationId!: string;
  @Column({ type: 'jsonb' }) profile!: DeliveryProfile;
  @UuidColumn('updated_by', true) updatedBy!: string | null;
  @Column({ name: 'updated_at', type: 'timestamptz', default: () => 'now()' }) updatedAt!: Date;
}
