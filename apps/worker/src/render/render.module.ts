import { Inject, Module, type DynamicModule, type OnApplicationShutdown } from '@nestjs/common';
import { DataSource } from 'typeorm';
import type Redis from 'ioredis';
import { AssetStore, ENGINE_VERSION, JobsStore, ObjectStorage } from '@psiform/server';
import type { WorkerConfig } from '../config/config';
import { REDIS_CONNECTION } from '../infra/redis-connection';
import { ExportJobProcessor } from '../export/export.processor';
import { FigureRenderer } from './figure-renderer';
import { HeadlessBrowser } from './headless-browser';
import { RenderJobProcessor } from './render.processor';
import { StaticSite } from './static-site';
import { ThumbnailScheduler, ThumbnailStore } from './thumbnails';
import { FigureSetStore } from './figure-sets';

/**
 * Render and export processors with their one browser and static site per worker process. Chromium starts on the
 * first render (a worker that only meshes never launches it) and is closed, with the site, on shutdown, after
 * WorkerHost has let the active jobs finish.
 */
@Module({})
export class RenderModule implements OnApplicationShutdown {
  constructor(
    @Inject(HeadlessBrowser) private readonly browser: HeadlessBrowser,
    @Inject(StaticSite) private readonly site: StaticSite,
    @Inject(ThumbnailScheduler) private readonly thumbnails: ThumbnailScheduler,
  ) {}

  static forRoot(config: WorkerConfig): DynamicModule {
    return {
      module: RenderModule,
      providers: [
        { provide: StaticSite, useFactory: () => new StaticSite(config.render.webDist) },
        { provide: HeadlessBrowser, useFactory: () => new HeadlessBrowser(config.render.chromiumPath) },
        { provide: FigureRenderer, inject: [HeadlessBrowser, StaticSite], useFactory: (b: HeadlessBrowser, s: StaticSite) => new FigureRenderer(b, s, config.render.timeoutMs) },
        { provide: ThumbnailStore, inject: [DataSource], useFactory: (ds: DataSource) => new ThumbnailStore(ds) },
        { provide: FigureSetStore, inject: [DataSource], useFactory: (ds: DataSource) => new FigureSetStore(ds) },
        { provide: ThumbnailScheduler, inject: [JobsStore, REDIS_CONNECTION], useFactory: (j: JobsStore, r: Redis) => new ThumbnailScheduler(j, r) },
        // Meshes made by renders, exports and figure sets get their thumbnails as a mesh job's do (config.render.thumbnails).
        {
          provide: RenderJobProcessor,
          inject: [JobsStore, AssetStore, ObjectStorage, FigureRenderer, ThumbnailStore, FigureSetStore, ThumbnailScheduler],
          useFactory: (j: JobsStore, a: AssetStore, s: ObjectStorage, r: FigureRenderer, t: ThumbnailStore, f: FigureSetStore, ts: ThumbnailScheduler) =>
            new RenderJobProcessor(j, a, s, r, t, ENGINE_VERSION, f, config.render.thumbnails ? ts.schedule : undefined),
        },
        {
          provide: ExportJobProcessor,
          inject: [JobsStore, AssetStore, ObjectStorage, FigureRenderer, ThumbnailScheduler],
          useFactory: (j: JobsStore, a: AssetStore, s: ObjectStorage, r: FigureRenderer, ts: ThumbnailScheduler) =>
            new ExportJobProcessor(j, a, s, r, ENGINE_VERSION, () => new Date(), config.render.thumbnails ? ts.schedule : undefined),
        },
      ],
      exports: [RenderJobProcessor, ExportJobProcessor, ThumbnailScheduler],
    };
  }

  async onApplicationShutdown(): Promise<void> {
    await this.thumbnails.close();
    await this.browser.close();
    await this.site.close();
  }
}
