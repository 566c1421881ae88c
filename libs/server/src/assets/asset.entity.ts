import { Column, Entity, JoinColumn, ManyToOne } from 'typeorm';
import { IdColumn, UuidColumn, CreatedAt, RefTo } from '../db/columns';
import type { AssetDto, AssetKind } from '@psiform/contracts';
import { FigureVersionEntity } from '../figures/figure-version.entity';
import { PublicationEntity } from '../publications/publication.entity';

/** bigint comes back from pg as a string; our byte counts stay far below 2^53. */
const bigintAsNumber = { to: (v: number) => v, from: (v: string | null) => (v === null ? null : Number(v)) };

/**
 * Metadata of one stored object (mesh, upload, render, export). Objects live under content-derived keys,
 * so several versions (even of different figures) may point at one object; a (version, kind, key) triple
 * exists at most once (uq_assets_version_kind_key), which makes re-runs unable to duplicate rows.
 */
@Entity({ name: 'assets' })
export class AssetEntity {
  @IdColumn() id: string;
  @UuidColumn('figure_version_id', true) figureVersionId: string | null;
  @ManyToOne(() => FigureVersionEntity, { onDelete: 'CASCADE', nullable: true }) @JoinColumn({ name: 'figure_version_id' }) figureVersion?: FigureVersionEntity | null;
  @UuidColumn('publication_id') publicationId: string;
  @RefTo(() => PublicationEntity, 'publication_id', 'CASCADE') publication?: PublicationEntity;
  @Column({ type: 'varchar', length: 20 }) kind: AssetKind;
  @Column({ name: 'storage_key', type: 'varchar', length: 500 }) storageKey: string;
  @Column({ type: 'bigint', transformer: bigintAsNumber }) bytes: number;
  @Column({ type: 'char', length: 64 }) sha256: string;
  @Column({ type: 'jsonb', nullable: true }) stats: AssetDto['stats'];
  @CreatedAt() createdAt: Date;
}

export function toAssetDto(a: AssetEntity): AssetDto {
  return { id: a.id, kind: a.kind, bytes: a.bytes, sha256: a.sha256, stats: a.stats ?? null, createdAt: a.createdAt.toISOString() };
}
