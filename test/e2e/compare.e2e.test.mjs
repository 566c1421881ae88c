// Browser end-to-end for review that compares: the demo illustrator makes version 1 and version 2 of a figure (key
// light 2.2 → 2.7, surface 90% → 95%) and submits it; the demo editor filters the review desk to the publication,
// opens the proof, compares version 1 with version 2 and reads the changes in words; renders version 2 at print size
// from the comparison; sees both side by side, under the slider and blinking; the proof states its print size, dpi
// and colour mode and zooms to 1:1 print pixels. Needs the worker and Chromium for the renders.
import assert from 'node:assert/strict';
import { test } from 'node:test';
import { apiCall, apiLogin, browserPerFile, DEMO_EDITOR, DEMO_ILLUSTRATOR, expectOutcome, newPage, QUICK_2PZ_RECIPE, signIn } from './browser.mjs';

const browser = browserPerFile();

async function waitForJob(token, jobId, what) {
  const t0 = Date.now();
  for (;;) {
    const { body: job } = await apiCall(`Following ${what}`, 'GET', `/api/jobs/${jobId}`, { token });
    if (job.state === 'completed') return job;
    if (job.state === 'failed') throw new Error(`${what} failed: ${job.error}`);
    if (Date.now() - t0 > 150_000) throw new Error(`${what} did not finish within 150 s (state ${job.state}, stage ${job.stage})`);
    await new Promise((r) => setTimeout(r, 500));
  }
}

test('an editor compares version 1 and version 2 of a proof and sees the changes listed in words', { timeout: 400_000 }, async () => {
  const illustrator = await apiLogin(DEMO_ILLUSTRATOR);
  const { body: pubs } = await apiCall('Listing the illustrator’s publications', 'GET', '/api/publications', { token: illustrator });
  const pub = pubs[0];
  const title = `E2E compare ${Math.random().toString(36).slice(2, 8)}`;
  // A small canvas (30 × 20 mm at 300 dpi = 354 × 236 px) and grid keep the two renders quick.
  const v1 = { ...QUICK_2PZ_RECIPE, canvas: { widthMm: 30, heightMm: 20, dpi: 300 } };
  const { body: created } = await apiCall('Creating version 1', 'POST', '/api/figures', { token: illustrator, body: { publicationId: pub.id, title, recipe: v1 } });
  const figureId = created.id;
  // The house palette (if the publication pins one) is applied by the server on every save, so only these two change.
  const v2 = { ...created.currentVersion.recipe, surface: { rule: 'enclosed', fraction: 0.95 }, stage: { ...created.currentVersion.recipe.stage, lights: { ...created.currentVersion.recipe.stage.lights, key: { ...created.currentVersion.recipe.stage.lights.key, intensity: 2.7 } } } };
  const { body: patched } = await apiCall('Saving version 2', 'PATCH', `/api/figures/${figureId}`, { token: illustrator, body: { recipe: v2 } });
  assert.equal(patched.currentVersion.number, 2);
  await apiCall('Submitting for review', 'POST', `/api/figures/${figureId}/submit`, { token: illustrator });
  const editor = await apiLogin(DEMO_EDITOR);
  const { body: r1 } = await apiCall('Rendering version 1 at print size', 'POST', `/api/figures/${figureId}/versions/1/render`, { token: editor });
  await waitForJob(editor, r1.jobId, 'the render of version 1');

  const { context, page, errors } = await newPage(browser());
  try {
    await signIn(page, DEMO_EDITOR);
    await page.getByTestId('nav-review').click();
    await page.getByTestId('desk-filter-publication').selectOption(pub.id);
    await page.waitForURL(/publication=/);
    const row = page.getByTestId('desk-row').filter({ hasText: title });
    await row.waitFor({ timeout: 20_000 });
    await row.getByTestId('desk-title').click();
    await page.getByTestId('proof-page').waitFor();

    // The comparison defaults to version 1 → version 2 and lists the changes in words.
    const panel = page.getByTestId('compare-panel');
    await panel.waitFor();
    assert.equal(await panel.getByTestId('compare-from').inputValue(), '1');
    assert.equal(await panel.getByTestId('compare-to').inputValue(), '2');
    await panel.getByTestId('compare-change').first().waitFor();
    assert.deepEqual(await panel.getByTestId('compare-change').allTextContents(), ['surface 90% → 95%', 'key light 2.2 → 2.7']);

    // Version 1 has its render; version 2 is rendered from the comparison.
    await panel.getByTestId('compare-img-a').waitFor();
    await panel.getByTestId('compare-render-b').click();
    await expectOutcome(page, { ok: () => panel.getByTestId('compare-img-b').waitFor({ timeout: 180_000 }), errors: ['job-error', 'job-stream-error'], what: 'the render of version 2', timeout: 180_000 });
    // The element can be in the page before its image has loaded (a loaded machine): wait for both to load.
    await page.waitForFunction(
      () =>
        ['compare-img-a', 'compare-img-b'].every((id) => {
          const img = document.querySelector(`[data-testid=${id}]`);
          return img && img.complete && img.naturalWidth > 0;
        }),
      null,
      { timeout: 60_000 },
    );
    const sizes = await page.evaluate(() =>
      ['compare-img-a', 'compare-img-b'].map((id) => {
        const img = document.querySelector(`[data-testid=${id}]`);
        return img.complete ? [img.naturalWidth, img.naturalHeight] : null;
      }),
    );
    assert.deepEqual(sizes, [
      [354, 236],
      [354, 236],
    ]);

    // Slider and blink.
    await panel.getByTestId('compare-mode-slider').click();
    await panel.getByTestId('compare-slider-range').fill('80');
    assert.equal(await panel.getByTestId('compare-slider-top').evaluate((el) => el.style.clipPath), 'inset(0px 20% 0px 0px)');
    await panel.getByTestId('compare-mode-blink').click();
    const label = panel.getByTestId('compare-blink-label');
    const first = await label.textContent();
    await page.waitForFunction((was) => document.querySelector('[data-testid=compare-blink-label]')?.textContent !== was, first, { timeout: 5000 });

    // The image under review: print size, dpi, colour mode, and 1:1 print pixels.
    await page.getByTestId('proof-print-size').waitFor();
    assert.equal(await page.getByTestId('proof-print-size').textContent(), '30 × 20 mm at 300 dpi (354 × 236 px)');
    assert.equal(await page.getByTestId('proof-colour-mode').textContent(), 'RGB, sRGB (IEC 61966-2-1)');
    await page.getByTestId('proof-zoom-pixels').click();
    const shown = await page.getByTestId('proof-img').evaluate((img) => img.getBoundingClientRect().width * window.devicePixelRatio);
    assert.ok(Math.abs(shown - 354) < 1, `at 1:1 the 354 px image covers 354 device pixels (got ${shown})`);

    assert.deepEqual(errors.map(String), [], 'no uncaught errors in the page');
  } finally {
    await context.close();
  }
});
