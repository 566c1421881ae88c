// Browser end-to-end for print production: the art director edits the publication's delivery profile (an inline
// message for a bad value, then a save the server keeps), and the figure page's preflight panel lists every rule of a
// real TIFF export's report with pass or fail (the demo profile asks 600 dpi; the export is 300 dpi, so resolution
// fails and approval would be blocked).   PSIFORM_URL=http://127.0.0.1:3000 node --test test/e2e/
import assert from 'node:assert/strict';
import { test } from 'node:test';
import { apiCall, apiLogin, baseUrl, browserPerFile, DEMO_ART_DIRECTOR, DEMO_ILLUSTRATOR, newPage, signIn } from './browser.mjs';

const RULES = ['format', 'size', 'resolution', 'column_width', 'font_size', 'line_weight', 'colour_mode', 'icc_profile', 'fonts_embedded', 'alt_text'];
const browser = browserPerFile();

const api = async (step, method, path, opts) => (await apiCall(step, method, path, opts)).body;
const login = apiLogin;

test('the art director edits the delivery profile with inline messages, and the save is kept', { timeout: 120_000 }, async () => {
  const token = await login(DEMO_ART_DIRECTOR);
  const [pub] = await api('publications', 'GET', '/api/publications', { token });
  const original = await api('reading the profile', 'GET', `/api/publications/${pub.id}/delivery-profile`, { token });
  const { page } = await newPage(browser());
  try {
    await signIn(page, DEMO_ART_DIRECTOR);
    await page.goto(`${baseUrl()}/publications/${pub.id}/delivery-profile`);
    await page.getByTestId('delivery-profile-form').waitFor({ timeout: 20_000 });
    const dpi = page.getByTestId('dp-min-dpi');
    await dpi.fill('50');
    assert.equal((await page.getByTestId('dp-error-minDpi').textContent()).trim(), 'at least 72');
    assert.equal(await page.getByTestId('dp-save').isDisabled(), true, 'save is disabled while a field is wrong');
    await dpi.fill('900');
    await page.getByTestId('dp-error-minDpi').waitFor({ state: 'detached' });
    await page.getByTestId('dp-save').click();
    await page.getByTestId('dp-saved').waitFor({ timeout: 10_000 });
    const kept = await api('reading the saved profile', 'GET', `/api/publications/${pub.id}/delivery-profile`, { token });
    assert.equal(kept.minDpi, 900);
    assert.equal(kept.isDefault, false);
  } finally {
    await page.close();
    const { publicationId: _p, isDefault: _d, updatedAt: _u, updatedBy: _b, ...profile } = original;
    await api('restoring the profile', 'PUT', `/api/publications/${pub.id}/delivery-profile`, { token, body: profile });
  }
});

test('the preflight panel lists every rule of a TIFF export with pass or fail', { timeout: 240_000 }, async () => {
  const token = await login(DEMO_ILLUSTRATOR);
  const [pub] = await api('publications', 'GET', '/api/publications', { token });
  const recipe = { version: 1, label: '2p_z', content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 32 }, surface: { rule: 'enclosed', fraction: 0.9 } };
  const fig = await api('creating a figure', 'POST', '/api/figures', { token, body: { publicationId: pub.id, title: `Preflight panel ${Date.now()}`, recipe } });
  const { jobId } = await api('asking for a TIFF', 'POST', `/api/figures/${fig.id}/exports`, { token, body: { format: 'tiff', widthMm: 60, heightMm: 40, dpi: 300, colour: 'cmyk' } });
  let job;
  for (const end = Date.now() + 180_000; Date.now() < end; ) {
    job = await api('following the job', 'GET', `/api/jobs/${jobId}`, { token });
    if (job.state === 'completed' || job.state === 'failed') break;
    await new Promise((r) => setTimeout(r, 500));
  }
  assert.equal(job?.state, 'completed', `the TIFF job finished: ${job?.error ?? job?.state}`);
  const { page } = await newPage(browser());
  try {
    await signIn(page, DEMO_ILLUSTRATOR);
    await page.goto(`${baseUrl()}/figures/${fig.id}`);
    await page.getByTestId('preflight-panel').waitFor({ timeout: 20_000 });
    const rows = page.getByTestId('preflight-row');
    await rows.first().waitFor();
    const got = await rows.evaluateAll((els) => els.map((e) => [e.getAttribute('data-rule'), e.getAttribute('data-status')]));
    assert.deepEqual(got.map(([r]) => r), RULES);
    for (const [, s] of got) assert.ok(s === 'pass' || s === 'fail');
    const status = Object.fromEntries(got);
    assert.equal(status.resolution, 'fail', 'the demo profile asks 600 dpi; the export is 300');
    assert.equal(status.colour_mode, 'pass');
    assert.equal(await page.getByTestId('preflight-panel').getAttribute('data-blocks'), 'true');
  } finally {
    await page.close();
  }
});
