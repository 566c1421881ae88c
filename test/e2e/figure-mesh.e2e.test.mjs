// Browser end-to-end: the demo illustrator creates a 2p_z figure through the form, computes its mesh, and the
// viewport shows both phase colours. Needs the whole stack (api, worker, storage):
//   PSIFORM_URL=http://127.0.0.1:3000 node --test test/e2e/
// It fails (never skips) when a part is missing, naming the step that did not happen.
// Software WebGL draws only a few frames a second, so nothing here depends on frame rate: the page sets
// data-testid="viewport-ready" once the GLB is in the scene and a frame of it has been drawn.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { PNG } from 'pngjs';
import { apiGet, baseUrl, DEMO_ILLUSTRATOR, launchBrowser, newPage, signIn } from './browser.mjs';

let launched;

before(async () => {
  baseUrl(); // fail before starting a browser when PSIFORM_URL is missing
  launched = await launchBrowser();
});

after(async () => {
  await launched?.close();
});

/** '#c8553d' -> [200, 85, 61] */
function hexRgb(hex) {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) throw new Error(`not a #rrggbb colour: ${hex}`);
  return [parseInt(m[1], 16), parseInt(m[2], 16), parseInt(m[3], 16)];
}

/** HSV with hue in degrees, s and v in 0..1 (the usual hexcone model, common practice). */
export function hsv([r, g, b]) {
  const R = r / 255;
  const G = g / 255;
  const B = b / 255;
  const max = Math.max(R, G, B);
  const min = Math.min(R, G, B);
  const d = max - min;
  let h = 0;
  if (d > 0) {
    if (max === R) h = 60 * (((G - B) / d) % 6);
    else if (max === G) h = 60 * ((B - R) / d + 2);
    else h = 60 * ((R - G) / d + 4);
  }
  if (h < 0) h += 360;
  return { h, s: max === 0 ? 0 : d / max, v: max };
}

function hueDistance(a, b) {
  const d = Math.abs(a - b) % 360;
  return d > 180 ? 360 - d : d;
}

/**
 * Counts pixels that read as each palette colour under shading. Lighting scales brightness and, with
 * specular highlights, pulls saturation down; the hue survives. So a pixel counts for a colour when its hue is
 * within HUE_TOL degrees of the colour's hue and it is clearly coloured (s >= MIN_S) and not near black.
 * Tolerances are our own choice (common practice for such checks), wide enough for shading, narrow enough
 * that the two palette hues (about 10° and 205°) and the near-white background can never be confused.
 */
const HUE_TOL = 20;
const MIN_S = 0.25;
const MIN_V = 0.12;

function countPhasePixels(png, colours) {
  const targets = colours.map((c) => hsv(hexRgb(c)));
  const counts = colours.map(() => 0);
  const { width, height, data } = png;
  for (let i = 0; i < width * height; i++) {
    const p = hsv([data[4 * i], data[4 * i + 1], data[4 * i + 2]]);
    if (p.s < MIN_S || p.v < MIN_V) continue;
    targets.forEach((t, k) => {
      if (hueDistance(p.h, t.h) <= HUE_TOL) counts[k] += 1;
    });
  }
  return { counts, total: width * height };
}

/** Waits for the page to reach `ok`, or throws with the first error the page shows instead. */
async function expectOutcome(page, { ok, errors, what, timeout }) {
  const okPromise = ok().then(() => ({ ok: true }));
  const errPromises = errors.map((testId) =>
    page
      .getByTestId(testId)
      .first()
      .waitFor({ state: 'visible', timeout })
      .then(async () => ({ ok: false, testId, text: (await page.getByTestId(testId).first().textContent())?.trim() })),
  );
  let result;
  try {
    result = await Promise.any([okPromise, ...errPromises]);
  } catch (err) {
    const reasons = err instanceof AggregateError ? err.errors.map((e) => e.message.split('\n')[0]) : [String(err)];
    throw new Error(`${what} did not happen within ${timeout / 1000} s (${reasons[0]})`, { cause: err });
  }
  if (!result.ok) throw new Error(`${what} failed; the page says (${result.testId}): ${result.text}`);
}

test('an illustrator creates a 2p_z figure, computes its mesh and sees both phase colours', { timeout: 240_000 }, async () => {
  const { context, page, errors } = await newPage(launched.browser);
  try {
    const session = await signIn(page, DEMO_ILLUSTRATOR);
    const title = `E2E 2p_z ${new Date().toISOString()} ${Math.random().toString(36).slice(2, 8)}`;

    // Library -> New figure.
    await page.getByTestId('nav-library').click();
    await page.getByTestId('library-page').waitFor();
    await expectOutcome(page, {
      ok: () => page.getByTestId('library-new-figure').waitFor({ state: 'visible', timeout: 20_000 }),
      errors: ['publications-error', 'publications-empty'],
      what: 'The library offering "New figure"',
      timeout: 20_000,
    });
    await page.getByTestId('library-new-figure').click();
    await page.getByTestId('new-figure-form').waitFor();

    await page.getByTestId('nf-title').fill(title);
    await page.getByTestId('nf-label').fill('2pz');
    await page.getByTestId('nf-grid').fill('48');
    await page.getByTestId('nf-fraction').fill('0.9');
    assert.match(await page.getByTestId('nf-memory').textContent(), /^48³ × 4 bytes × 1 = 442\.4 kB/);
    assert.equal(await page.getByTestId('nf-submit').isEnabled(), true, 'the form accepts a 2p_z on a 48³ grid');
    await page.getByTestId('nf-submit').click();

    await expectOutcome(page, {
      ok: () => page.waitForURL(/\/figures\/(?!new)[^/?]+/, { timeout: 30_000 }),
      errors: ['nf-server-error', 'nf-recipe-issues'],
      what: 'Creating the figure (POST /api/figures)',
      timeout: 30_000,
    });
    const figureId = decodeURIComponent(new URL(page.url()).pathname.split('/').pop());
    await expectOutcome(page, {
      ok: () => page.getByTestId('figure-page').waitFor({ timeout: 20_000 }),
      errors: ['figure-error'],
      what: `Opening the new figure ${figureId} (GET /api/figures/:id)`,
      timeout: 20_000,
    });
    assert.equal((await page.getByTestId('figure-title').textContent())?.trim(), title);
    const model = await page.getByTestId('figure-model').textContent();
    assert.match(model, /^2p_z, Z = 1, one-electron hydrogen-like model; surface encloses 90% of the probability; grid 48³/);
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
    await expectOutcome(page, {
      ok: () => page.getByTestId('job-progress').waitFor({ timeout: 20_000 }),
      errors: ['compute-error'],
      what: 'Queueing the mesh job (POST /api/figures/:id/meshes)',
      timeout: 20_000,
    });
    await expectOutcome(page, {
      ok: () => page.locator('[data-testid="job-progress"][data-state="completed"]').waitFor({ timeout: 120_000 }),
      errors: ['job-error', 'job-stream-error'],
      what: 'The mesh job completing (GET /api/jobs/:id/events)',
      timeout: 120_000,
    });
    assert.equal(await page.getByTestId('job-progress-bar').getAttribute('aria-valuenow'), '100');

    // The finished mesh: statistics per phase, downloads, and the viewport.
    await expectOutcome(page, {
      ok: () => page.getByTestId('mesh-stats').waitFor({ timeout: 30_000 }),
      errors: ['viewport-error'],
      what: 'The mesh statistics appearing after completion',
      timeout: 30_000,
    });
    const phases = await page.getByTestId('mesh-stats-row').locator('td:first-child').allTextContents();
    assert.deepEqual(phases, ['ψ > 0 (phase +)', 'ψ < 0 (phase −)'], 'a real 2p_z has one surface per sign');
    assert.equal(await page.getByTestId('download-glb').isVisible(), true);

    await expectOutcome(page, {
      ok: () => page.getByTestId('viewport-ready').waitFor({ state: 'attached', timeout: 90_000 }),
      errors: ['viewport-error'],
      what: 'The viewport loading the GLB and drawing a frame',
      timeout: 90_000,
    });

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
