const { StaticSite } = require('/work/main/apps/worker/dist/render/static-site');
const { HeadlessBrowser } = require('/work/main/apps/worker/dist/render/headless-browser');
const { FigureRenderer } = require('/work/main/apps/worker/dist/render/figure-renderer');
const { sampleComputed, threshold, extract, encode } = require('/work/main/apps/worker/dist/mesh/mesh-pipeline');
const { parseRecipe } = require('@psiform/contracts');
const { readPngInfo } = require('@psiform/print');
const fs = require('fs');
(async () => {
  const recipe = parseRecipe({ version: 1, label: '2pz', content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 64 }, surface: { rule: 'enclosed', fraction: 0.9 } }).recipe;
  const field = await sampleComputed(recipe);
  const t = threshold(field, recipe.surface);
  const s = extract(field, t);
  const { glb } = await encode(s, recipe, {}, 'x');
  const site = new StaticSite('/work/main/apps/web/dist');
  const b = new HeadlessBrowser('/usr/bin/chromium');
  const r = new FigureRenderer(b, site);
  for (const [w, h, dpi] of [[1051, 709, 300], [320, 240, 96], [4252, 2835, 600]]) {
    const t0 = Date.now();
    try {
      const out = await r.render({ recipe, glb, widthPx: w, heightPx: h, dpi });
      console.log(w, h, Date.now() - t0, 'ms', JSON.stringify(out.ms), out.tiles, out.png.length, JSON.stringify(readPngInfo(out.png).pHYs));
      fs.writeFileSync(`/tmp/psiform/studio-export/out-${w}.png`, out.png);
    } catch (e) { console.log('ERR', e.message); }
  }
  await b.close(); await site.close();
  require('@psiform/orbitals/node').closeParallelSampler?.();
})();
