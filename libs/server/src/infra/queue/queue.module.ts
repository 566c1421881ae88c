import { Global, Module } from '@nestjs/common';
import { JobQueue } from './job-queue';
import { BullJobQueue } from './bull-job-queue';

@Global()
@Module({ providers: [{ provide: JobQueue, useClass: BullJobQueue }], exports: [JobQueue] })
export class QueueModule {}
