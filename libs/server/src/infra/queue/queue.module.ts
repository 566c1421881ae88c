import { Global, Module } from '@nestjs/common';
import { TypeOrmModule } from '@nestjs/typeorm';
import { JobQueue } from './job-queue';
import { BullJobQueue } from './bull-job-queue';
import { OUTBOX_ENTITIES, OutboxStore, TypeormOutboxStore } from '../../outbox/outbox.repository';
import { DEFAULT_RELAY_SETTINGS, OutboxRelay } from '../../outbox/outbox-relay';

/**
 * The api's side of the queue: the outbox store and the relay that moves committed job requests and notices to
 * BullMQ. Features never call JobQueue themselves: they write outbox rows in their transactions (enqueueIn,
 * requestJobIn).
 */
@Global()
@Module({
  imports: [TypeOrmModule.forFeature(OUTBOX_ENTITIES)],
  providers: [
    { provide: JobQueue, useClass: BullJobQueue },
    { provide: OutboxStore, useClass: TypeormOutboxStore },
    { provide: OutboxRelay, inject: [OutboxStore, JobQueue], useFactory: (o: OutboxStore, q: JobQueue) => new OutboxRelay(o, q, DEFAULT_RELAY_SETTINGS) },
  ],
  exports: [JobQueue, OutboxStore],
})
export class QueueModule {}
