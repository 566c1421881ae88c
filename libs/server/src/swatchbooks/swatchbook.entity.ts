import { Column, Entity } from 'typeorm';
import { IdColumn, UuidColumn, CreatedAt, UpdatedAt } from '../db/columns';
import type { SwatchbookColorsDto, SwatchbookDto, SwatchbookVersionDto } from '@psiform/contracts';

/** An art director's palette. Every change bumps `version` and writes a SwatchbookVersion snapshot. */
@Entity({ name: 'swatchbooks' })
export class SwatchbookEntity {
  @IdColumn() id: string;
  @Column({ type: 'varchar', length: 120 }) name: string;
  @UuidColumn('owner_id') ownerId: string;
  /** Where it belongs: one publication, or (publisher set instead) every publication of that publisher. */
  @UuidColumn('publication_id', true) publicationId: string | null;
  @Column({ type: 'varchar', length: 200, nullable: true }) publisher: string | null;
  @Column({ type: 'jsonb' }) colors: SwatchbookColorsDto;
  @Column({ type: 'boolean', default: false }) locked: boolean;
  @Column({ type: 'int', default: 1 }) version: number;
  @CreatedAt() createdAt: Date;
  @UpdatedAt() updatedAt: Date;
}

@Entity({ name: 'swatchbook_versions' })
export class SwatchbookVersionEntity {
  @IdColumn() id: string;
  @UuidColumn('swatchbook_id') swatchbookId: string;
  @Column({ type: 'int' }) version: number;
  @Column({ type: 'varchar', length: 120 }) name: string;
  @Column({ type: 'jsonb' }) colors: SwatchbookColorsDto;
  @Column({ type: 'boolean' }) locked: boolean;
  @Column({ type: 'varchar', length: 20 }) action: SwatchbookVersionDto['action'];
  @UuidColumn('author_id', true) authorId: string | null;
  @CreatedAt() createdAt: Date;
}

export function toSwatchbookDto(s: SwatchbookEntity): SwatchbookDto {
  return { id: s.id, name: s.name, ownerId: s.ownerId, publicationId: s.publicationId, publisher: s.publisher, colors: s.colors, locked: s.locked, version: s.version, createdAt: s.createdAt.toISOString(), updatedAt: s.updatedAt.toISOString() };
}

export function toSwatchbookVersionDto(v: SwatchbookVersionEntity): SwatchbookVersionDto {
  return { version: v.version, name: v.name, colors: v.colors, locked: v.locked, action: v.action, authorId: v.authorId, createdAt: v.createdAt.toISOString() };
}
