import { Injectable } from '@nestjs/common';
import { UnrecoverableError } from 'bullmq';
import type { Recipe } from '@psiform/contracts';
import { AssetStore, CONTENT_TYPES, ENGINE_VERSION, ObjectStorage, exportKey, sha256Hex, type NewAsset, type TrackedJobHandler, type TrackedOutcome, type TrackedRun } from '@psiform/server';
import { buildBundle, figureMetadata, type BundleFile, type MeshResultLike } from '@psiform/print';
import type { FigureRenderer } from '../render/figure-renderer';
import { EXPORT_PROGRESS, ensureMesh, versionOf, type TrackedJob } from '../render/tracked-job';
import { latoFonts } from './fonts';
import { figureSvg, plotPalette, type SvgParams } from './svg-export';

/** The PNG a bundle gets when the version has no print render yet (a single column, common practice). */
export const BUNDLE_DEFAULT_PNG = { widthMm: 89, heightMm: 60, dpi: 300, widthPx: 1051, heightPx: 709 } as const;

/**
 * Export jobs (QUEUES.export): svg (radial plot or section map, Lato embedded), glb/stl (the version's mesh,
 * computed first when missing) and bundle (zip: GLB, STL, PNG, radial SVG, recipe.json, metadata.json, README.txt).
 */
@Injectable()
export class ExportJobProcessor implements TrackedJobHandler<'export'> {
  readonly kind = 'tracked';
  readonly name = 'export';
  readonly progress = EXPORT_PROGRESS;

  constructor(
    private readonly assets: AssetStore,
    private readonly storage: ObjectStorage,
    private readonly renderer: FigureRenderer | null,
    private readonly engineVersion: string = ENGINE_VERSION,
    private readonly now: () => Date = () => new Date(),
  ) {}

  /** The payload (params included) was checked against the job contract by the runner: no cast. */
  async run(t: TrackedRun<'export'>): Promise<TrackedOutcome> {
    const p = t.params;
    const { version, recipe } = versionOf(t.ctx);
    const total = performance.now();
    let assets: NewAsset[];
    if (p.format === 'svg') assets = await this.svg(t, recipe, version.id, version.recipeHash, p);
    else if (p.format === 'glb' || p.format === 'stl') assets = await this.mesh(t, recipe, version, p.format);
    else assets = await this.bundle(t, recipe, version);
    return { timings: { total: Math.round(performance.now() - total) }, assets };
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
      const svgParams: SvgParams = { kind: 'radial', plane: 'xz', offset: 0, levels: 4, widthMm: recipe.canvas.widthMm, heightMm: recipe.canvas.heightMm };
      files.push({ name: 'radial.svg', bytes: new TextEncoder().encode(figureSvg(recipe, svgParams, latoFonts())) });
    }
    const s = mesh.stats as { isovalue: number; enclosed: number; grid: { n: number; extent: number }; surfaces?: Array<{ phase: '+' | '-' | 'complex' } & Record<string, unknown>> };
    const result: MeshResultLike = {
      isovalue: s.isovalue,
      enclosed: s.enclosed,
      grid: { n: s.grid.n, extent: s.grid.extent },
      surfaces: (s.surfaces ?? []).map(({ phase, ...stats }) => ({ phase, stats: stats as never })),
    };
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
