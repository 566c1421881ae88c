import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository, type EntityManager } from 'typeorm';
import { isJobName, parseJob, type JobItem } from '@psiform/contracts';
import { OutboxEntity } from './outbox.entity';

/**
 * THE enqueue path: writes a job request or notice with the caller's EntityManager, i.e. inside the transaction of the
 * change that causes it. The payload is checked against the job contract here, so a malformed request fails the
 * transaction instead of failing later in a worker. Returns the row id (= the BullMQ job id).
 */
export async function enqueueIn(em: EntityManager, item: JobItem, opts: { maxAttempts?: number } = {}): Promise<string> {
  if (!isJobName(item.name)) throw new Error(`"${item.name}" is not a job of the contract`);
  const parsed = parseJob(item.name, item.data);
  if (!parsed.ok) throw new Error(parsed.message);
  const repo = em.getRepository(OutboxEntity);
  const row = await repo.save(repo.create({ name: item.name, payload: parsed.data as Record<string, unknown>, state: 'pending', maxAttempts: opts.maxAttempts ?? null }));
  return row.id;
}

/** A relayed row the sweeper should look at (its queue entry may be lost). */
export interface RelayedRow {
  id: string;
  name: OutboxEntity['name'];
  relayedAt: Date;
}

/** Port for the outbox table; TypeormOutboxStore is the only class touching it. */
export abstract class OutboxStore {
  /** A request outside any other transaction (e.g. the worker's own follow-up jobs). */
  abstract enqueue(item: JobItem, opts?: { maxAttempts?: number }): Promise<string>;
  /**
   * Takes up to `limit` due pending rows under FOR UPDATE SKIP LOCKED (so relays in several processes never send one
   * row twice) and hands each to `send`; a row whose send resolves becomes relayed, one whose send throws stays pending
   * with its error and is due again after `retryMs`. Returns how many were relayed.
   */
  abstract relayDue(limit: number, retryMs: (attempts: number) => number, send: (row: OutboxEntity) => Promise<void>): Promise<number>;
  abstract findById(id: string): Promise<OutboxEntity | null>;
  abstract markDone(id: string): Promise<void>;
  abstract markFailed(id: string, error: string): Promise<void>;
  /** Relayed rows not finished whose check is due (relayed at least `olderThanMs` ago); they move their due time on. */
  abstract claimStale(olderThanMs: number, recheckMs: number, limit: number): Promise<RelayedRow[]>;
  /** Back to pending (the sweeper found its queue entry gone); the relay sends it again. */
  abstract redrive(id: string, reason: string): Promise<void>;
}

@Injectable()
export class TypeormOutboxStore implements OutboxStore {
  constructor(@InjectRepository(OutboxEntity) private readonly outboxRows: Repository<OutboxEntity>) {}
  /** Transactions, and the joins of reads, run on the manager of this feature's own repositories. */
  private get ds(): EntityManager { return this.outboxRows.manager; }

  enqueue(item: JobItem, opts: { maxAttempts?: number } = {}): Promise<string> {
    return enqueueIn(this.ds, item, opts);
  }

  relayDue(limit: number, retryMs: (attempts: number) => number, send: (row: OutboxEntity) => Promise<void>): Promise<number> {
    return this.ds.transaction(async (em) => {
      const due = await em
        .getRepository(OutboxEntity)
        .createQueryBuilder('o')
        .setLock('pessimistic_write')
        .setOnLocked('skip_locked')
        .where(`o.state = 'pending' AND o.due_at <= now()`)
        .orderBy('o.due_at', 'ASC')
        .limit(limit)
        .getMany();
      let relayed = 0;
      for (const row of due) {
        try {
          await send(row);
          await em.getRepository(OutboxEntity).update({ id: row.id }, { state: 'relayed', relayedAt: new Date(), dueAt: new Date(), lastError: null });
          relayed++;
        } catch (err) {
          const attempts = row.relayAttempts + 1;
          await em
            .getRepository(OutboxEntity)
            .update({ id: row.id }, { relayAttempts: attempts, lastError: `relay: ${(err as Error).message}`.slice(0, 2000), dueAt: new Date(Date.now() + retryMs(attempts)) });
          // The queue is down for this batch: leave the rest for the next round instead of timing out on each.
          break;
        }
      }
      return relayed;
    });
  }

  findById(id: string): Promise<OutboxEntity | null> {
    return this.outboxRows.findOne({ where: { id } });
  }

  async markDone(id: string): Promise<void> {
    await this.outboxRows.update({ id }, { state: 'done', doneAt: new Date(), lastError: null });
  }

  async markFailed(id: string, error: string): Promise<void> {
    await this.outboxRows.createQueryBuilder().update().set({ state: 'failed', lastError: error.slice(0, 2000) }).where(`id = :id AND state <> 'done'`, { id }).execute();
  }

  async claimStale(olderThanMs: number, recheckMs: number, limit: number): Promise<RelayedRow[]> {
    const rows = (await this.ds.query(
      `UPDATE outbox SET due_at = now() + ($3 || ' milliseconds')::interval
        WHERE id IN (SELECT id FROM outbox
                      WHERE state = 'relayed' AND relayed_at <= now() - ($1 || ' milliseconds')::interval AND due_at <= now()
                      ORDER BY due_at LIMIT $2 FOR UPDATE SKIP LOCKED)
        RETURNING id, name, relayed_at`,
      [String(olderThanMs), limit, String(recheckMs)],
    )) as [{ id: string; name: OutboxEntity['name']; relayed_at: Date }[], number];
    return rows[0].map((r) => ({ id: r.id, name: r.name, relayedAt: r.relayed_at }));
  }

  async redrive(id: string, reason: string): Promise<void> {
    await this.outboxRows
      .createQueryBuilder()
      .update()
      .set({ state: 'pending', dueAt: () => 'now()', lastError: `sweeper: ${reason}`.slice(0, 2000) })
      .where(`id = :id AND state = 'relayed'`, { id })
      .execute();
  }
}

/** The tables this feature owns (TypeOrmModule.forFeature in its api module; the worker builds the store from them). */
export const OUTBOX_ENTITIES = [OutboxEntity];
