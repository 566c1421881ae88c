import { existsSync } from 'node:fs';
import { parseRecipe } from '@psiform/contracts';
import { readPngInfo } from '@psiform/print';
import { closeParallelSampler } from '@psiform/orbitals/node';
import { recipeToSurfaces } from '@psiform/meshing';
import { encode } from '../src/mesh/mesh-assets';
import { FigureRenderer } from '../src/render/figure-renderer';
import { HeadlessBrowser } from '../src/render/headless-browser';
import { StaticSite } from '../src/render/static-site';
import { DEFAULT_WEB_DIST } from '@psiform/server';

/** The worker's render path against the real Debian Chromium and the built render page (no other services). */
describe('headless render (e2e)', () => {
  const recipe = (() => {
    const r = parseRecipe({ version: 1, label: '2pz', content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 40 }, surface: { rule: 'enclosed', fraction: 0.9 } });
    if (!r.ok) throw new Error('bad recipe');
    return r.recipe;
  })();
  let glb: Uint8Array;
  const site = new StaticSite(process.env.WEB_DIST || DEFAULT_WEB_DIST);
  const browser = new HeadlessBrowser('/usr/bin/chromium');
  const renderer = new FigureRenderer(browser, site, 60000);

  beforeAll(async () => {
    if (!existsSync('/usr/bin/chromium')) throw new Error('the render tests need /usr/bin/chromium (apt-get install chromium)');
    site.checkBuilt(); // fails with the missing path: build apps/web first
    const r = await recipeToSurfaces(recipe);
    glb = (await encode(r.surfaces.filter((s) => s.mesh.indices.length > 0), recipe, {}, 'test')).glb;
  }, 30000);

  afterAll(async () => {
    await browser.close();
    await site.close();
    closeParallelSampler();
  });

  it('renders 1051 × 709 at 300 dpi (89 × 60 mm) with pHYs 11811 px/m and sRGB; a crashed browser is relaunched', async () => {
    const a = await renderer.render({ recipe, glb, widthPx: 1051, heightPx: 709, dpi: 300 });
    const info = readPngInfo(a.png);
    expect([info.width, info.height, info.pHYs, info.srgb]).toEqual([1051, 709, { x: 11811, y: 11811, unit: 1 }, 0]);
    expect(a.triangles).toBeGreaterThan(100);
    await browser.crashForTest();
    const b = await renderer.render({ recipe, glb, widthPx: 320, heightPx: 240, dpi: 96 });
    expect(readPngInfo(b.png)).toMatchObject({ width: 320, height: 240, pHYs: { x: 3780, y: 3780, unit: 1 } });
    expect(browser.launches).toBe(2);
  }, 90000);

  it("passes the page's own message on, naming the field", async () => {
    await expect(renderer.render({ recipe, glb, widthPx: 0, heightPx: 240, dpi: 96 })).rejects.toThrow(/render page: widthPx must be an integer between 1 and 20000/);
    // The next render gets a fresh page and works.
    const ok = await renderer.render({ recipe, glb, widthPx: 64, heightPx: 48, dpi: 300 });
    expect(readPngInfo(ok.png).width).toBe(64);
  }, 60000);
});
