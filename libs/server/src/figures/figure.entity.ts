import { Column, Entity } from 'typeorm';
import { IdColumn, UuidColumn, CreatedAt, UpdatedAt, RefTo } from '../db/columns';
import type { FigureStatus } from '@psiform/contracts';
import { PublicationEntity } from '../publications/publication.entity';
import { UserEntity } from '../users/user.entity';

/** A deliverable of a publication; its content lives in numbered FigureVersions. */
@Entity({ name: 'figures' })
export class FigureEntity {
  @IdColumn() id: string;
  @UuidColumn('publication_id') publicationId: string;
  @RefTo(() => PublicationEntity, 'publication_id', 'CASCADE') publication?: PublicationEntity;
  @Column({ type: 'varchar', length: 200 }) title: string;
  @UuidColumn('owner_id') ownerId: string;
  @RefTo(() => UserEntity, 'owner_id', 'RESTRICT') owner?: UserEntity;
  @Column({ type: 'varchar', length: 20, default: 'draft' }) status: FigureStatus;
  /** Number of the current FigureVersion. */
  @Column({ name: 'current_version', type: 'int' }) currentVersion: number;
  /** Small PNG rendered after the latest mesh job (migration StudioExports); null until one succeeded. */
  @UuidColumn('thumbnail_asset_id', true) thumbnailAssetId: string | null;
  @CreatedAt() createdAt: Date;
  @UpdatedAt() updatedAt: Date;
}
