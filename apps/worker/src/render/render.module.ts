import { Inject, Module, type DynamicModule, type OnApplicationShutdown } from '@nestjs/common';
import { AssetStore, ENGINE_VERSION, FigureSetsStore, FiguresStore, JobsStore, ObjectStorage, type WorkerConfig } from '@psiform/server';
import { ExportJobProcessor } from '../export/export.processor';
import { FigureRenderer } from './figure-renderer';
import { HeadlessBrowser } from './headless-browser';
import { RenderJobProcessor } from './render.processor';
import { StaticSite } from './static-site';
import { ThumbnailScheduler } from './thumbnails';

/**
 * Render and export handlers with their one browser and static site per worker process. Chromium starts on the
 * first render (a worker that only meshes never launches it) and is closed, with the site, on shutdown, after
 * the JobRunner has let the active jobs finish.
 */
@Module({})
export class RenderModule implements OnApplicationShutdown {
  constructor(
    @Inject(HeadlessBrowser) private readonly browser: HeadlessBrowser,
    @Inject(StaticSite) private readonly site: StaticSite,
  ) {}

  static forRoot(config: WorkerConfig): DynamicModule {
    return {
      module: RenderModule,
      providers: [
        { provide: StaticSite, useFactory: () => new StaticSite(config.render.webDist) },
        { provide: HeadlessBrowser, useFactory: () => new HeadlessBrowser(config.render.chromiumPath) },
        { provide: FigureRenderer, inject: [HeadlessBrowser, StaticSite], useFactory: (b: HeadlessBrowser, s: StaticSite) => new FigureRenderer(b, s, config.render.timeoutMs) },
        { provide: ThumbnailScheduler, inject: [JobsStore], useFactory: (j: JobsStore) => new ThumbnailScheduler(j) },
        {
          provide: RenderJobProcessor,
          inject: [AssetStore, ObjectStorage, FigureRenderer, FiguresStore, FigureSetsStore],
          useFactory: (a: AssetStore, s: ObjectStorage, r: FigureRenderer, f: FiguresStore, sets: FigureSetsStore) => new RenderJobProcessor(a, s, r, f, ENGINE_VERSION, sets),
        },
        {
          provide: ExportJobProcessor,
          inject: [AssetStore, ObjectStorage, FigureRenderer],
          useFactory: (a: AssetStore, s: ObjectStorage, r: FigureRenderer) => new ExportJobProcessor(a, s, r),
        },
      ],
      exports: [RenderJobProcessor, ExportJobProcessor, ThumbnailScheduler],
    };
  }

  async onApplicationShutdown(): Promise<void> {
    await this.browser.close();
    await this.site.close();
  }
}
