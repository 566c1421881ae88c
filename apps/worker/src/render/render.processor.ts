import { Injectable, Logger } from '@nestjs/common';
import { UnrecoverableError } from 'bullmq';
import { QUEUES } from '@psiform/contracts';
import { AssetStore, CONTENT_TYPES, ENGINE_VERSION, JobsStore, ObjectStorage, exportKey, sha256Hex, type JobPayload, type NewAsset } from '@psiform/api/pipeline';
import type { JobProcessor, ProcessorJob } from '../queues/job-processor';
import type { FigureRenderer } from './figure-renderer';
import type { ThumbnailStore } from './thumbnails';
import { ensureMesh, runTracked, versionOf, type TrackedResult } from './tracked-job';

/** jobs.params of a render job (apps/api exports/export-request.ts, or the thumbnail scheduler). */
export interface RenderParams {
  format: 'png';
  widthPx: number;
  heightPx: number;
  dpi: number;
  widthMm?: number;
  heightMm?: number;
  transparent?: boolean | null;
  thumbnail?: boolean;
  figureSetId?: string;
}

/**
 * Render jobs (QUEUES.render): a print PNG of the figure's current version, or its thumbnail after a mesh job.
 * Stages: [meshing, when the version has no mesh yet] -> rendering (headless Chromium, render.html) -> encoding
 * (finishPng + checks) -> storing -> done. The PNG is keyed by its own sha256 (renders need not be bit-identical
 * across page builds), so an identical re-render reuses object and row.
 */
@Injectable()
export class RenderJobProcessor implements JobProcessor<JobPayload, TrackedResult> {
  readonly queue = QUEUES.render;
  /** Software rendering uses every core: one render at a time per worker process. */
  readonly concurrency = 1;
  private readonly log = new Logger('RenderJob');

  constructor(
    private readonly jobs: JobsStore,
    private readonly assets: AssetStore,
    private readonly storage: ObjectStorage,
    private readonly renderer: FigureRenderer,
    private readonly thumbnails: ThumbnailStore,
    private readonly engineVersion: string = ENGINE_VERSION,
  ) {}

  async process(job: ProcessorJob<JobPayload>): Promise<TrackedResult> {
    const res = await runTracked(this.jobs, job, async (t) => {
      const p = t.params as unknown as RenderParams;
      if (p.format !== 'png' || !Number.isInteger(p.widthPx) || !Number.isInteger(p.heightPx) || !(p.dpi > 0)) {
        throw new UnrecoverableError(`render job ${t.id} has no valid png parameters`);
      }
      if (p.figureSetId) throw new UnrecoverableError('figure-set renders are not available yet: the render page does not draw panels');
      const { version, recipe } = versionOf(t.ctx);
      const total = performance.now();
      const mesh = await ensureMesh({ assets: this.assets, storage: this.storage, engineVersion: this.engineVersion }, t, version, recipe);
      await t.stage('rendering');
      const transparent = p.transparent ?? undefined;
      const out = await this.renderer.render({ recipe, glb: mesh.glb, widthPx: p.widthPx, heightPx: p.heightPx, dpi: p.dpi, transparent });
      await t.stage('encoding'); // finishPng and the checks ran inside render(); the stage marks the hand-over
      await t.stage('storing');
      const ts = performance.now();
      const stored = await this.assets.storeObject(exportKey(version.recipeHash, sha256Hex(out.png), 'png'), out.png, CONTENT_TYPES.png);
      const ms = Math.round(performance.now() - total);
      const stats = {
        widthPx: out.widthPx,
        heightPx: out.heightPx,
        dpi: p.dpi,
        widthMm: p.widthMm ?? round3((out.widthPx / p.dpi) * 25.4),
        heightMm: p.heightMm ?? round3((out.heightPx / p.dpi) * 25.4),
        transparent: transparent ?? recipe.stage.background.transparent,
        ms,
        tiles: out.tiles,
        triangles: out.triangles,
        ...(p.thumbnail ? { thumbnail: true } : {}),
        engineVersion: this.engineVersion,
        recipeHash: version.recipeHash,
      };
      const png: NewAsset = { figureVersionId: version.id, publicationId: t.ctx.job.publicationId, kind: 'png', storageKey: stored.key, bytes: stored.bytes, sha256: stored.sha256, stats };
      const timings = { mesh: mesh.meshMs, ...prefixed('render_', out.ms), store: Math.round(performance.now() - ts), total: ms };
      return { timings, assets: [...mesh.newAssets, png] };
    });
    const ctx = await this.jobs.loadContext(res.jobId);
    const params = ctx?.job.params as RenderParams | undefined;
    if (params?.thumbnail && ctx?.figure && ctx.version) {
      const pngId = res.assetIds[res.assetIds.length - 1];
      const set = await this.thumbnails.setThumbnail(ctx.figure.id, ctx.version.id, pngId).catch((e: Error) => {
        this.log.warn(`thumbnail of figure ${ctx.figure!.id}: ${e.message}`);
        return false;
      });
      if (!set) this.log.log(`thumbnail ${pngId} kept but not shown: figure ${ctx.figure.id} has a newer version`);
    }
    return { jobId: res.jobId, assetIds: res.assetIds };
  }

  async onFailed(job: ProcessorJob<JobPayload>, error: Error, final: boolean): Promise<void> {
    if (final && typeof job.data?.jobId === 'string') await this.jobs.fail(job.data.jobId, error.message);
  }
}

const round3 = (x: number) => Math.round(x * 1000) / 1000;
const prefixed = (p: string, o: Record<string, number>) => Object.fromEntries(Object.entries(o).map(([k, v]) => [p + k, v]));
