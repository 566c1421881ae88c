import { Module, type DynamicModule } from '@nestjs/common';
import type { WorkerConfig } from './config/config';
import { WORKER_CONFIG } from './config/config.tokens';
import { RedisConnectionModule } from './infra/redis-connection';
import { JOB_PROCESSORS, type JobProcessor } from './queues/job-processor';
import { WorkerHost } from './queues/worker-host';
import { HealthPingProcessor } from './health/health-ping.processor';

@Module({})
export class WorkerModule {
  static forRoot(config: WorkerConfig): DynamicModule {
    return {
      module: WorkerModule,
      imports: [RedisConnectionModule.forRoot(config)],
      providers: [
        { provide: WORKER_CONFIG, useValue: config },
        HealthPingProcessor,
        // Add further processors (mesh, render, export) here.
        { provide: JOB_PROCESSORS, inject: [HealthPingProcessor], useFactory: (...processors: JobProcessor[]) => processors },
        WorkerHost,
      ],
    };
  }
}
