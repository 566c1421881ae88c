import { Column, Entity } from 'typeorm';
import { IdColumn, UuidColumn } from '../db/columns';
import type { AuditEntryDto, FigureStatus } from '@psiform/contracts';

/** Append-only record of what happened to a figure; written in the transaction of the change it records. */
@Entity({ name: 'audit_entries' })
export class AuditEntryEntity {
  @IdColumn() id: string;
  /** Insertion order (bigserial; read as a string by pg). */
  @Column({ type: 'bigint', insert: false, update: false }) seq: string;
  @UuidColumn('figure_id') figureId: string;
  @UuidColumn('actor_id', true) actorId: string | null;
  @Column({ type: 'varchar', length: 30 }) action: string;
  @Column({ name: 'from_status', type: 'varchar', length: 20, nullable: true }) fromStatus: FigureStatus | null;
  @Column({ name: 'to_status', type: 'varchar', length: 20, nullable: true }) toStatus: FigureStatus | null;
  @Column({ type: 'text', nullable: true }) note: string | null;
  @Column({ type: 'timestamptz', insert: false, update: false }) at: Date;
}

export function toAuditEntryDto(e: AuditEntryEntity, actorName?: string | null): AuditEntryDto {
  return { id: e.id, figureId: e.figureId, actorId: e.actorId, actorName: actorName ?? undefined, action: e.action, fromStatus: e.fromStatus, toStatus: e.toStatus, note: e.note, at: e.at.toISOString() };
}
