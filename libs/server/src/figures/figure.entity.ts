import { Column, CreateDateColumn, Entity, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { FigureStatus } from '@psiform/contracts';
import { PublicationEntity } from '../publications/publication.entity';
import { UserEntity } from '../users/user.entity';

/** A deliverable of a publication; its content lives in numbered FigureVersions. */
@Entity({ name: 'figures' })
export class FigureEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'publication_id', type: 'uuid' })
  publicationId: string;

  @ManyToOne(() => PublicationEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'publication_id' })
  publication?: PublicationEntity;

  @Column({ type: 'varchar', length: 200 })
  title: string;

  @Column({ name: 'owner_id', type: 'uuid' })
  ownerId: string;

  @ManyToOne(() => UserEntity, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'owner_id' })
  owner?: UserEntity;

  @Column({ type: 'varchar', length: 20, default: 'draft' })
  status: FigureStatus;

  /** Number of the current FigureVersion. */
  @Column({ name: 'current_version', type: 'int' })
  currentVersion: number;

  /** Small PNG rendered after the latest mesh job (migration StudioExports); null until one succeeded. */
  @Column({ name: 'thumbnail_asset_id', type: 'uuid', nullable: true })
  thumbnailAssetId: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
