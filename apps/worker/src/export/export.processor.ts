import { Injectable } from '@nestjs/common';
import { UnrecoverableError } from 'bullmq';
import { QUEUES, type Recipe } from '@psiform/contracts';
import { AssetStore, CONTENT_TYPES, ENGINE_VERSION, JobsStore, ObjectStorage, exportKey, sha256Hex, type JobPayload, type NewAsset } from '@psiform/api/pipeline';
import { buildBundle, figureMetadata, type BundleFile, type MeshResultLike } from '@psiform/print';
import { recipeState, screenGlbFromArchival, screenTolerance } from '@psiform/meshing';
import { compileState } from '@psiform/orbitals';
import type { JobProcessor, ProcessorJob } from '../queues/job-processor';
import type { FigureRenderer } from '../render/figure-renderer';
import { ensureMesh, runTracked, versionOf, type TrackedJob, type TrackedResult } from '../render/tracked-job';
import { latoFonts } from './fonts';
import { figureSvg, plotPalette, type SvgParams } from './svg-export';

/** The PNG a bundle gets when the version has no print render yet (a single column, common practice). */
export const BUNDLE_DEFAULT_PNG = { widthMm: 89, heightMm: 60, dpi: 300, widthPx: 1051, heightPx: 709 } as const;

type ExportParams = ({ format: 'svg' } & SvgParams) | { format: 'glb' | 'stl' } | { format: 'bundle' };

/**
 * Export jobs (QUEUES.export): svg (radial plot or section map, Lato embedded), glb/stl (the version's mesh,
 * computed first when missing) and bundle (zip: GLB, STL, PNG, radial SVG, recipe.json, metadata.json, README.txt).
 */
@Injectable()
export class ExportJobProcessor implements JobProcessor<JobPayload, TrackedResult> {
  readonly queue = QUEUES.export;

  constructor(
    private readonly jobs: JobsStore,
    private readonly assets: AssetStore,
    private readonly storage: ObjectStorage,
    private readonly renderer: FigureRenderer | null,
    private readonly engineVersion: string = ENGINE_VERSION,
    private readonly now: () => Date = () => new Date(),
  ) {}

  async process(job: ProcessorJob<JobPayload>): Promise<TrackedResult> {
    const res = await runTracked(this.jobs, job, async (t) => {
      const p = t.params as unknown as ExportParams;
      const { version, recipe } = versionOf(t.ctx);
      const total = performance.now();
      let assets: NewAsset[];
      if (p.format === 'svg') assets = await this.svg(t, recipe, version.id, version.recipeHash, p);
      else if (p.format === 'glb' || p.format === 'stl') assets = await this.mesh(t, recipe, version, p.format);
      else if (p.format === 'bundle') assets = await this.bundle(t, recipe, version);
      else throw new UnrecoverableError(`export job ${t.id} has an unknown format ${JSON.stringify((p as { format?: unknown }).format)}`);
      return { timings: { total: Math.round(performance.now() - total) }, assets };
    });
    return { jobId: res.jobId, assetIds: res.assetIds };
  }

  async onFailed(job: ProcessorJob<JobPayload>, error: Error, final: boolean): Promise<void> {
    if (final && typeof job.data?.jobId === 'string') await this.jobs.fail(job.data.jobId, error.message);
  }

  private async svg(t: TrackedJob, recipe: Recipe, versionId: string, recipeHash: string, p: SvgParams): Promise<NewAsset[]> {
    if (recipe.source?.kind === 'upload') throw new UnrecoverableError('radial plots and section maps need the analytic state; this figure is an uploaded cube');
    await t.stage('encoding');
    const svg = new TextEncoder().encode(figureSvg(recipe, p, latoFonts()));
    await t.stage('storing');
    const stored = await this.assets.storeObject(exportKey(recipeHash, sha256Hex(svg), 'svg'), svg, CONTENT_TYPES.svg);
    const stats = { svg: p.kind, ...(p.kind === 'section' ? { plane: p.plane, offset: p.offset, levels: p.levels } : {}), widthMm: p.widthMm, heightMm: p.heightMm, fonts: 'Lato (embedded)' };
    return [{ figureVersionId: versionId, publicationId: t.ctx.job.publicationId, kind: 'svg', storageKey: stored.key, bytes: stored.bytes, sha256: stored.sha256, stats }];
  }

  private async mesh(t: TrackedJob, recipe: Recipe, version: NonNullable<TrackedJob['ctx']['version']>, kind: 'glb' | 'stl'): Promise<NewAsset[]> {
    const mesh = await ensureMesh(this.deps(), t, version, recipe);
    await t.stage('storing');
    if (mesh.newAssets.length) return [...mesh.newAssets].sort((a, b) => (a.kind === kind ? -1 : b.kind === kind ? 1 : 0));
    return [mesh.existing[kind]!];
  }

  private async bundle(t: TrackedJob, recipe: Recipe, version: NonNullable<TrackedJob['ctx']['version']>): Promise<NewAsset[]> {
    const mesh = await ensureMesh(this.deps(), t, version, recipe);
    const out: NewAsset[] = [...mesh.newAssets];
    const pub = t.ctx.job.publicationId;
    // The latest print render of this version (thumbnails excluded), else a default one rendered now.
    const pngRow = [...(await this.assets.findForVersion(version.id))].reverse().find((a) => a.kind === 'png' && !(a.stats as { thumbnail?: boolean } | null)?.thumbnail);
    let png: Uint8Array;
    if (pngRow) png = await this.storage.get(pngRow.storageKey);
    else {
      if (!this.renderer) throw new Error('this worker cannot render (no browser configured) and the figure has no PNG yet');
      await t.stage('rendering');
      const d = BUNDLE_DEFAULT_PNG;
      const r = await this.renderer.render({ recipe, glb: mesh.glb, widthPx: d.widthPx, heightPx: d.heightPx, dpi: d.dpi });
      png = r.png;
      const stored = await this.assets.storeObject(exportKey(version.recipeHash, sha256Hex(png), 'png'), png, CONTENT_TYPES.png);
      out.push({
        figureVersionId: version.id,
        publicationId: pub,
        kind: 'png',
        storageKey: stored.key,
        bytes: stored.bytes,
        sha256: stored.sha256,
        stats: { widthPx: d.widthPx, heightPx: d.heightPx, dpi: d.dpi, widthMm: d.widthMm, heightMm: d.heightMm, ms: r.ms.total, forBundle: true },
      });
    }
    await t.stage('encoding');
    const files: BundleFile[] = [
      { name: 'figure.glb', bytes: mesh.glb },
      { name: 'figure.stl', bytes: await mesh.stl() },
      { name: 'figure.png', bytes: png },
    ];
    if (recipe.source?.kind !== 'upload') {
      files.push({ name: 'figure-screen.glb', bytes: await screenGlb(recipe, mesh.glb, mesh.stats, version.engineVersion || this.engineVersion) });
      const svgParams: SvgParams = { kind: 'radial', plane: 'xz', offset: 0, levels: 4, widthMm: recipe.canvas.widthMm, heightMm: recipe.canvas.heightMm };
      files.push({ name: 'radial.svg', bytes: new TextEncoder().encode(figureSvg(recipe, svgParams, latoFonts())) });
    }
    // The mesh summary (@psiform/meshing summariseSurfaces) is what the metadata sheet and caption read: the
    // all-space fraction, the part inside the box, the grids and every warning travel with the figure.
    const result = mesh.stats as unknown as MeshResultLike;
    const palette = plotPalette(recipe);
    const meta = figureMetadata({
      recipe: recipe as never,
      result,
      engineVersion: version.engineVersion || this.engineVersion,
      palette: { positive: palette.positive, negative: palette.negative, background: palette.background, swatchbookId: recipe.palette.swatchbookId },
      generatedAt: this.now().toISOString(),
    });
    const zip = buildBundle(files, meta);
    await t.stage('storing');
    const stored = await this.assets.storeObject(exportKey(version.recipeHash, sha256Hex(zip), 'zip'), zip, CONTENT_TYPES.bundle);
    out.push({
      figureVersionId: version.id,
      publicationId: pub,
      kind: 'bundle',
      storageKey: stored.key,
      bytes: stored.bytes,
      sha256: stored.sha256,
      stats: { files: [...files.map((f) => f.name), 'recipe.json', 'metadata.json', 'README.txt'], generatedAt: meta.generatedAt },
    });
    // The bundle first: it is what this job was asked for.
    return [out[out.length - 1], ...out.slice(0, -1)];
  }

  private deps() {
    return { assets: this.assets, storage: this.storage, engineVersion: this.engineVersion };
  }
}

/**
 * The screen GLB beside the archival one (libs/meshing optimise.ts): decimated to a quarter pixel of a 2160-pixel
 * display, checked against the analytic surface, quantised and meshopt-compressed.
 */
async function screenGlb(recipe: Recipe, archival: Uint8Array, stats: Record<string, unknown>, version: string): Promise<Uint8Array> {
  const ref = stats.refinement as { surfaceHalfWidth?: number } | null | undefined;
  const halfWidth = ref?.surfaceHalfWidth ?? Number((stats.grid as { extent?: number } | undefined)?.extent);
  return screenGlbFromArchival(archival, {
    version,
    field: compileState(recipeState(recipe)),
    isovalue: Number(stats.isovalue),
    tolerance: screenTolerance(halfWidth),
    colouring: { palette: recipe.palette, mode: recipe.phase?.mode },
  });
}
