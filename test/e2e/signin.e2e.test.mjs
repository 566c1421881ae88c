// Browser end-to-end: the demo illustrator signs in and sees their publications, as the API lists them.
// Run against a running stack: PSIFORM_URL=http://127.0.0.1:3000 node --test test/e2e/
// (Node 20 picks only *.test.mjs-style names from a folder, hence the ".test" in this name.)
import assert from 'node:assert/strict';
import { test } from 'node:test';
import { apiGet, baseUrl, browserPerFile, DEMO_ILLUSTRATOR, newPage, signIn } from './browser.mjs';

const browser = browserPerFile();

test('demo illustrator signs in and sees the publications the API returns', { timeout: 120_000 }, async () => {
  const { context, page, errors, requests } = await newPage(browser());
  try {
    const session = await signIn(page, DEMO_ILLUSTRATOR);
    assert.equal(session.user.email, DEMO_ILLUSTRATOR.email);
    assert.equal(session.user.role, 'illustrator');

    // Header names the signed-in user and role.
    assert.equal(await page.getByTestId('user-name').textContent(), session.user.displayName);
    assert.equal(await page.getByTestId('user-role').textContent(), 'Illustrator');
    assert.match(new URL(page.url()).pathname, /^\/publications$/);

    // What the API says this user may see, fetched with the same token.
    const expected = await apiGet('/api/publications', session.accessToken);
    assert.ok(Array.isArray(expected) && expected.length > 0, 'the seed should give the demo illustrator a publication');

    const cards = page.getByTestId('publication-card');
    await cards.first().waitFor({ state: 'visible' });
    assert.equal(await cards.count(), expected.length);
    const titles = await page.getByTestId('publication-title').allTextContents();
    assert.deepEqual(titles, expected.map((p) => p.title));
    assert.equal(titles[0], expected[0].title);

    // Only the illustrator's places are offered.
    const nav = await page.getByTestId('main-nav').getByRole('link').allTextContents();
    assert.deepEqual(
      nav.map((t) => t.replace(/later$/, '').trim()),
      ['Publications', 'Library', 'Composer', 'Figure sets'],
    );

    // Fonts come from our own origin: Lato is applied and loaded.
    const latoLoaded = await page.evaluate(async () => {
      await document.fonts.ready;
      return document.fonts.check('16px Lato') && getComputedStyle(document.body).fontFamily.includes('Lato');
    });
    assert.equal(latoLoaded, true, 'Lato should be the body font and loaded');

    const origin = new URL(baseUrl()).origin;
    const foreign = requests.filter((u) => !u.startsWith(origin) && !/^(data|blob):/.test(u));
    assert.deepEqual(foreign, [], 'no request leaves the Psiform origin (fonts included)');
    assert.deepEqual(errors.map(String), [], 'no uncaught errors in the page');
  } finally {
    await context.close();
  }
});

test('a wrong password shows a readable message and stays on sign-in', { timeout: 60_000 }, async () => {
  const { context, page } = await newPage(browser());
  try {
    await page.goto(`${baseUrl()}/sign-in`);
    await page.getByLabel('Email').fill(DEMO_ILLUSTRATOR.email);
    await page.getByLabel('Password').fill('not-the-demo-password');
    await page.getByTestId('signin-submit').click();
    const message = (await page.getByTestId('signin-error').textContent())?.trim() ?? '';
    assert.ok(message.length > 0, 'an error message is shown');
    assert.doesNotMatch(message, /^HTTP \d+$/, 'the message is in words, not a bare status');
    assert.equal(new URL(page.url()).pathname, '/sign-in');
    const stored = await page.evaluate(() => window.sessionStorage.getItem('psiform.session'));
    assert.equal(stored, null);
  } finally {
    await context.close();
  }
});
