import { Injectable, Logger } from '@nestjs/common';
import { UnrecoverableError } from 'bullmq';
import { DEFAULT_DELIVERY_PROFILE, parseRecipe, type Recipe, type RenderParams } from '@psiform/contracts';
import { preflightReport } from '@psiform/print';
import { encodeTiff, rasterSubject, softProofPng, tiffFacts } from '../export/print-files';
import { altOf, figureWords } from '../export/figure-words';
import {
  AssetStore,
  CONTENT_TYPES,
  ENGINE_VERSION,
  FigureSetsStore,
  FiguresStore,
  ObjectStorage,
  exportKey,
  sha256Hex,
  type NewAsset,
  type TrackedJobHandler,
  type TrackedOutcome,
  type TrackedRun,
} from '@psiform/server';
import type { FigureRenderer } from './figure-renderer';
import { EXPORT_PROGRESS, ensureMesh, versionOf, type TrackedJob } from './tracked-job';
import { printGlb } from '../mesh/mesh-assets';

/**
 * Render jobs (QUEUES.render): a print PNG of the figure's current version, or its thumbnail after a mesh job.
 * Stages: [meshing, when the version has no mesh yet] -> rendering (headless Chromium, render.html) -> encoding
 * (finishPng + checks) -> storing -> done. The PNG is keyed by its own sha256 (renders need not be bit-identical
 * across page builds), so an identical re-render reuses object and row.
 */
@Injectable()
export class RenderJobProcessor implements TrackedJobHandler<'render'> {
  readonly kind = 'tracked';
  readonly name = 'render';
  readonly progress = EXPORT_PROGRESS;
  /** Software rendering uses every core: one render at a time per worker process. */
  readonly concurrency = 1;
  private readonly log = new Logger('RenderJob');

  constructor(
    private readonly assets: AssetStore,
    private readonly storage: ObjectStorage,
    private readonly renderer: FigureRenderer,
    private readonly figures: FiguresStore,
    private readonly engineVersion: string = ENGINE_VERSION,
    private readonly sets?: FigureSetsStore,
  ) {}

  /** The payload (params included) was checked against the job contract by the runner: no cast, no re-check here. */
  async run(t: TrackedRun<'render'>): Promise<TrackedOutcome> {
    const p = t.params;
    if (p.figureSetId) return this.renderSet(t, p);
    if (p.format === 'tiff') return this.renderTiff(t, p);
    const { version, recipe } = versionOf(t.ctx);
    const total = performance.now();
    const mesh = await ensureMesh({ assets: this.assets, storage: this.storage, engineVersion: this.engineVersion }, t, version, recipe);
    // Thumbnails draw the stored mesh; a print finer than it gets surfaces refined to its quarter pixel.
    const print = p.thumbnail ? null : await printGlb(recipe, mesh.stats, { widthPx: p.widthPx, heightPx: p.heightPx }, this.engineVersion);
    await t.stage('rendering');
    const transparent = p.transparent ?? undefined;
    const out = await this.renderer.render({ recipe, glb: print?.glb ?? mesh.glb, widthPx: p.widthPx, heightPx: p.heightPx, dpi: p.dpi, transparent });
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
      // How far the drawn surface may lie from the true one (a0): a quarter pixel, or the stored mesh's tolerance.
      surfaceTolerance: print?.tolerance ?? (mesh.stats.refinement as { tolerance?: number } | null | undefined)?.tolerance ?? null,
      ...(p.thumbnail ? { thumbnail: true } : {}),
      engineVersion: this.engineVersion,
      recipeHash: version.recipeHash,
    };
    const png: NewAsset = { figureVersionId: version.id, publicationId: t.ctx.job.publicationId, kind: 'png', storageKey: stored.key, bytes: stored.bytes, sha256: stored.sha256, stats };
    const timings = { mesh: mesh.meshMs, ...prefixed('render_', out.ms), store: Math.round(performance.now() - ts), total: ms };
    return { timings, assets: [...mesh.newAssets, png] };
  }

  /** After the completion committed: point the figure set or the figure (thumbnail) at the new PNG. */
  async afterComplete(t: TrackedRun<'render'>, assetIds: string[]): Promise<void> {
    const params = t.params;
    const ctx = t.ctx;
    if (params.figureSetId && this.sets && assetIds.length > 0) {
      const pngId = assetIds[assetIds.length - 1];
      await this.sets.setPng(params.figureSetId, pngId).catch((e: Error) => this.log.warn(`figure set ${params.figureSetId}: ${e.message}`));
    }
    if (params.thumbnail && ctx.figure && ctx.version) {
      const pngId = assetIds[assetIds.length - 1];
      const set = await this.figures.setThumbnail(ctx.figure.id, ctx.version.id, pngId).catch((e: Error) => {
        this.log.warn(`thumbnail of figure ${ctx.figure!.id}: ${e.message}`);
        return false;
      });
      if (!set) this.log.log(`thumbnail ${pngId} kept but not shown: figure ${ctx.figure.id} has a newer version`);
    }
  }

  /**
   * A TIFF: the same render (same pixels as the PNG path), written by sharp, read back and preflighted against the
   * delivery profile copied into the job; a CMYK TIFF also gets a soft-proof PNG (its colours back in sRGB).
   */
  private async renderTiff(t: TrackedJob, p: RenderParams): Promise<TrackedOutcome> {
    const { version, recipe } = versionOf(t.ctx);
    const total = performance.now();
    const profile = p.profile ?? DEFAULT_DELIVERY_PROFILE;
    const colour = p.colour ?? profile.colourMode;
    const pressCondition = p.pressCondition ?? profile.pressCondition;
    const mesh = await ensureMesh({ assets: this.assets, storage: this.storage, engineVersion: this.engineVersion }, t, version, recipe);
    // As for PNG: a print finer than the stored mesh gets surfaces refined to its quarter pixel.
    const print = await printGlb(recipe, mesh.stats, { widthPx: p.widthPx, heightPx: p.heightPx }, this.engineVersion);
    await t.stage('rendering');
    const alpha = colour === 'rgb' && p.alpha === true;
    const out = await this.renderer.render({ recipe, glb: print?.glb ?? mesh.glb, widthPx: p.widthPx, heightPx: p.heightPx, dpi: p.dpi, transparent: alpha ? (p.transparent ?? undefined) : false });
    await t.stage('encoding');
    const te = performance.now();
    const bg = recipe.stage.background;
    const tiff = await encodeTiff(out.png, { dpi: p.dpi, colour, pressCondition, alpha, background: bg.transparent ? '#ffffff' : bg.color });
    const read = await tiffFacts(tiff);
    const widthMm = p.widthMm ?? round3((out.widthPx / p.dpi) * 25.4);
    const heightMm = p.heightMm ?? round3((out.heightPx / p.dpi) * 25.4);
    const meta = figureWords(recipe, mesh.stats, version.engineVersion || this.engineVersion, new Date().toISOString());
    const preflight = preflightReport([rasterSubject('figure.tif', 'tiff', read, { widthMm, heightMm, dpi: p.dpi }, recipe, altOf(meta))], profile, meta.generatedAt);
    const proof = colour === 'cmyk' ? await softProofPng(tiff) : null;
    const encodeMs = Math.round(performance.now() - te);
    await t.stage('storing');
    const pub = t.ctx.job.publicationId;
    const stored = await this.assets.storeObject(exportKey(version.recipeHash, sha256Hex(tiff), 'tif'), tiff, CONTENT_TYPES.tiff);
    const stats = {
      widthPx: read.widthPx,
      heightPx: read.heightPx,
      dpi: p.dpi,
      widthMm,
      heightMm,
      colour,
      pressCondition: colour === 'cmyk' ? pressCondition : null,
      icc: read.icc?.description ?? null,
      compression: 'lzw',
      alpha: read.alpha,
      engineVersion: this.engineVersion,
      recipeHash: version.recipeHash,
      preflight,
    };
    const assets: NewAsset[] = [...mesh.newAssets, { figureVersionId: version.id, publicationId: pub, kind: 'tiff', storageKey: stored.key, bytes: stored.bytes, sha256: stored.sha256, stats }];
    if (proof) {
      const sp = await this.assets.storeObject(exportKey(version.recipeHash, sha256Hex(proof), 'png'), proof, CONTENT_TYPES.softproof);
      assets.push({ figureVersionId: version.id, publicationId: pub, kind: 'softproof', storageKey: sp.key, bytes: sp.bytes, sha256: sp.sha256, stats: { widthPx: read.widthPx, heightPx: read.heightPx, pressCondition, of: 'tiff', note: `the CMYK TIFF's colours on ${pressCondition} shown in sRGB` } });
    }
    return { timings: { mesh: mesh.meshMs, ...prefixed('render_', out.ms), tiff: encodeMs, total: Math.round(performance.now() - total) }, assets };
  }

  /**
   * A figure set: every panel's pinned version, meshed first when it has no mesh (the mesh job's own code), drawn by
   * the render page with panels (one camera, one a0-per-pixel scale). The PNG belongs to the set: its asset row has
   * no figure version, stats name the set and its panels; figure_sets.png_asset_id is pointed at it afterwards.
   */
  private async renderSet(t: TrackedJob, p: RenderParams): Promise<TrackedOutcome> {
    if (!this.sets) throw new UnrecoverableError('this worker cannot render figure sets (no figure-set store)');
    const refs = p.panels ?? [];
    if (refs.length === 0) throw new UnrecoverableError(`figure-set job ${t.id} lists no panels`);
    const total = performance.now();
    const versions = await this.sets.versions(refs.map((r) => r.figureVersionId));
    const panels: { recipe: Recipe; glb: Uint8Array; recipeHash: string; figureId: string; figureVersionId: string }[] = [];
    const meshAssets: NewAsset[] = [];
    let meshMs = 0;
    for (const [i, v] of versions.entries()) {
      if (!v) throw new UnrecoverableError(`panel ${i + 1}: figure version ${refs[i].figureVersionId} no longer exists`);
      const parsed = parseRecipe(v.recipe);
      if (!parsed.ok) throw new UnrecoverableError(`panel ${i + 1}: the stored recipe is not valid: ${parsed.issues.map((x) => `${x.path}: ${x.message}`).join('; ')}`);
      const mesh = await ensureMesh({ assets: this.assets, storage: this.storage, engineVersion: this.engineVersion }, t, v, parsed.recipe);
      meshAssets.push(...mesh.newAssets);
      meshMs += mesh.meshMs;
      panels.push({ recipe: parsed.recipe, glb: mesh.glb, recipeHash: v.recipeHash, figureId: refs[i].figureId, figureVersionId: v.id });
    }
    await t.stage('rendering');
    const transparent = p.transparent ?? undefined;
    const out = await this.renderer.render({
      recipe: panels[0].recipe,
      glb: panels[0].glb,
      panels: panels.map((x) => ({ recipe: x.recipe, glb: x.glb })),
      columns: p.columns ?? Math.min(panels.length, 3),
      widthPx: p.widthPx,
      heightPx: p.heightPx,
      dpi: p.dpi,
      transparent,
    });
    await t.stage('encoding');
    await t.stage('storing');
    const ts = performance.now();
    // Content-derived: the panels' recipes in order name the folder, the bytes the file.
    const setHash = sha256Hex(new TextEncoder().encode(panels.map((x) => x.recipeHash).join(',')));
    const stored = await this.assets.storeObject(exportKey(setHash, sha256Hex(out.png), 'png'), out.png, CONTENT_TYPES.png);
    const ms = Math.round(performance.now() - total);
    const stats = {
      figureSetId: p.figureSetId,
      title: p.title,
      columns: p.columns,
      panels: panels.map((x) => ({ figureId: x.figureId, figureVersionId: x.figureVersionId, recipeHash: x.recipeHash })),
      widthPx: out.widthPx,
      heightPx: out.heightPx,
      dpi: p.dpi,
      widthMm: p.widthMm ?? round3((out.widthPx / p.dpi) * 25.4),
      heightMm: p.heightMm ?? round3((out.heightPx / p.dpi) * 25.4),
      transparent: transparent ?? panels[0].recipe.stage.background.transparent,
      ms,
      tiles: out.tiles,
      triangles: out.triangles,
      engineVersion: this.engineVersion,
      model: 'one-electron hydrogen-like model; many-electron orbitals differ',
    };
    const png: NewAsset = { figureVersionId: null, publicationId: t.ctx.job.publicationId, kind: 'png', storageKey: stored.key, bytes: stored.bytes, sha256: stored.sha256, stats };
    const timings = { mesh: meshMs, ...prefixed('render_', out.ms), store: Math.round(performance.now() - ts), total: ms };
    return { timings, assets: [...meshAssets, png] };
  }

}

const round3 = (x: number) => Math.round(x * 1000) / 1000;
const prefixed = (p: string, o: Record<string, number>) => Object.fromEntries(Object.entries(o).map(([k, v]) => [p + k, v]));
