import { Column, Entity } from 'typeorm';
import { IdColumn, UuidColumn } from '../db/columns';
import type { AuditEntryDto, AuditSubject, FigureStatus, SubjectAuditEntryDto } from '@psiform/contracts';

/**
 * Append-only record of what happened, written in the transaction of the change it records. Figures are the
 * usual subject (figure_id); users, publications and house styles are recorded with subject_kind + subject_id.
 */
@Entity({ name: 'audit_entries' })
export class AuditEntryEntity {
  @IdColumn() id: string;
  /** Insertion order (bigserial; read as a string by pg). */
  @Column({ type: 'bigint', insert: false, update: false }) seq: string;
  /** Set for entries about a figure (subject_kind 'figure'); null otherwise. */
  @UuidColumn('figure_id', true) figureId: string | null;
  @Column({ name: 'subject_kind', type: 'varchar', length: 20, default: 'figure' }) subjectKind: AuditSubject;
  /** The user, publication or house style (= its publication id) the entry is about; null for figure entries. */
  @UuidColumn('subject_id', true) subjectId: string | null;
  @UuidColumn('actor_id', true) actorId: string | null;
  @Column({ type: 'varchar', length: 30 }) action: string;
  @Column({ name: 'from_status', type: 'varchar', length: 20, nullable: true }) fromStatus: FigureStatus | null;
  @Column({ name: 'to_status', type: 'varchar', length: 20, nullable: true }) toStatus: FigureStatus | null;
  @Column({ type: 'text', nullable: true }) note: string | null;
  @Column({ type: 'timestamptz', insert: false, update: false }) at: Date;
}

export function toAuditEntryDto(e: AuditEntryEntity, actorName?: string | null): AuditEntryDto {
  return { id: e.id, figureId: e.figureId ?? '', actorId: e.actorId, actorName: actorName ?? undefined, action: e.action, fromStatus: e.fromStatus, toStatus: e.toStatus, note: e.note, at: e.at.toISOString() };
}

export function toSubjectAuditEntryDto(e: AuditEntryEntity, actorName?: string | null): SubjectAuditEntryDto {
  return {
    id: e.id,
    subjectKind: e.subjectKind,
    subjectId: (e.subjectKind === 'figure' ? e.figureId : e.subjectId) ?? '',
    actorId: e.actorId,
    actorName: actorName ?? undefined,
    action: e.action,
    note: e.note,
    at: e.at.toISOString(),
  };
}
