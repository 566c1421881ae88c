import { Module, type DynamicModule } from '@nestjs/common';
import type Redis from 'ioredis';
import { AssetStore, JOB_HANDLERS, JobRunner, JobsStore, ObjectStorage, OutboxStore, SmtpMailer, WORKER_CONFIG, type JobHandler, type WorkerConfig } from '@psiform/server';
import { RedisConnectionModule, REDIS_CONNECTION } from './infra/redis-connection';
import { PipelineModule } from './infra/pipeline.module';
import { HealthPingProcessor } from './health/health-ping.processor';
import { MeshJobProcessor } from './mesh/mesh.processor';
import { MailNoticeProcessor } from './mail/mail-notice.processor';
import { RenderModule } from './render/render.module';
import { RenderJobProcessor } from './render/render.processor';
import { ExportJobProcessor } from './export/export.processor';
import { ThumbnailScheduler } from './render/thumbnails';

/**
 * The worker: one handler per job name of the contract (libs/contracts jobs.ts), all listed under JOB_HANDLERS; the
 * JobRunner (libs/server) refuses to start when a job name has no handler or two. A new job kind: its schema in the
 * contract, a handler class here, one more entry in the JOB_HANDLERS list (DEVELOPERS.md "Jobs").
 */
@Module({})
export class WorkerModule {
  static forRoot(config: WorkerConfig): DynamicModule {
    return {
      module: WorkerModule,
      imports: [RedisConnectionModule.forRoot(config), PipelineModule.forRoot(config), RenderModule.forRoot(config)],
      providers: [
        { provide: WORKER_CONFIG, useValue: config },
        HealthPingProcessor,
        { provide: MeshJobProcessor, inject: [AssetStore, ObjectStorage], useFactory: (assets: AssetStore, storage: ObjectStorage) => new MeshJobProcessor(assets, storage) },
        // Without SMTP_URL the notice handler is registered but disabled, so notices wait for a worker that can send.
        { provide: MailNoticeProcessor, useFactory: () => new MailNoticeProcessor(config.smtp ? new SmtpMailer({ smtp: config.smtp }) : null) },
        {
          provide: JOB_HANDLERS,
          inject: [HealthPingProcessor, MeshJobProcessor, MailNoticeProcessor, RenderJobProcessor, ExportJobProcessor],
          useFactory: (...handlers: JobHandler[]) => handlers,
        },
        {
          provide: JobRunner,
          inject: [REDIS_CONNECTION, JOB_HANDLERS, JobsStore, OutboxStore, ThumbnailScheduler],
          // Every job that stores a new mesh gets the figure's thumbnail after it (THUMBNAILS=off: none).
          useFactory: (redis: Redis, handlers: JobHandler[], jobs: JobsStore, outbox: OutboxStore, thumbs: ThumbnailScheduler) =>
            new JobRunner(redis, handlers, jobs, outbox, { concurrency: config.concurrency, lockMs: config.lockMs, afterMesh: config.render.thumbnails ? thumbs.schedule : undefined }),
        },
      ],
    };
  }
}
