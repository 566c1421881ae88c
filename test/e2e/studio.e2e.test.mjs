// Browser end-to-end for the studio: the demo illustrator composes a 2p_z figure in the Composer, sees both phase
// colours in the live preview, and exports a print PNG (89 × 60 mm at 300 dpi) through the export dialog.
//   PSIFORM_URL=http://127.0.0.1:3000 node --test test/e2e/
// Needs the whole stack including the export job (POST /api/figures/:id/exports and the worker's render
// processor). It fails (never skips) when a part is missing, naming the step and quoting the page.
import assert from 'node:assert/strict';
import { test } from 'node:test';
import { PNG } from 'pngjs';
import { apiGet, browserPerFile, DEMO_ILLUSTRATOR, expectOutcome, expectShown, newPage, signIn } from './browser.mjs';
import { countPhasePixels, pngChunks } from './pixels.mjs';

const browser = browserPerFile();

test('an illustrator composes 2p_z in the studio, sees both phases and exports a 1051 × 709 px PNG at 300 dpi', { timeout: 300_000 }, async () => {
  const { context, page, errors } = await newPage(browser());
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
    assert.match(await page.getByTestId('studio-model').textContent(), /^2pz, Z = 1, one-electron hydrogen-like model; surface encloses 90% of the probability; grid 48³/);
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
    await expectShown(page, 'preview-ready', { errors: ['preview-error', 'viewport-error', 'studio-error'], what: 'The live preview sampling ψ and drawing the surfaces', timeout: 90_000, state: 'attached' });
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
    await expectShown(page, 'export-progress', { errors: ['exp-server-error'], what: 'Queueing the PNG export (POST /api/figures/:id/exports)', timeout: 20_000 });
    await expectShown(page, 'export-ready', { errors: ['export-error', 'export-stream-error', 'export-no-asset'], what: 'The PNG export job completing (GET /api/jobs/:id/events)', timeout: 180_000 });
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
