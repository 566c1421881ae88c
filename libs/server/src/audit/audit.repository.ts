import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository, type EntityManager } from 'typeorm';
import type { FigureStatus } from '@psiform/contracts';
import { AuditEntryEntity } from './audit-entry.entity';
import { UserEntity } from '../users/user.entity';

export interface NewAuditEntry {
  figureId: string;
  actorId: string | null;
  action: string;
  fromStatus: FigureStatus | null;
  toStatus: FigureStatus | null;
  note?: string | null;
}

/** Writes one entry with the caller's EntityManager, i.e. inside the transaction of the change it records. */
export async function insertAudit(em: EntityManager, entry: NewAuditEntry): Promise<void> {
  await em.getRepository(AuditEntryEntity).insert({ ...entry, note: entry.note ?? null });
}

/** Port for reading the audit log. */
export abstract class AuditStore {
  abstract listForFigure(figureId: string): Promise<{ entry: AuditEntryEntity; actorName: string | null }[]>;
}

@Injectable()
export class TypeormAuditStore implements AuditStore {
  constructor(@InjectRepository(AuditEntryEntity) private readonly entries: Repository<AuditEntryEntity>) {}
  /** Transactions, and the joins of reads, run on the manager of this feature's own repositories. */
  private get ds(): EntityManager { return this.entries.manager; }

  async listForFigure(figureId: string) {
    const { entities, raw } = await this.ds
      .getRepository(AuditEntryEntity)
      .createQueryBuilder('e')
      .leftJoin(UserEntity, 'u', 'u.id = e.actor_id')
      .addSelect('u.display_name', 'actor_name')
      .where('e.figure_id = :figureId', { figureId })
      .orderBy('e.seq', 'ASC')
      .getRawAndEntities();
    return entities.map((entry, i) => ({ entry, actorName: (raw[i]?.actor_name as string | undefined) ?? null }));
  }
}

/** The tables this feature owns (TypeOrmModule.forFeature in its api module; the worker builds the store from them). */
export const AUDIT_ENTITIES = [AuditEntryEntity];
