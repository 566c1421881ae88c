import { Column, CreateDateColumn, Entity, JoinColumn, ManyToOne, PrimaryGeneratedColumn } from 'typeorm';
import type { FigureSetDto } from '@psiform/contracts';
import { PublicationEntity } from '../publications/publication.entity';

/** Several figures of one publication laid out as labelled panels of one image (a, b, c ... in figureIds order). */
@Entity({ name: 'figure_sets' })
export class FigureSetEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'publication_id', type: 'uuid' })
  publicationId: string;

  @ManyToOne(() => PublicationEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'publication_id' })
  publication?: PublicationEntity;

  @Column({ type: 'varchar', length: 200 })
  title: string;

  @Column({ name: 'figure_ids', type: 'uuid', array: true })
  figureIds: string[];

  @Column({ type: 'int' })
  columns: number;

  /** Printed under the panels of the set's PNG (migration FigureUnitsAndSetCaptions). */
  @Column({ type: 'text', nullable: true })
  caption: string | null;

  /** The latest exported PNG of the set (migration FigureSetExports). */
  @Column({ name: 'png_asset_id', type: 'uuid', nullable: true })
  pngAssetId: string | null;

  @Column({ name: 'created_by', type: 'uuid', nullable: true })
  createdBy: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}

export function toFigureSetDto(s: FigureSetEntity): FigureSetDto {
  return { id: s.id, publicationId: s.publicationId, title: s.title, figureIds: s.figureIds, columns: s.columns, caption: s.caption ?? null, pngAssetId: s.pngAssetId ?? null, createdBy: s.createdBy, createdAt: s.createdAt.toISOString() };
}
