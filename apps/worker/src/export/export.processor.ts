import { Injectable } from '@nestjs/common';
import { UnrecoverableError } from 'bullmq';
import { DEFAULT_DELIVERY_PROFILE, type ColourMode, type DeliveryProfile, type PressConditionId, type Recipe } from '@psiform/contracts';
import { AssetStore, CONTENT_TYPES, ENGINE_VERSION, ObjectStorage, exportKey, sha256Hex, type NewAsset, type TrackedJobHandler, type TrackedOutcome, type TrackedRun } from '@psiform/server';
import { buildBundle, bundleCompanions, plotAlt, preflightReport, preflightText, type BundleFile, type PreflightSubject } from '@psiform/print';
import { recipeState, screenGlbFromArchival, screenTolerance } from '@psiform/meshing';
import { compileState } from '@psiform/orbitals';
import type { FigureRenderer } from '../render/figure-renderer';
import { EXPORT_PROGRESS, ensureMesh, versionOf, type TrackedJob } from '../render/tracked-job';
import { companionSvg, figureSvg, type SvgParams } from './svg-export';
import { altOf, figureWords } from './figure-words';
import { encodePdf, encodeTiff, pdfSubject, pngFacts, rasterSubject, svgSubject, tiffFacts } from './print-files';

/** The PNG a bundle gets when the version has no print render yet (a single column, common practice). */
export const BUNDLE_DEFAULT_PNG = { widthMm: 89, heightMm: 60, dpi: 300, widthPx: 1051, heightPx: 709 } as const;

interface PrintColour {
  colour?: ColourMode;
  pressCondition?: PressConditionId;
}

/**
 * Export jobs (QUEUES.export): svg (radial plot or section map, Lato embedded), glb/stl (the version's mesh,
 * computed first when missing) and bundle (zip: GLB, STL, PNG, radial plot and section map SVG, recipe.json, metadata.json, README.txt).
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
    const profile = p.profile ?? DEFAULT_DELIVERY_PROFILE;
    if (p.format === 'svg') assets = await this.svg(t, recipe, version.id, version.recipeHash, p, profile);
    else if (p.format === 'pdf') assets = await this.pdf(t, recipe, version.id, version.recipeHash, p, profile);
    else if (p.format === 'glb' || p.format === 'stl') assets = await this.mesh(t, recipe, version, p.format);
    else assets = await this.bundle(t, recipe, version, profile);
    return { timings: { total: Math.round(performance.now() - total) }, assets };
  }

  private async svg(t: TrackedJob, recipe: Recipe, versionId: string, recipeHash: string, p: SvgParams, profile: DeliveryProfile): Promise<NewAsset[]> {
    if (recipe.source?.kind === 'upload') throw new UnrecoverableError('radial plots and section maps need the analytic state; this figure is an uploaded cube');
    await t.stage('encoding');
    const text = companionSvg(recipe, p);
    const svg = new TextEncoder().encode(text);
    const subject = svgSubject(`${p.kind}.svg`, text, p.widthMm, p.heightMm, plotAlt(text));
    const preflight = preflightReport([subject], profile, this.now().toISOString());
    await t.stage('storing');
    const stored = await this.assets.storeObject(exportKey(recipeHash, sha256Hex(svg), 'svg'), svg, CONTENT_TYPES.svg);
    const stats = { svg: p.kind, ...(p.kind === 'section' ? { plane: p.plane, offset: p.offset, levels: p.levels } : {}), widthMm: p.widthMm, heightMm: p.heightMm, fonts: subject.fonts, preflight };
    return [{ figureVersionId: versionId, publicationId: t.ctx.job.publicationId, kind: 'svg', storageKey: stored.key, bytes: stored.bytes, sha256: stored.sha256, stats }];
  }

  /** PDF companion: the same drawing as the SVG, vector, Lato embedded and subset, output intent, tagged. */
  private async pdf(t: TrackedJob, recipe: Recipe, versionId: string, recipeHash: string, p: SvgParams & PrintColour, profile: DeliveryProfile): Promise<NewAsset[]> {
    if (recipe.source?.kind === 'upload') throw new UnrecoverableError('radial plots and section maps need the analytic state; this figure is an uploaded cube');
    await t.stage('encoding');
    const svg = figureSvg(recipe, p, undefined); // pdfkit embeds the fonts itself
    const alt = plotAlt(svg);
    const opts = { svg, widthMm: p.widthMm, heightMm: p.heightMm, title: alt.short, alt: alt.short, colour: p.colour ?? profile.colourMode, pressCondition: p.pressCondition ?? profile.pressCondition };
    const pdf = await encodePdf(opts);
    const subject = pdfSubject(`${p.kind}.pdf`, pdf, opts, alt);
    const preflight = preflightReport([subject], profile, this.now().toISOString());
    await t.stage('storing');
    const stored = await this.assets.storeObject(exportKey(recipeHash, sha256Hex(pdf), 'pdf'), pdf, CONTENT_TYPES.pdf);
    const stats = { pdf: p.kind, ...(p.kind === 'section' ? { plane: p.plane, offset: p.offset, levels: p.levels } : {}), widthMm: p.widthMm, heightMm: p.heightMm, colour: opts.colour, pressCondition: opts.colour === 'cmyk' ? opts.pressCondition : null, fonts: subject.fonts, preflight };
    return [{ figureVersionId: versionId, publicationId: t.ctx.job.publicationId, kind: 'pdf', storageKey: stored.key, bytes: stored.bytes, sha256: stored.sha256, stats }];
  }

  private async mesh(t: TrackedJob, recipe: Recipe, version: NonNullable<TrackedJob['ctx']['version']>, kind: 'glb' | 'stl'): Promise<NewAsset[]> {
    const mesh = await ensureMesh(this.deps(), t, version, recipe);
    await t.stage('storing');
    if (mesh.newAssets.length) return [...mesh.newAssets].sort((a, b) => (a.kind === kind ? -1 : b.kind === kind ? 1 : 0));
    return [mesh.existing[kind]!];
  }

  private async bundle(t: TrackedJob, recipe: Recipe, version: NonNullable<TrackedJob['ctx']['version']>, profile: DeliveryProfile): Promise<NewAsset[]> {
    const mesh = await ensureMesh(this.deps(), t, version, recipe);
    const out: NewAsset[] = [...mesh.newAssets];
    const pub = t.ctx.job.publicationId;
    // The latest print render of this version (thumbnails excluded), else a default one rendered now.
    const pngRow = [...(await this.assets.findForVersion(version.id))].reverse().find((a) => a.kind === 'png' && !(a.stats as { thumbnail?: boolean } | null)?.thumbnail);
    let png: Uint8Array;
    const pngStats = pngRow?.stats as { widthMm?: number; heightMm?: number; dpi?: number } | null | undefined;
    let pngSize = { widthMm: pngStats?.widthMm ?? BUNDLE_DEFAULT_PNG.widthMm, heightMm: pngStats?.heightMm ?? BUNDLE_DEFAULT_PNG.heightMm, dpi: pngStats?.dpi ?? BUNDLE_DEFAULT_PNG.dpi };
    if (pngRow) png = await this.storage.get(pngRow.storageKey);
    else {
      if (!this.renderer) throw new Error('this worker cannot render (no browser configured) and the figure has no PNG yet');
      await t.stage('rendering');
      const d = BUNDLE_DEFAULT_PNG;
      const r = await this.renderer.render({ recipe, glb: mesh.glb, widthPx: d.widthPx, heightPx: d.heightPx, dpi: d.dpi });
      png = r.png;
      pngSize = { widthMm: d.widthMm, heightMm: d.heightMm, dpi: d.dpi };
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
    const meta = figureWords(recipe, mesh.stats, version.engineVersion || this.engineVersion, this.now().toISOString());
    const alt = altOf(meta);
    // Print files per the delivery profile: the figure as the profile's first raster format (TIFF in its colour),
    // the radial plot and the section map (bundleCompanions) as its first vector format; each is preflighted and the report travels in the bundle.
    const subjects: PreflightSubject[] = [rasterSubject('figure.png', 'png', pngFacts(png), pngSize, recipe, alt)];
    if (profile.rasterFormats[0] === 'tiff') {
      const bg = recipe.stage.background;
      const tiff = await encodeTiff(png, { dpi: pngSize.dpi, colour: profile.colourMode, pressCondition: profile.pressCondition, alpha: false, background: bg.transparent ? '#ffffff' : bg.color });
      files.push({ name: 'figure.tif', bytes: tiff });
      subjects.push(rasterSubject('figure.tif', 'tiff', await tiffFacts(tiff), pngSize, recipe, alt));
    }
    if (recipe.source?.kind !== 'upload') {
      files.push({ name: 'figure-screen.glb', bytes: await screenGlb(recipe, mesh.glb, mesh.stats, version.engineVersion || this.engineVersion) });
      for (const svgParams of bundleCompanions(recipe)) {
        const svgText = companionSvg(recipe, svgParams);
        files.push({ name: `${svgParams.kind}.svg`, bytes: new TextEncoder().encode(svgText) });
        subjects.push(svgSubject(`${svgParams.kind}.svg`, svgText, svgParams.widthMm, svgParams.heightMm, plotAlt(svgText)));
        if (profile.vectorFormats.includes('pdf')) {
          const plain = figureSvg(recipe, svgParams, undefined);
          const palt = plotAlt(plain);
          const opts = { svg: plain, widthMm: svgParams.widthMm, heightMm: svgParams.heightMm, title: palt.short, alt: palt.short, colour: profile.colourMode, pressCondition: profile.pressCondition };
          const pdf = await encodePdf(opts);
          files.push({ name: `${svgParams.kind}.pdf`, bytes: pdf });
          subjects.push(pdfSubject(`${svgParams.kind}.pdf`, pdf, opts, palt));
        }
      }
    }
    const preflight = preflightReport(subjects, profile, meta.generatedAt);
    files.push({ name: 'preflight.json', bytes: new TextEncoder().encode(JSON.stringify(preflight, null, 2) + '\n') });
    files.push({ name: 'PREFLIGHT.txt', bytes: new TextEncoder().encode(preflightText(preflight)) });
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
      stats: { files: [...files.map((f) => f.name), 'recipe.json', 'metadata.json', 'README.txt'], generatedAt: meta.generatedAt, preflight },
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
