import { Global, Inject, Module, type DynamicModule, type OnApplicationShutdown } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { AssetStore, JobsStore, ObjectStorage, S3AssetStore, S3ObjectStorage, TypeormJobsStore, dataSourceOptions } from '@psiform/server';
import type { WorkerConfig } from '../config/config';

/**
 * PostgreSQL and S3 for the processors, through the api's own adapters (`@psiform/api/pipeline`): the same
 * entities, Job-row store and asset store, so the schema has one definition. The worker never migrates.
 */
@Global()
@Module({})
export class PipelineModule implements OnApplicationShutdown {
  constructor(
    @Inject(DataSource) private readonly ds: DataSource,
    @Inject(ObjectStorage) private readonly storage: S3ObjectStorage,
  ) {}

  static forRoot(config: WorkerConfig): DynamicModule {
    return {
      module: PipelineModule,
      providers: [
        {
          provide: DataSource,
          useFactory: async () => new DataSource(dataSourceOptions(config.database.url, { poolSize: Math.max(4, config.concurrency * 2) })).initialize(),
        },
        { provide: ObjectStorage, useFactory: () => new S3ObjectStorage({ s3: config.s3 }) },
        { provide: JobsStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormJobsStore(ds) },
        { provide: AssetStore, inject: [ObjectStorage, DataSource], useFactory: (s: ObjectStorage, ds: DataSource) => new S3AssetStore(s, ds) },
      ],
      exports: [DataSource, ObjectStorage, JobsStore, AssetStore],
    };
  }

  /** After WorkerHost closed the BullMQ workers (beforeApplicationShutdown). */
  async onApplicationShutdown(): Promise<void> {
    this.storage.onApplicationShutdown();
    if (this.ds.isInitialized) await this.ds.destroy();
  }
}
