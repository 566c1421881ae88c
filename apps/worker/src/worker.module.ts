import { Module, type DynamicModule } from '@nestjs/common';
import { AssetStore, JobsStore, ObjectStorage } from '@psiform/server';
import type { WorkerConfig } from './config/config';
import { WORKER_CONFIG } from './config/config.tokens';
import { RedisConnectionModule } from './infra/redis-connection';
import { PipelineModule } from './infra/pipeline.module';
import { JOB_PROCESSORS, type JobProcessor } from './queues/job-processor';
import { WorkerHost } from './queues/worker-host';
import { HealthPingProcessor } from './health/health-ping.processor';
import { MeshJobProcessor } from './mesh/mesh.processor';
import { MailNoticeProcessor } from './mail/mail-notice.processor';
import { SmtpMailSender, warnNoSmtp } from './mail/mail-sender';
import { RenderModule } from './render/render.module';
import { RenderJobProcessor } from './render/render.processor';
import { ExportJobProcessor } from './export/export.processor';
import { ThumbnailScheduler } from './render/thumbnails';

@Module({})
export class WorkerModule {
  static forRoot(config: WorkerConfig): DynamicModule {
    return {
      module: WorkerModule,
      imports: [RedisConnectionModule.forRoot(config), PipelineModule.forRoot(config), RenderModule.forRoot(config)],
      providers: [
        { provide: WORKER_CONFIG, useValue: config },
        HealthPingProcessor,
        {
          provide: MeshJobProcessor,
          inject: [JobsStore, AssetStore, ObjectStorage, ThumbnailScheduler],
          // THUMBNAILS=off: no thumbnail render after mesh jobs.
          useFactory: (jobs: JobsStore, assets: AssetStore, storage: ObjectStorage, thumbs: ThumbnailScheduler) =>
            new MeshJobProcessor(jobs, assets, storage, undefined, config.render.thumbnails ? thumbs.schedule : undefined),
        },
        // Without SMTP_URL this worker leaves the mail queue alone, so notices wait for a worker that can send.
        { provide: MailNoticeProcessor, useFactory: () => (config.smtp ? new MailNoticeProcessor(new SmtpMailSender(config.smtp)) : warnNoSmtp()) },
        // Render and export processors (studio issue): RenderModule.
        { provide: JOB_PROCESSORS, inject: [HealthPingProcessor, MeshJobProcessor, MailNoticeProcessor, RenderJobProcessor, ExportJobProcessor], useFactory: (...processors: (JobProcessor | null)[]) => processors.filter((p): p is JobProcessor => p !== null) },
        WorkerHost,
      ],
    };
  }
}
