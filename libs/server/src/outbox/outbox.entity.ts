import { Column, Entity, Index } from 'typeorm';
import { IdColumn, CreatedAt } from '../db/columns';
import type { JobName } from '@psiform/contracts';

/**
 * pending: written in the transaction of the change that asks for it, not yet on the queue;
 * relayed: on the BullMQ queue (its BullMQ job id is this row's id); done: the handler finished it;
 * failed: the handler gave up (its last error is kept).
 */
export const OUTBOX_STATES = ['pending', 'relayed', 'done', 'failed'] as const;
export type OutboxState = (typeof OUTBOX_STATES)[number];

/**
 * The transactional outbox: every job request and mail notice is a row written in the same transaction as the change
 * that causes it, so a commit can never lose it and a rollback never sends it. OutboxRelay moves pending rows to
 * BullMQ; OutboxSweeper re-drives rows whose queue entry was lost.
 */
@Entity({ name: 'outbox' })
@Index('ix_outbox_state_due', ['state', 'dueAt'])
export class OutboxEntity {
  @IdColumn() id: string;
  /** A job name of the job contract (libs/contracts jobs.ts); the payload was checked against its schema. */
  @Column({ type: 'varchar', length: 40 }) name: JobName;
  @Column({ type: 'jsonb' }) payload: Record<string, unknown>;
  @Column({ type: 'varchar', length: 12, default: 'pending' }) state: OutboxState;
  /** BullMQ attempts for this job (null: the job name's default). */
  @Column({ name: 'max_attempts', type: 'int', nullable: true }) maxAttempts: number | null;
  /** Relay attempts that failed (queue unreachable); the next one waits dueAt. */
  @Column({ name: 'relay_attempts', type: 'int', default: 0 }) relayAttempts: number;
  @Column({ name: 'last_error', type: 'text', nullable: true }) lastError: string | null;
  /** When the relay (pending) or the sweeper (relayed) looks at the row next. */
  @Column({ name: 'due_at', type: 'timestamptz', default: () => 'now()' }) dueAt: Date;
  @Column({ name: 'relayed_at', type: 'timestamptz', nullable: true }) relayedAt: Date | null;
  @Column({ name: 'done_at', type: 'timestamptz', nullable: true }) doneAt: Date | null;
  @CreatedAt() createdAt: Date;
}
