// Browser end-to-end for colour checks that gate: the demo art director tries to pin a swatchbook whose phases
// simulated deuteranopia nearly merges (an error-level failure of its colour checks) as a publication's house style;
// the confirmation lists the failure and the affected figure and offers no way to pin without a reason; with a
// written reason the pin goes through, and the reason is shown with the house style, on the affected proof and in the
// audit (the figure's and the house style's).
import assert from 'node:assert/strict';
import { randomBytes } from 'node:crypto';
import { test } from 'node:test';
import { apiCall, apiLogin, baseUrl, browserPerFile, DEMO_ILLUSTRATOR, expectOutcome, newPage, signIn } from './browser.mjs';

const DEMO_ART_DIRECTOR = { email: 'artdirector@demo.psiform.test', password: DEMO_ILLUSTRATOR.password };
const DEMO_ADMIN = { email: 'admin@demo.psiform.test', password: DEMO_ILLUSTRATOR.password };
const browser = browserPerFile();

test('an art director is stopped from pinning a failing swatchbook, then overrides with a reason that appears in the audit', { timeout: 180_000 }, async () => {
  const run = randomBytes(4).toString('hex');
  const reason = `Plates print as duotone with hatching (${run})`;
  const admin = await apiLogin(DEMO_ADMIN);
  const ad = await apiLogin(DEMO_ART_DIRECTOR);
  const illustrator = await apiLogin(DEMO_ILLUSTRATOR);
  const { body: pub } = await apiCall('Creating a publication', 'POST', '/api/publications', { token: admin, body: { title: `Colour Bench ${run}`, publisher: `Harrowgate Press ${run}`, kind: 'book' } });
  for (const token of [ad, illustrator]) {
    const { body: me } = await apiCall('Reading the account', 'GET', '/api/auth/me', { token });
    await apiCall('Adding a member', 'POST', `/api/publications/${pub.id}/members`, { token: admin, body: { userId: me.id } });
  }
  // Red and green that deuteranopia nearly merges: ΔE00 2.9 simulated (libs/colour checkSwatchbook, Machado et al. 2009).
  const { body: book } = await apiCall('Creating the failing swatchbook', 'POST', '/api/swatchbooks', {
    token: ad,
    body: { name: `Red and green ${run}`, publicationId: pub.id, colors: { positive: '#c0392b', negative: '#5a8a2a', background: '#ffffff', label: '#1f1d1a' } },
  });
  const recipe = { version: 1, label: '2p_z', content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1, im: 0 }] }, grid: { n: 24 }, surface: { rule: 'enclosed', fraction: 0.9 } };
  const { body: fig } = await apiCall('Creating a figure', 'POST', '/api/figures', { token: illustrator, body: { publicationId: pub.id, title: `Plate 3 ${run}`, recipe } });

  const { context, page, errors } = await newPage(browser());
  try {
    await signIn(page, DEMO_ART_DIRECTOR);
    // The swatchbook page shows the failure under the phase check that raised it, marked as blocking.
    await page.goto(`${baseUrl()}/swatchbooks/${book.id}`);
    const phaseWarnings = page.getByTestId('check-warnings-phases');
    await phaseWarnings.waitFor();
    assert.match(await phaseWarnings.locator('[data-testid=check-warning][data-level=error]').first().textContent(), /^Blocks pinning and batch re-renders: Positive and negative phases differ by ΔE00 2\.9 under simulated deuteranopia/);
    assert.equal(await page.getByTestId('check-warnings-print').count(), 0, 'no colour-difference warning under Print');

    await page.goto(`${baseUrl()}/publications/${pub.id}/house-style`);
    await page.getByTestId('house-style-none').waitFor();
    await page.getByTestId('hs-swatchbook').selectOption(book.id);
    await page.getByTestId('hs-save').click();
    const dialog = page.getByTestId('pin-confirm');
    await dialog.waitFor();
    assert.match(await page.getByTestId('impact-blocked').textContent(), /Pinning is blocked by failing colour checks/);
    assert.match(await page.getByTestId('colour-override-failures').textContent(), /deuteranopia/);
    assert.match(await dialog.getByTestId('impact-figure').first().textContent(), new RegExp(`Plate 3 ${run}.*positive phase colour #[0-9a-f]{6} → #c0392b`));
    assert.equal(await page.getByTestId('pin-confirm-submit').count(), 0, 'no way to pin without a reason');
    assert.equal(await page.getByTestId('colour-override-submit').isDisabled(), true);
    // Nothing was pinned by asking.
    await apiCall('Reading the house style', 'GET', `/api/publications/${pub.id}/house-style`, { token: ad, expect: [404] });

    await page.getByTestId('colour-override-reason').fill(reason);
    await page.getByTestId('colour-override-submit').click();
    await expectOutcome(page, { ok: () => page.getByTestId('house-style-override').waitFor(), errors: ['hs-save-error'], what: 'the pin with a reason', timeout: 20_000 });
    assert.ok((await page.getByTestId('house-style-override').textContent()).includes(reason));

    // In the audit: on the house style and on the figure; and on the figure's proof.
    const { body: trail } = await apiCall('Reading the figure audit', 'GET', `/api/figures/${fig.id}/audit`, { token: ad });
    const entry = trail.find((e) => e.action === 'colour_override');
    assert.ok(entry, `the figure's audit has a colour_override entry (${JSON.stringify(trail.map((e) => e.action))})`);
    assert.ok(entry.note.includes(reason), `the entry carries the reason: ${entry.note}`);
    const { body: house } = await apiCall('Reading the house-style audit', 'GET', `/api/audit?subjectKind=house_style&subjectId=${pub.id}`, { token: admin });
    assert.deepEqual(house.items.map((e) => e.action), ['colour_override', 'house_style_pin']);
    await page.goto(`${baseUrl()}/figures/${fig.id}/proof`);
    await page.getByTestId('proof-colour-override').waitFor();
    assert.ok((await page.getByTestId('proof-colour-override').textContent()).includes(reason));
    const shown = page.locator('[data-testid=audit-entry][data-action=colour_override]');
    await shown.waitFor();
    assert.ok((await shown.textContent()).includes(reason), 'the proof page\'s audit trail shows the reason');

    assert.deepEqual(errors.map(String), [], 'no uncaught errors in the page');
  } finally {
    await context.close();
  }
});
