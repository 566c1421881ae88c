import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn } from 'typeorm';
import type { PublicationDto, PublicationKind } from '@psiform/contracts';

@Entity({ name: 'publications' })
export class PublicationEntity {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'varchar', length: 300 })
  title: string;

  @Column({ type: 'varchar', length: 200 })
  publisher: string;

  @Column({ type: 'varchar', length: 20 })
  kind: PublicationKind;

  @Column({ type: 'text', default: '' })
  description: string;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}

export function toPublicationDto(p: PublicationEntity): PublicationDto {
  return { id: p.id, title: p.title, publisher: p.publisher, kind: p.kind, description: p.description, createdAt: p.createdAt.toISOString() };
}
