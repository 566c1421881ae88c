import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository, type EntityManager } from 'typeorm';
import type { AuditSubject, FigureStatus } from '@psiform/contracts';
import { AuditEntryEntity } from './audit-entry.entity';
import { joinUserName, rowsWithUserName } from '../users/user-names';

export interface NewAuditEntry {
  figureId: string;
  actorId: string | null;
  action: string;
  fromStatus: FigureStatus | null;
  toStatus: FigureStatus | null;
  note?: string | null;
}

/** An entry about a user, a publication or a house style (subject id = the publication's id). */
export interface NewSubjectAuditEntry {
  subjectKind: Exclude<AuditSubject, 'figure'>;
  subjectId: string;
  actorId: string | null;
  action: string;
  note?: string | null;
}

/** Writes one entry with the caller's EntityManager, i.e. inside the transaction of the change it records. */
export async function insertAudit(em: EntityManager, entry: NewAuditEntry): Promise<void> {
  await em.getRepository(AuditEntryEntity).insert({ ...entry, subjectKind: 'figure', subjectId: null, note: entry.note ?? null });
}

/** The same for users, publications and house styles. */
export async function insertSubjectAudit(em: EntityManager, entry: NewSubjectAuditEntry): Promise<void> {
  await em.getRepository(AuditEntryEntity).insert({ ...entry, figureId: null, fromStatus: null, toStatus: null, note: entry.note ?? null });
}

export interface SubjectAuditQuery {
  subjectKind?: Exclude<AuditSubject, 'figure'>;
  subjectId?: string;
  page: number;
  pageSize: number;
}

export interface AuditRow {
  entry: AuditEntryEntity;
  actorName: string | null;
}

/** Port for reading the audit log. */
export abstract class AuditStore {
  abstract listForFigure(figureId: string): Promise<AuditRow[]>;
  /** Entries about users, publications and house styles, newest first. */
  abstract listForSubjects(q: SubjectAuditQuery): Promise<{ rows: AuditRow[]; total: number }>;
}

@Injectable()
export class TypeormAuditStore implements AuditStore {
  constructor(@InjectRepository(AuditEntryEntity) private readonly entries: Repository<AuditEntryEntity>) {}
  /** Transactions, and the joins of reads, run on the manager of this feature's own repositories. */
  private get ds(): EntityManager { return this.entries.manager; }

  async listForFigure(figureId: string) {
    const rows = await rowsWithUserName(
      joinUserName(this.ds.getRepository(AuditEntryEntity).createQueryBuilder('e'), 'e.actor_id')
        .where('e.figure_id = :figureId', { figureId })
        .orderBy('e.seq', 'ASC'),
    );
    return rows.map(({ row, userName }) => ({ entry: row, actorName: userName }));
  }

  async listForSubjects(q: SubjectAuditQuery) {
    const qb = joinUserName(this.ds.getRepository(AuditEntryEntity).createQueryBuilder('e'), 'e.actor_id').where(`e.subject_kind <> 'figure'`);
    if (q.subjectKind) qb.andWhere('e.subject_kind = :kind', { kind: q.subjectKind });
    if (q.subjectId) qb.andWhere('e.subject_id = :sid', { sid: q.subjectId });
    const total = await qb.getCount();
    const rows = await rowsWithUserName(qb.orderBy('e.seq', 'DESC').offset((q.page - 1) * q.pageSize).limit(q.pageSize));
    return { rows: rows.map(({ row, userName }) => ({ entry: row, actorName: userName })), total };
  }
}

/** The tables this feature owns (TypeOrmModule.forFeature in its api module; the worker builds the store from them). */
export const AUDIT_ENTITIES = [AuditEntryEntity];
