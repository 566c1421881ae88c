// Browser end-to-end: the demo illustrator creates a 2p_z figure through the form, computes its mesh, and the
// viewport shows both phase colours. Needs the whole stack (api, worker, storage):
//   PSIFORM_URL=http://127.0.0.1:3000 node --test test/e2e/
// It fails (never skips) when a part is missing, naming the step that did not happen.
// Software WebGL draws only a few frames a second, so nothing here depends on frame rate: the page sets
// data-testid="viewport-ready" once the GLB is in the scene and a frame of it has been drawn.
import assert from 'node:assert/strict';
import { test } from 'node:test';
import { PNG } from 'pngjs';
import { apiGet, browserPerFile, DEMO_ILLUSTRATOR, expectOutcome, expectShown, newPage, signIn } from './browser.mjs';
import { countPhasePixels } from './pixels.mjs';

const browser = browserPerFile();

test('an illustrator creates a 2p_z figure, computes its mesh and sees both phase colours', { timeout: 240_000 }, async () => {
  const { context, page, errors } = await newPage(browser());
  try {
    const session = await signIn(page, DEMO_ILLUSTRATOR);
    const title = `E2E 2p_z ${new Date().toISOString()} ${Math.random().toString(36).slice(2, 8)}`;

    // Library -> New figure.
    await page.getByTestId('nav-library').click();
    await page.getByTestId('library-page').waitFor();
    await expectShown(page, 'library-new-figure', { errors: ['publications-error', 'publications-empty'], what: 'The library offering "New figure"', timeout: 20_000, state: 'visible' });
    // "New figure" opens the one Composer for this publication.
    await page.getByTestId('library-new-figure').click();
    await page.getByTestId('studio-page').waitFor();
    assert.match(new URL(page.url()).pathname, /^\/composer$/);

    await page.getByTestId('studio-title').fill(title);
    await page.getByTestId('cmp-mode-label').click();
    await page.getByTestId('cmp-label').fill('2pz');
    await page.getByTestId('cmp-grid').fill('48');
    await page.getByTestId('cmp-fraction').fill('90');
    assert.match(await page.getByTestId('cmp-memory').textContent(), /^48³ × 4 bytes × 1 = 442\.4 kB/);
    assert.equal(await page.getByTestId('studio-save').isEnabled(), true, 'the Composer accepts a 2p_z on a 48³ grid');
    await page.getByTestId('studio-save').click();

    await expectOutcome(page, {
      ok: () => page.waitForURL(/\/figures\/[^/?]+\/studio$/, { timeout: 30_000 }),
      errors: ['studio-server-error', 'studio-recipe-issues'],
      what: 'Creating the figure (POST /api/figures)',
      timeout: 30_000,
    });
    await page.getByTestId('studio-figure-link').click();
    await page.waitForURL(/\/figures\/[^/?]+$/, { timeout: 30_000 });
    const figureId = decodeURIComponent(new URL(page.url()).pathname.split('/').pop());
    await expectOutcome(page, {
      ok: () => page.getByTestId('figure-page').waitFor({ timeout: 20_000 }),
      errors: ['figure-error'],
      what: `Opening the new figure ${figureId} (GET /api/figures/:id)`,
      timeout: 20_000,
    });
    assert.equal((await page.getByTestId('figure-title').textContent())?.trim(), title);
    const model = await page.getByTestId('figure-model').textContent();
    // 2p with a typeset subscript z (textContent joins the runs).
    assert.match(model, /^2pz, Z = 1, one-electron hydrogen-like model; surface encloses 90% of the probability; grid 48³/);
    assert.match(model, /many-electron orbitals differ/);

    // What the server stored: the recipe it validated, with the palette the viewport must use.
    const stored = await apiGet(`/api/figures/${encodeURIComponent(figureId)}`, session.accessToken);
    assert.equal(stored.title, title);
    assert.equal(stored.currentVersion.recipe.grid.n, 48);
    assert.deepEqual(
      stored.currentVersion.recipe.content.terms.map(({ n, l, m, basis }) => ({ n, l, m, basis })),
      [{ n: 2, l: 1, m: 0, basis: 'real' }],
    );
    const { positive, negative } = stored.currentVersion.recipe.palette;

    // Compute the mesh and follow the job to the end.
    await page.getByTestId('compute-mesh').click();
    await expectShown(page, 'job-progress', { errors: ['compute-error'], what: 'Queueing the mesh job (POST /api/figures/:id/meshes)', timeout: 20_000 });
    await expectOutcome(page, {
      ok: () => page.locator('[data-testid="job-progress"][data-state="completed"]').waitFor({ timeout: 120_000 }),
      errors: ['job-error', 'job-stream-error'],
      what: 'The mesh job completing (GET /api/jobs/:id/events)',
      timeout: 120_000,
    });
    assert.equal(await page.getByTestId('job-progress-bar').getAttribute('aria-valuenow'), '100');

    // The finished mesh: statistics per phase, downloads, and the viewport.
    await expectShown(page, 'mesh-stats', { errors: ['viewport-error'], what: 'The mesh statistics appearing after completion', timeout: 30_000 });
    const phases = await page.getByTestId('mesh-stats-row').locator('td:first-child').allTextContents();
    assert.deepEqual(phases, ['ψ > 0 (phase +)', 'ψ < 0 (phase −)'], 'a real 2p_z has one surface per sign');
    assert.equal(await page.getByTestId('download-glb').isVisible(), true);

    await expectShown(page, 'viewport-ready', { errors: ['viewport-error'], what: 'The viewport loading the GLB and drawing a frame', timeout: 90_000, state: 'attached' });

    const canvas = page.getByTestId('figure-viewport').locator('canvas');
    const png = PNG.sync.read(await canvas.screenshot({ timeout: 30_000 }));
    const { counts, total } = countPhasePixels(png, [positive, negative]);
    const [pos, neg] = counts;
    const share = (x) => `${((100 * x) / total).toFixed(1)}%`;
    const report = `positive ${positive}: ${pos} px (${share(pos)}), negative ${negative}: ${neg} px (${share(neg)}) of ${png.width}×${png.height}`;
    // Each lobe of a 2p_z at 90% enclosed fills a good part of a fitted view; 0.5% each is a floor well below that.
    assert.ok(pos > total * 0.005, `the positive phase colour is visible (${report})`);
    assert.ok(neg > total * 0.005, `the negative phase colour is visible (${report})`);
    // The two lobes are mirror images seen from slightly above: comparable areas, not one colour only.
    assert.ok(pos / neg > 0.25 && pos / neg < 4, `both lobes are drawn at comparable size (${report})`);

    assert.deepEqual(errors.map(String), [], 'no uncaught errors in the page');
  } finally {
    await context.close();
  }
});
