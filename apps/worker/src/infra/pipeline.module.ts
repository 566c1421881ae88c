import { Global, Inject, Module, type DynamicModule, type OnApplicationShutdown } from '@nestjs/common';
import { DataSource } from 'typeorm';
import {
  AssetEntity,
  AssetStore,
  BullJobQueue,
  DEFAULT_RELAY_SETTINGS,
  FigureEntity,
  FigureSetEntity,
  FigureSetsStore,
  FigureVersionEntity,
  FiguresStore,
  JobEntity,
  JobQueue,
  JobsStore,
  ObjectStorage,
  OutboxEntity,
  OutboxRelay,
  OutboxStore,
  OutboxSweeper,
  S3AssetStore,
  S3ObjectStorage,
  TypeormFigureSetsStore,
  TypeormFiguresStore,
  TypeormJobsStore,
  TypeormOutboxStore,
  dataSourceOptions,
  type WorkerConfig,
} from '@psiform/server';

/**
 * PostgreSQL, S3 and the queue producer for the handlers, through the server core's stores and adapters (libs/server):
 * the same entities and stores as the api. The worker never migrates. It runs an outbox relay (its own follow-up jobs,
 * e.g. thumbnails, go through the outbox like every other job request) and the sweeper that re-drives lost jobs.
 */
@Global()
@Module({})
export class PipelineModule implements OnApplicationShutdown {
  constructor(
    @Inject(DataSource) private readonly ds: DataSource,
    @Inject(ObjectStorage) private readonly storage: S3ObjectStorage,
    @Inject(JobQueue) private readonly queue: BullJobQueue,
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
        { provide: JobQueue, useFactory: () => new BullJobQueue({ redis: config.redis }) },
        // The stores are built from their features' own repositories, as the api's modules inject them (forFeature).
        { provide: JobsStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormJobsStore(ds.getRepository(JobEntity)) },
        { provide: OutboxStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormOutboxStore(ds.getRepository(OutboxEntity)) },
        { provide: FiguresStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormFiguresStore(ds.getRepository(FigureEntity), ds.getRepository(FigureVersionEntity)) },
        { provide: FigureSetsStore, inject: [DataSource], useFactory: (ds: DataSource) => new TypeormFigureSetsStore(ds.getRepository(FigureSetEntity)) },
        { provide: AssetStore, inject: [ObjectStorage, DataSource], useFactory: (s: ObjectStorage, ds: DataSource) => new S3AssetStore(s, ds.getRepository(AssetEntity)) },
        { provide: OutboxRelay, inject: [OutboxStore, JobQueue], useFactory: (o: OutboxStore, q: JobQueue) => new OutboxRelay(o, q, DEFAULT_RELAY_SETTINGS) },
        {
          provide: OutboxSweeper,
          inject: [OutboxStore, JobsStore, JobQueue],
          useFactory: (o: OutboxStore, j: JobsStore, q: JobQueue) => new OutboxSweeper(o, j, q, { everyMs: config.outbox.sweepMs, staleMs: config.outbox.staleMs }),
        },
      ],
      exports: [DataSource, ObjectStorage, JobQueue, JobsStore, OutboxStore, FiguresStore, FigureSetsStore, AssetStore],
    };
  }

  /** After the JobRunner, relay and sweeper stopped (beforeApplicationShutdown). */
  async onApplicationShutdown(): Promise<void> {
    this.storage.onApplicationShutdown();
    await this.queue.onApplicationShutdown();
    if (this.ds.isInitialized) await this.ds.destroy();
  }
}
