// Browser end-to-end for the studio: the demo illustrator composes a 2p_z figure in the Composer, sees both phase
// colours in the live preview, and exports a print PNG (89 × 60 mm at 300 dpi) through the export dialog.
//   PSIFORM_URL=http://127.0.0.1:3000 node --test test/e2e/
// Needs the whole stack including the export job (POST /api/figures/:id/exports and the worker's render
// processor). It fails (never skips) when a part is missing, naming the step and quoting the page.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { PNG } from 'pngjs';
import { apiGet, baseUrl, DEMO_ILLUSTRATOR, launchBrowser, newPage, signIn } from './browser.mjs';

let launched;
before(async () => {
  baseUrl();
  launched = await launchBrowser();
});
after(async () => {
  await launched?.close();
});

function hexRgb(hex) {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) throw new Error(`not a #rrggbb colour: ${hex}`);
  return [parseInt(m[1], 16), parseInt(m[2], 16), parseInt(m[3], 16)];
}

/** HSV with hue in degrees (the usual hexcone model, common practice); as in figure-mesh.e2e.test.mjs. */
function hsv([r, g, b]) {
  const R = r / 255, G = g / 255, B = b / 255;
  const max = Math.max(R, G, B), min = Math.min(R, G, B), d = max - min;
  let h = 0;
  if (d > 0) {
    if (max === R) h = 60 * (((G - B) / d) % 6);
    else if (max === G) h = 60 * ((B - R) / d + 2);
    else h = 60 * ((R - G) / d + 4);
  }
  if (h < 0) h += 360;
  return { h, s: max === 0 ? 0 : d / max, v: max };
}
const hueDistance = (a, b) => {
  const d = Math.abs(a - b) % 360;
  return d > 180 ? 360 - d : d;
};
// Same tolerances as the figure page test (our choice, common practice for such checks).
function countPhasePixels(png, colours) {
  const targets = colours.map((c) => hsv(hexRgb(c)));
  const counts = colours.map(() => 0);
  for (let i = 0; i < png.width * png.height; i++) {
    if (png.data[4 * i + 3] === 0) continue;
    const p = hsv([png.data[4 * i], png.data[4 * i + 1], png.data[4 * i + 2]]);
    if (p.s < 0.25 || p.v < 0.12) continue;
    targets.forEach((t, k) => {
      if (hueDistance(p.h, t.h) <= 20) counts[k] += 1;
    });
  }
  return { counts, total: png.width * png.height };
}

/** PNG chunks (PNG specification §5.3): length, type, data; IHDR first. */
function pngChunks(buf) {
  const sig = [137, 80, 78, 71, 13, 10, 26, 10];
  assert.deepEqual([...buf.subarray(0, 8)], sig, 'the file starts with the PNG signature');
  const chunks = [];
  let off = 8;
  while (off + 8 <= buf.length) {
    const len = buf.readUInt32BE(off);
    const type = buf.toString('ascii', off + 4, off + 8);
    chunks.push({ type, data: buf.subarray(off + 8, off + 8 + len) });
    off += 12 + len;
    if (type === 'IEND') break;
  }
  return chunks;
}

async function expectOutcome(page, { ok, errors, what, timeout }) {
  const okPromise = ok().then(() => ({ ok: true }));
  const errPromises = errors.map((id) =>
    page
      .getByTestId(id)
      .first()
      .waitFor({ state: 'visible', timeout })
      .then(async () => ({ ok: false, id, text: (await page.getByTestId(id).first().textContent())?.trim() })),
  );
  let result;
  try {
    result = await Promise.any([okPromise, ...errPromises]);
  } catch (err) {
    const reasons = err instanceof AggregateError ? err.errors.map((e) => e.message.split('\n')[0]) : [String(err)];
    throw new Error(`${what} did not happen within ${timeout / 1000} s (${reasons[0]})`, { cause: err });
  }
  if (!result.ok) throw new Error(`${what} failed; the page says (${result.id}): ${result.text}`);
}

test('an illustrator composes 2p_z in the studio, sees both phases and exports a 1051 × 709 px PNG at 300 dpi', { timeout: 300_000 }, async () => {
  const { context, page, errors } = await newPage(launched.browser);
  try {
    const session = await signIn(page, DEMO_ILLUSTRATOR);
    const title = `E2E studio 2p_z ${new Date().toISOString()} ${Math.random().toString(36).slice(2, 8)}`;

    await page.getByTestId('nav-composer').click();
    await page.getByTestId('studio-page').waitFor();
    await page.getByTestId('studio-title').fill(title);
    await page.getByTestId('cmp-mode-label').click();
    await page.getByTestId('cmp-label').fill('2pz');
    await page.getByTestId('cmp-grid').fill('48');
    await page.getByTestId('cmp-fraction').fill('90');
    assert.match(await page.getByTestId('studio-model').textContent(), /^2p_z, Z = 1, one-electron hydrogen-like model; surface encloses 90% of the probability; grid 48³/);
    await page.getByTestId('studio-save').click();
    await expectOutcome(page, {
      ok: () => page.waitForURL(/\/figures\/[^/]+\/studio$/, { timeout: 30_000 }),
      errors: ['studio-server-error', 'studio-recipe-issues'],
      what: 'Creating the figure from the Composer (POST /api/figures)',
      timeout: 30_000,
    });
    const figureId = decodeURIComponent(new URL(page.url()).pathname.split('/')[2]);
    const stored = await apiGet(`/api/figures/${encodeURIComponent(figureId)}`, session.accessToken);
    assert.equal(stored.title, title);
    assert.equal(stored.currentVersion.recipe.grid.n, 48);
    const { positive, negative } = stored.currentVersion.recipe.palette;

    // The live preview (Web Worker) and a drawn frame.
    await expectOutcome(page, {
      ok: () => page.getByTestId('preview-ready').waitFor({ state: 'attached', timeout: 90_000 }),
      errors: ['preview-error', 'viewport-error', 'studio-error'],
      what: 'The live preview sampling ψ and drawing the surfaces',
      timeout: 90_000,
    });
    await page.getByTestId('figure-canvas').waitFor({ timeout: 30_000 });
    await page.waitForTimeout(1500); // software WebGL: let a frame of the new geometry land
    const canvas = page.getByTestId('figure-canvas').locator('canvas:not(.pf-overlay)');
    const shot = PNG.sync.read(await canvas.screenshot({ timeout: 30_000 }));
    const { counts: [pos, neg], total } = countPhasePixels(shot, [positive, negative]);
    const report = `positive ${pos} px, negative ${neg} px of ${shot.width}×${shot.height}`;
    assert.ok(pos > total * 0.005, `the positive phase colour is visible in the studio (${report})`);
    assert.ok(neg > total * 0.005, `the negative phase colour is visible in the studio (${report})`);
    assert.ok(pos / neg > 0.25 && pos / neg < 4, `both lobes are drawn at comparable size (${report})`);

    // Export through the dialog.
    await page.getByTestId('studio-export').click();
    await page.getByTestId('export-form').waitFor();
    await page.getByTestId('exp-format').selectOption('png');
    await page.getByTestId('exp-unit-mm').click();
    await page.getByTestId('exp-width').fill('89');
    await page.getByTestId('exp-height').fill('60');
    await page.getByTestId('exp-dpi').selectOption('300');
    assert.match(await page.getByTestId('exp-pixels').textContent(), /^1051 × 709 px/);
    await page.getByTestId('exp-submit').click();
    await expectOutcome(page, {
      ok: () => page.getByTestId('export-progress').waitFor({ timeout: 20_000 }),
      errors: ['exp-server-error'],
      what: 'Queueing the PNG export (POST /api/figures/:id/exports)',
      timeout: 20_000,
    });
    await expectOutcome(page, {
      ok: () => page.getByTestId('export-ready').waitFor({ timeout: 180_000 }),
      errors: ['export-error', 'export-stream-error', 'export-no-asset'],
      what: 'The PNG export job completing (GET /api/jobs/:id/events)',
      timeout: 180_000,
    });
    const link = page.getByTestId('export-ready').getByTestId('export-download').first();
    assert.equal(await link.getAttribute('data-kind'), 'png');
    const assetId = await link.getAttribute('data-asset-id');
    const { url } = await apiGet(`/api/assets/${encodeURIComponent(assetId)}/link`, session.accessToken);
    const res = await fetch(url);
    assert.equal(res.ok, true, `downloading the PNG answered ${res.status}`);
    const buf = Buffer.from(await res.arrayBuffer());
    const chunks = pngChunks(buf);
    const ihdr = chunks.find((c) => c.type === 'IHDR');
    assert.ok(ihdr, 'the PNG has an IHDR chunk');
    // 89 mm / 25.4 × 300 = 1051.18 -> 1051; 60 mm -> 708.66 -> 709 (round to nearest).
    assert.equal(ihdr.data.readUInt32BE(0), 1051, 'PNG width in pixels');
    assert.equal(ihdr.data.readUInt32BE(4), 709, 'PNG height in pixels');
    const phys = chunks.find((c) => c.type === 'pHYs');
    assert.ok(phys, 'the PNG has a pHYs chunk');
    // PNG specification §11.3.5.3: pixels per unit x, y and unit 1 = metre; 300 / 0.0254 = 11811.02 -> 11811.
    assert.equal(phys.data.readUInt32BE(0), 11811, 'pHYs x in pixels per metre');
    assert.equal(phys.data.readUInt32BE(4), 11811, 'pHYs y in pixels per metre');
    assert.equal(phys.data[8], 1, 'pHYs unit is the metre');
    const image = PNG.sync.read(buf);
    const exported = countPhasePixels(image, [positive, negative]);
    assert.ok(exported.counts.every((c) => c > exported.total * 0.005), `both phase colours are in the export (${exported.counts.join(' / ')})`);

    assert.deepEqual(errors.map(String), [], 'no uncaught errors in the page');
  } finally {
    await context.close();
  }
});
