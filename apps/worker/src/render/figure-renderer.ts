import type { Recipe, RenderPageResult } from '@psiform/contracts';
import { finishPng, pixelsPerMetre, readPngInfo } from '@psiform/print';
import type { HeadlessBrowser } from './headless-browser';
import type { StaticSite } from './static-site';

/** What the worker asks of apps/web/render.html (see apps/web/src/render/CONTRACT.md, the page's contract). */
export interface RenderRequest {
  recipe: Recipe;
  /** GLB bytes of the figure's mesh; served to the page from the worker's own origin. */
  glb: Uint8Array;
  widthPx: number;
  heightPx: number;
  dpi: number;
  transparent?: boolean;
  /** Render-target side limit the page tiles with (planTiles); the page's default when absent. */
  maxTile?: number;
  /**
   * A figure set: panels drawn in a grid with one camera and one length scale (recipe/glb above are then not sent;
   * the first panel's recipe gives the shared stage). CONTRACT.md "Panels".
   */
  panels?: { recipe: Recipe; glb: Uint8Array; label?: string }[];
  columns?: number;
}

/** What the page answers (the render page contract, libs/contracts exports.ts). */
type PageResult = RenderPageResult;

export interface RenderOutput {
  /** Checked PNG: exactly widthPx × heightPx, pHYs = dpi in pixels per metre on both axes, sRGB chunk. */
  png: Uint8Array;
  widthPx: number;
  heightPx: number;
  tiles: number;
  triangles: number;
  ms: { page: number; load: number; render: number; encode: number; finish: number; total: number };
}

const round1 = (x: number) => Math.round(x * 10) / 10;

declare const window: {
  psiformRenderReady?: boolean;
  psiformRenderError?: string;
  psiformRender(req: unknown): Promise<PageResult>;
};

/**
 * Draws a figure in the headless browser through the render page and checks the PNG it returns. The page encodes
 * with pHYs and sRGB already; finishPng stamps them again so the file is right whatever the page did, and
 * readPngInfo then verifies size, pHYs and sRGB: a wrong image fails the job instead of being stored.
 */
export class FigureRenderer {
  constructor(
    private readonly browser: HeadlessBrowser,
    private readonly site: StaticSite,
    private readonly timeoutMs = 120000,
  ) {}

  async render(req: RenderRequest): Promise<RenderOutput> {
    this.site.checkBuilt();
    const t0 = performance.now();
    // One after another: the first addBlob starts the site, concurrent ones would race it.
    const blobs: { url: string; remove: () => void }[] = [];
    for (const glb of req.panels ? req.panels.map((p) => p.glb) : [req.glb]) blobs.push(await this.site.addBlob(glb, 'model/gltf-binary'));
    let pageMs = 0;
    let result: PageResult;
    try {
      result = await this.browser.withPage(async (page, fresh) => {
        if (fresh) {
          const tp = performance.now();
          await page.goto(await this.site.url('/render.html'), { waitUntil: 'load', timeout: 30000 });
          await page
            .waitForFunction(() => window.psiformRenderReady === true || typeof window.psiformRenderError === 'string', null, { timeout: 30000 })
            .catch(() => {
              throw new Error('the render page did not become ready within 30 s');
            });
          const startError = await page.evaluate(() => window.psiformRenderError ?? null);
          if (startError) throw new Error(`the render page could not start: ${startError}`);
          pageMs = performance.now() - tp;
        }
        const common = { widthPx: req.widthPx, heightPx: req.heightPx, dpi: req.dpi, transparent: req.transparent, ...(req.maxTile ? { maxTile: req.maxTile } : {}) };
        const pageReq = req.panels
          ? { ...common, columns: req.columns, panels: req.panels.map((p, i) => ({ recipe: p.recipe, glbUrl: blobs[i].url, ...(p.label ? { label: p.label } : {}) })) }
          : { ...common, recipe: req.recipe, glbUrl: blobs[0].url };
        return withTimeout(
          page.evaluate((r) => window.psiformRender(r), pageReq),
          this.timeoutMs,
          `the render page took longer than ${this.timeoutMs} ms (RENDER_TIMEOUT_MS)`,
        );
      });
    } catch (err) {
      throw new Error(pageMessage(err), { cause: err });
    } finally {
      for (const b of blobs) b.remove();
    }
    const tf = performance.now();
    const raw = Buffer.from(result.pngBase64, 'base64');
    const png = finishPng(new Uint8Array(raw.buffer, raw.byteOffset, raw.byteLength), { dpi: req.dpi });
    checkPng(png, req.widthPx, req.heightPx, req.dpi);
    const finish = performance.now() - tf;
    return {
      png,
      widthPx: req.widthPx,
      heightPx: req.heightPx,
      tiles: result.tiles,
      triangles: result.triangles,
      ms: { page: round1(pageMs), load: round1(result.ms.load), render: round1(result.ms.render), encode: round1(result.ms.encode), finish: round1(finish), total: round1(performance.now() - t0) },
    };
  }
}

/** Throws unless the PNG is width × height with pHYs = dpi (pixels per metre, both axes, unit metre) and an sRGB chunk. */
export function checkPng(png: Uint8Array, width: number, height: number, dpi: number): void {
  const info = readPngInfo(png);
  const ppm = pixelsPerMetre(dpi);
  const problems: string[] = [];
  if (info.width !== width || info.height !== height) problems.push(`size ${info.width} × ${info.height} px, expected ${width} × ${height}`);
  if (!info.pHYs || info.pHYs.x !== ppm || info.pHYs.y !== ppm || info.pHYs.unit !== 1) problems.push(`pHYs ${JSON.stringify(info.pHYs ?? null)}, expected ${ppm} px/m on both axes`);
  if (info.srgb === undefined) problems.push('no sRGB chunk');
  if (!info.crcOk) problems.push('a chunk fails its CRC');
  if (problems.length) throw new Error(`the rendered PNG is wrong: ${problems.join('; ')}`);
}

/** "page.evaluate: Error: widthPx must be ..." -> "render page: widthPx must be ..." (first line only). */
function pageMessage(err: unknown): string {
  const msg = (err as Error)?.message ?? String(err);
  const line = msg.split('\n')[0].replace(/^page\.evaluate:\s*/, '').replace(/^Error:\s*/, '');
  return line.startsWith('the render page') || line.startsWith('could not start') ? line : `render page: ${line}`;
}

function withTimeout<T>(p: Promise<T>, ms: number, message: string): Promise<T> {
  let t: NodeJS.Timeout;
  return Promise.race([p, new Promise<never>((_, reject) => (t = setTimeout(() => reject(new Error(message)), ms)))]).finally(() => clearTimeout(t));
}
