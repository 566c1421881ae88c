// Browser end-to-end for "the studio and every file say the same true thing": a saved complex state opens clean and no
// view switch rewrites it; downloads are attachments named from the figure (the tab stays); forms name their limits;
// the Library's "New figure" is the one Composer; the export dialog offers the delivery profile's choices first and
// preflights the planned file before anything is sent.   PSIFORM_URL=http://127.0.0.1:3000 node --test test/e2e/
import assert from 'node:assert/strict';
import { test } from 'node:test';
import { apiCall, apiLogin, baseUrl, browserPerFile, DEMO_ILLUSTRATOR, expectOutcome, expectShown, newPage, signIn } from './browser.mjs';

const browser = browserPerFile();

const api = async (step, method, path, opts) => (await apiCall(step, method, path, opts)).body;
const run = () => `${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}`;

async function followJob(token, jobId, what) {
  let job;
  for (const end = Date.now() + 180_000; Date.now() < end; ) {
    job = await api(`following ${what}`, 'GET', `/api/jobs/${jobId}`, { token });
    if (job.state === 'completed' || job.state === 'failed') break;
    await new Promise((r) => setTimeout(r, 500));
  }
  assert.equal(job?.state, 'completed', `${what} finished: ${job?.error ?? job?.state}`);
  return job;
}

test('a complex 2p(m=+1) made through the API opens clean in the studio with its phase key, and no view switch changes its state', { timeout: 120_000 }, async () => {
  const token = await apiLogin(DEMO_ILLUSTRATOR);
  const [pub] = await api('publications', 'GET', '/api/publications', { token });
  const terms = [{ n: 2, l: 1, m: 1, basis: 'complex', re: 1, im: 0 }];
  const recipe = { version: 1, label: '2p(m=+1)', content: { Z: 1, terms }, grid: { n: 48 }, surface: { rule: 'enclosed', fraction: 0.9 } };
  const fig = await api('creating the figure', 'POST', '/api/figures', { token, body: { publicationId: pub.id, title: `Complex 2p ${run()}`, recipe } });
  const { page, context, errors } = await newPage(browser());
  try {
    await signIn(page, DEMO_ILLUSTRATOR);
    await page.goto(`${baseUrl()}/figures/${fig.id}/studio`);
    await page.getByTestId('composer-panel').waitFor({ timeout: 30_000 });
    const clean = async (when) => {
      assert.equal(await page.getByTestId('studio-dirty').count(), 0, `no "Unsaved changes" ${when}`);
      assert.equal(await page.getByTestId('studio-save').isDisabled(), true, `Save stays disabled ${when}`);
    };
    await clean('on opening');
    // Coloured by arg ψ: the phase key (ring of 72 sectors marked 0, π/2, π, 3π/2), not the ψ > 0 / ψ < 0 legend.
    const key = page.getByTestId('phase-legend').getByTestId('phase-key');
    await key.waitFor();
    assert.deepEqual(await key.locator('.phase-key-mark').allTextContents(), ['0', 'π/2', 'π', '3π/2']);
    assert.equal(await key.locator('path').count(), 72);
    const fills = await key.locator('path').evaluateAll((els) => els.map((e) => e.getAttribute('fill')));
    assert.ok(new Set(fills).size > 36, 'the ring runs through the wheel (many distinct colours)');
    assert.doesNotMatch(await page.getByTestId('phase-legend').textContent(), /ψ > 0/);
    for (const mode of ['superposition', 'label', 'hybrid', 'nlm', 'superposition']) {
      await page.getByTestId(`cmp-mode-${mode}`).click();
      await clean(`after switching to ${mode}`);
    }
    // The superposition view shows the one stored term.
    assert.equal(await page.getByTestId('cmp-row').count(), 1);
    const stored = await api('reading the figure back', 'GET', `/api/figures/${fig.id}`, { token });
    assert.equal(stored.currentVersion.number, 1);
    assert.deepEqual(stored.currentVersion.recipe.content.terms, terms);
    assert.deepEqual(errors.map(String), []);
  } finally {
    await context.close();
  }
});

test('forms name their limits inline: blank and 250-character titles, a 5 mm canvas, |ψ| above the maximum, an export width', { timeout: 120_000 }, async () => {
  const { page, context } = await newPage(browser());
  try {
    await signIn(page, DEMO_ILLUSTRATOR);
    await page.getByTestId('nav-library').click();
    await page.getByTestId('library-new-figure').click();
    await page.getByTestId('studio-page').waitFor();
    // One Composer: "New figure" opens it, with presets to start from.
    assert.match(new URL(page.url()).pathname, /^\/composer$/);
    assert.ok((await page.getByTestId('studio-preset').count()) >= 3, 'presets to start from');

    const title = page.getByTestId('studio-title');
    await title.fill('x');
    await title.fill('');
    assert.equal((await page.getByTestId('studio-title-error').textContent()).trim(), 'The title must not be empty.');
    assert.match(await page.getByTestId('studio-save-blocked').textContent(), /waits for .* marked in red/);
    await title.fill('t'.repeat(250));
    assert.equal((await page.getByTestId('studio-title-error').textContent()).trim(), 'The title must be at most 200 characters (this one has 250).');
    await title.fill(`Limits ${run()}`);
    assert.equal(await page.getByTestId('studio-title-error').count(), 0);

    for (const value of ['5', '5000']) {
      await page.getByTestId('canvas-width').fill(value);
      assert.equal((await page.getByTestId('canvas-width-error').textContent()).trim(), `The width must be from 10 to 1000 mm (got ${value} mm).`);
      assert.equal(await page.getByTestId('canvas-width').inputValue(), value, 'the typed value stays (it does not revert)');
    }
    await page.getByTestId('canvas-width').fill('89');
    assert.equal(await page.getByTestId('canvas-width-error').count(), 0);

    // |ψ| above the state's largest value: the message names the maximum the preview found.
    await page.getByTestId('cmp-rule-psi').click();
    await expectShown(page, 'cmp-psi-max', { errors: ['preview-error'], what: 'The preview reporting the largest |ψ|', timeout: 60_000 });
    const max = Number(await page.getByTestId('cmp-psi-max').textContent());
    await page.getByTestId('cmp-psi').fill(String(max * 10));
    const msg = (await page.getByTestId('cmp-surface-error').textContent()).trim();
    assert.match(msg, /largest/i);
    assert.ok(msg.includes(max.toPrecision(3)), `the message names the maximum ${max.toPrecision(3)}: ${msg}`);
  } finally {
    await context.close();
  }
});

test('downloads are attachments named from the figure; the tab stays; every button names its kind', { timeout: 240_000 }, async () => {
  const token = await apiLogin(DEMO_ILLUSTRATOR);
  const [pub] = await api('publications', 'GET', '/api/publications', { token });
  const title = `Download check ${run()}`;
  const recipe = { version: 1, label: '3d_z²', content: { Z: 1, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1 }] }, grid: { n: 40 }, surface: { rule: 'enclosed', fraction: 0.9 } };
  const fig = await api('creating the figure', 'POST', '/api/figures', { token, body: { publicationId: pub.id, title, recipe } });
  const { jobId } = await api('computing the mesh', 'POST', `/api/figures/${fig.id}/meshes`, { token, expect: [200, 201, 202] });
  await followJob(token, jobId, 'the mesh job');
  const profile = await api('the delivery profile', 'GET', `/api/publications/${pub.id}/delivery-profile`, { token });
  const { page, context } = await newPage(browser());
  try {
    await signIn(page, DEMO_ILLUSTRATOR);
    await page.goto(`${baseUrl()}/figures/${fig.id}`);
    await page.getByTestId('download-glb').waitFor({ timeout: 30_000 });
    const texts = await page.getByTestId('asset-downloads').locator('button').allTextContents();
    assert.equal(new Set(texts).size, texts.length, `no two buttons say the same: ${texts.join(' | ')}`);
    assert.match(await page.getByTestId('download-glb').textContent(), /GLB mesh/);
    const before = page.url();
    const [download] = await Promise.all([page.waitForEvent('download', { timeout: 30_000 }), page.getByTestId('download-glb').click()]);
    const name = download.suggestedFilename();
    // The publication's template, filled with the figure's title as a slug and the label 3dz2; a mesh has no size.
    const slug = title.toLowerCase().replace(/[^a-z0-9]+/g, '-');
    assert.ok(name.endsWith('.glb') && name.includes(slug) && name.includes('3dz2'), `named from the figure through "${profile.fileNameTemplate}": ${name}`);
    assert.notEqual(name, 'mesh.glb');
    assert.equal(page.url(), before, 'the tab stays on the figure page');
    assert.equal(await page.getByTestId('figure-page').isVisible(), true);
  } finally {
    await context.close();
  }
});

test('the export dialog offers the delivery profile first and preflights the planned file before it is sent', { timeout: 240_000 }, async () => {
  const token = await apiLogin(DEMO_ILLUSTRATOR);
  const [pub] = await api('publications', 'GET', '/api/publications', { token });
  const profile = await api('the delivery profile', 'GET', `/api/publications/${pub.id}/delivery-profile`, { token });
  const recipe = { version: 1, label: '2p_z', content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 32 }, surface: { rule: 'enclosed', fraction: 0.9 }, canvas: { widthMm: 60, heightMm: 40, dpi: 300 } };
  const fig = await api('creating the figure', 'POST', '/api/figures', { token, body: { publicationId: pub.id, title: `Export dialog ${run()}`, recipe } });
  const { page, context } = await newPage(browser());
  try {
    await signIn(page, DEMO_ILLUSTRATOR);
    await page.goto(`${baseUrl()}/figures/${fig.id}/studio`);
    await page.getByTestId('studio-export').click();
    await page.getByTestId('export-form').waitFor({ timeout: 20_000 });
    // The profile's first raster format is chosen; its column widths are the presets; the dpi meets its minimum.
    assert.equal(await page.getByTestId('exp-format').inputValue(), profile.rasterFormats[0]);
    for (const c of profile.columnWidthsMm) assert.equal((await page.getByTestId(`exp-preset-${c.name.toLowerCase().replace(/[^a-z0-9]+/g, '-')}`).textContent()).trim(), `${c.name} ${c.widthMm} mm`);
    assert.ok(Number(await page.getByTestId('exp-dpi').inputValue()) >= Math.min(profile.minDpi, 1200));
    await page.getByTestId('exp-format').selectOption('tiff');
    assert.equal(await page.getByTestId('exp-colour').inputValue(), profile.colourMode);

    // The planned file's preflight: every rule listed before export; 300 dpi under a higher minimum fails resolution.
    const rows = async () => Object.fromEntries(await page.getByTestId('exp-preflight').getByTestId('preflight-row').evaluateAll((els) => els.map((e) => [e.getAttribute('data-rule'), e.getAttribute('data-status')])));
    await page.getByTestId('exp-preflight').waitFor();
    assert.equal(Object.keys(await rows()).length, 10);
    await page.getByTestId('exp-dpi').selectOption('300');
    const planned = await rows();
    assert.equal(planned.resolution, profile.minDpi > 300 ? 'fail' : 'pass');
    assert.equal(planned.size, 'pass');

    await page.getByTestId('exp-submit').click();
    await expectShown(page, 'exp-preflight-done', { errors: ['export-error', 'exp-server-error', 'export-stream-error'], what: 'The TIFF export finishing with its preflight report', timeout: 200_000 });
    // The written file's report agrees with the planned one on size, resolution, column, colour and fonts.
    const written = Object.fromEntries(await page.getByTestId('exp-preflight-done').getByTestId('preflight-row').evaluateAll((els) => els.map((e) => [e.getAttribute('data-rule'), e.getAttribute('data-status')])));
    for (const rule of ['size', 'resolution', 'column_width', 'colour_mode', 'icc_profile', 'fonts_embedded', 'font_size', 'line_weight']) assert.equal(written[rule], planned[rule], `${rule}: planned ${planned[rule]}, written ${written[rule]}`);
  } finally {
    await context.close();
  }
});

test("the Composer uses the engine's grid: a new figure starts on 'auto', 7s there shows no warning; a forced coarse grid names the feature; a box that cuts the surface offers to widen it", { timeout: 240_000 }, async () => {
  const token = await apiLogin(DEMO_ILLUSTRATOR);
  const [pub] = await api('publications', 'GET', '/api/publications', { token });
  // 7s with the recipe's defaults (no grid given: 'auto' grid and box), and 2p_z forced into a ±3 a0 box.
  const s7 = await api('creating 7s', 'POST', '/api/figures', { token, body: { publicationId: pub.id, title: `Seven s ${run()}`, recipe: { version: 1, label: '7s', content: { Z: 1, terms: [{ n: 7, l: 0, m: 0, basis: 'real', re: 1 }] }, surface: { rule: 'enclosed', fraction: 0.9 } } } });
  assert.equal(s7.currentVersion.recipe.grid.n, 'auto');
  const narrow = await api('creating 2p_z in a narrow box', 'POST', '/api/figures', { token, body: { publicationId: pub.id, title: `Narrow box ${run()}`, recipe: { version: 1, label: '2p_z', content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 48, extent: 3 }, surface: { rule: 'enclosed', fraction: 0.9 } } } });
  const { page, context, errors } = await newPage(browser());
  const previewDone = async (what) => {
    // The status line says "updating…" while the preview worker samples or extracts; ready once it stops.
    await expectOutcome(page, {
      ok: () => page.waitForFunction(() => {
        const s = document.querySelector('[data-testid=preview-status]')?.textContent ?? '';
        return document.querySelector('[data-testid=preview-ready]') !== null && !s.includes('updating');
      }, null, { timeout: 120_000, polling: 250 }),
      errors: ['preview-error'],
      what,
      timeout: 120_000,
    });
  };
  try {
    await signIn(page, DEMO_ILLUSTRATOR);
    await page.goto(`${baseUrl()}/composer`);
    await page.getByTestId('composer-panel').waitFor({ timeout: 30_000 });
    assert.equal(await page.getByTestId('cmp-grid').inputValue(), 'auto', 'a new figure starts on the engine\'s grid');

    await page.goto(`${baseUrl()}/figures/${s7.id}/studio`);
    await page.getByTestId('composer-panel').waitFor({ timeout: 30_000 });
    await previewDone('The 7s preview on the automatic grid');
    assert.equal(await page.getByTestId('studio-warning').count(), 0, `7s at the defaults shows no warning: ${await page.getByTestId('studio-warnings').allTextContents()}`);

    // A forced grid too coarse for 7s's thinnest shell: the engine's warning names the feature; one click goes back to 'auto'.
    await page.getByTestId('cmp-grid').fill('24');
    const coarse = page.locator('[data-testid=studio-warning][data-code=feature-unresolved]');
    await coarse.first().waitFor({ timeout: 120_000 });
    assert.match(await coarse.first().textContent(), /shell|lobe|node|ring|feature/i, 'the warning names what the grid cannot resolve');
    await page.getByTestId('studio-grid-auto').click();
    assert.equal(await page.getByTestId('cmp-grid').inputValue(), 'auto');
    // The warning goes once the preview on the engine's grid replaces the coarse one (polled, not timed).
    await coarse.first().waitFor({ state: 'detached', timeout: 120_000 });
    await previewDone('The 7s preview back on the automatic grid');
    assert.equal(await page.getByTestId('studio-warning').count(), 0);

    // A box that cuts the surface: the warning, and the offer to widen the box, which clears it.
    await page.goto(`${baseUrl()}/figures/${narrow.id}/studio`);
    await page.getByTestId('composer-panel').waitFor({ timeout: 30_000 });
    const box = page.locator('[data-testid=studio-warning][data-code=box-cuts-surface]');
    await box.first().waitFor({ timeout: 120_000 });
    await page.getByTestId('studio-widen-box').click();
    await box.first().waitFor({ state: 'detached', timeout: 120_000 }); // the widened box holds the surface
    await previewDone('The preview in the widened box');
    assert.equal(await box.count(), 0, 'the widened box holds the surface');
    assert.equal(await page.getByTestId('studio-save').isDisabled(), false, 'the wider box is a change to save');
    assert.deepEqual(errors.map(String), []);
  } finally {
    await context.close();
  }
});
