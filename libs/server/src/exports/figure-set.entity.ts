import { Column, Entity } from 'typeorm';
import { IdColumn, UuidColumn, CreatedAt, RefTo } from '../db/columns';
import type { FigureSetDto } from '@psiform/contracts';
import { PublicationEntity } from '../publications/publication.entity';

/** Several figures of one publication laid out as labelled panels of one image (a, b, c ... in figureIds order). */
@Entity({ name: 'figure_sets' })
export class FigureSetEntity {
  @IdColumn() id: string;
  @UuidColumn('publication_id') publicationId: string;
  @RefTo(() => PublicationEntity, 'publication_id', 'CASCADE') publication?: PublicationEntity;
  @Column({ type: 'varchar', length: 200 }) title: string;
  @Column({ name: 'figure_ids', type: 'uuid', array: true }) figureIds: string[];
  @Column({ type: 'int' }) columns: number;
  /** Printed under the panels of the set's PNG (migration FigureUnitsAndSetCaptions). */
  @Column({ type: 'text', nullable: true }) caption: string | null;
  /** The latest exported PNG of the set (migration FigureSetExports). */
  @UuidColumn('png_asset_id', true) pngAssetId: string | null;
  @UuidColumn('created_by', true) createdBy: string | null;
  @CreatedAt() createdAt: Date;
}

export function toFigureSetDto(s: FigureSetEntity): FigureSetDto {
  return { id: s.id, publicationId: s.publicationId, title: s.title, figureIds: s.figureIds, columns: s.columns, caption: s.caption ?? null, pngAssetId: s.pngAssetId ?? null, createdBy: s.createdBy, createdAt: s.createdAt.toISOString() };
}
