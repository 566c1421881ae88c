import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn } from 'typeorm';
import type { SwatchbookColorsDto, SwatchbookDto, SwatchbookVersionDto } from '@psiform/contracts';

/** An art director's palette. Every change bumps `version` and writes a SwatchbookVersion snapshot. */
@Entity({ name: 'swatchbooks' })
export class SwatchbookEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'varchar', length: 120 })
  name: string;

  @Column({ name: 'owner_id', type: 'uuid' })
  ownerId: string;

  /** Where it belongs: one publication, or (publisher set instead) every publication of that publisher. */
  @Column({ name: 'publication_id', type: 'uuid', nullable: true })
  publicationId: string | null;

  @Column({ type: 'varchar', length: 200, nullable: true })
  publisher: string | null;

  @Column({ type: 'jsonb' })
  colors: SwatchbookColorsDto;

  @Column({ type: 'boolean', default: false })
  locked: boolean;

  @Column({ type: 'int', default: 1 })
  version: number;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}

@Entity({ name: 'swatchbook_versions' })
export class SwatchbookVersionEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'swatchbook_id', type: 'uuid' })
  swatchbookId: string;

  @Column({ type: 'int' })
  version: number;

  @Column({ type: 'varchar', length: 120 })
  name: string;

  @Column({ type: 'jsonb' })
  colors: SwatchbookColorsDto;

  @Column({ type: 'boolean' })
  locked: boolean;

  @Column({ type: 'varchar', length: 20 })
  action: SwatchbookVersionDto['action'];

  @Column({ name: 'author_id', type: 'uuid', nullable: true })
  authorId: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}

export function toSwatchbookDto(s: SwatchbookEntity): SwatchbookDto {
  return { id: s.id, name: s.name, ownerId: s.ownerId, publicationId: s.publicationId, publisher: s.publisher, colors: s.colors, locked: s.locked, version: s.version, createdAt: s.createdAt.toISOString(), updatedAt: s.updatedAt.toISOString() };
}

export function toSwatchbookVersionDto(v: SwatchbookVersionEntity): SwatchbookVersionDto {
  return { version: v.version, name: v.name, colors: v.colors, locked: v.locked, action: v.action, authorId: v.authorId, createdAt: v.createdAt.toISOString() };
}
