import { Column, Entity } from 'typeorm';
import { IdColumn, CreatedAt } from '../db/columns';
import type { LengthUnit, PublicationDto, PublicationKind } from '@psiform/contracts';

@Entity({ name: 'publications' })
export class PublicationEntity {
  @IdColumn() id: string;
  @Column({ type: 'varchar', length: 300 }) title: string;
  @Column({ type: 'varchar', length: 200 }) publisher: string;
  @Column({ type: 'varchar', length: 20 }) kind: PublicationKind;
  @Column({ type: 'text', default: '' }) description: string;
  /** The one length unit of this publication's figures (scale bars, section-map axes, radial plots). */
  @Column({ name: 'length_unit', type: 'varchar', length: 10, default: 'angstrom' }) lengthUnit: LengthUnit;
  @CreatedAt() createdAt: Date;
}

export function toPublicationDto(p: PublicationEntity): PublicationDto {
  return { id: p.id, title: p.title, publisher: p.publisher, kind: p.kind, description: p.description, lengthUnit: p.lengthUnit ?? 'angstrom', createdAt: p.createdAt.toISOString() };
}
