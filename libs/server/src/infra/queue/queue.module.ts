import { Global, Module } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { JobQueue } from './job-queue';
import { BullJobQueue } from './bull-job-queue';
import { OutboxStore, TypeormOutboxStore } from '../../outbox/outbox.repository';
import { DEFAULT_RELAY_SETTINGS, OutboxRelay } from '../../outbox/outbox-relay';

/**
 * The api's side of the queue: the outbox store and the relay that moves committed job requests and notices to
 * BullMQ. Features never call JobQueue themselves: they write outbox rows in their transactions (enqueueIn,
 * requestJobIn).
 */
@Global()
@Module({
  providers: [
    { provide: JobQueue, useClass: BullJobQueue },
    { provide: OutboxStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormOutboxStore(ds) },
    { provide: OutboxRelay, inject: [OutboxStore, JobQueue], useFactory: (o: OutboxStore, q: JobQueue) => new OutboxRelay(o, q, DEFAULT_RELAY_SETTINGS) },
  ],
  exports: [JobQueue, OutboxStore],
})
export class QueueModule {}
