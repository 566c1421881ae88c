// Browser end-to-end for editorial review: the demo illustrator creates a figure and submits it (through the API,
// with a token); then, in the browser, the demo editor signs in, opens the review desk, opens the proof and approves
// it. Checks the page shows Approved and GET /api/figures/:id/audit has the approve entry.
//   PSIFORM_URL=http://127.0.0.1:3000 node --test test/e2e/
// Needs the server side of review (routes /api/figures/:id/submit, /api/review-desk, ...): it fails (never skips)
// naming the missing step. Only correct demo passwords are used: the API throttles sign-in after 5 failures per IP.
import assert from 'node:assert/strict';
import { test } from 'node:test';
import { apiCall, apiGet, apiLogin, browserPerFile, DEMO_ART_DIRECTOR, DEMO_EDITOR, DEMO_ILLUSTRATOR, newPage, QUICK_2PZ_RECIPE, signIn } from './browser.mjs';


const browser = browserPerFile();

const api = (step, method, path, opts = {}) => apiCall(step, method, path, { hint: 'is the server side of editorial review deployed?', ...opts });
const login = apiLogin;

test('an editor approves a submitted proof from the review desk', { timeout: 180_000 }, async () => {
  // --- set-up through the API: the illustrator creates and submits a figure -------------------------------
  const illustrator = await login(DEMO_ILLUSTRATOR);
  const { body: pubs } = await api('Listing the illustrator’s publications', 'GET', '/api/publications', { token: illustrator });
  assert.ok(Array.isArray(pubs) && pubs.length > 0, 'the demo illustrator belongs to at least one publication');
  const publicationId = pubs[0].id;
  const title = `E2E proof ${new Date().toISOString()} ${Math.random().toString(36).slice(2, 8)}`;
  const recipe = QUICK_2PZ_RECIPE;
  const { body: created } = await api('Creating the figure', 'POST', '/api/figures', { token: illustrator, body: { publicationId, title, recipe } });
  const figureId = created.id;
  const { body: submitted } = await api('Submitting the figure for review', 'POST', `/api/figures/${figureId}/submit`, { token: illustrator });
  assert.equal(submitted.status, 'in_review', `submit moves the figure to in_review (${JSON.stringify(submitted)})`);

  // Where the house style asks for a colour sign-off, the art director gives it first, so the editor's approval completes.
  const house = await api('Reading the house style', 'GET', `/api/publications/${publicationId}/house-style`, { token: illustrator, expect: [200, 404] });
  if (house.status === 200 && house.body.requireColourSignOff) {
    const ad = await login(DEMO_ART_DIRECTOR);
    await api('The art director signing off the colour', 'POST', `/api/figures/${figureId}/colour-signoff`, { token: ad, body: {} });
  }

  // --- in the browser: the editor signs in, opens the desk, the proof, and approves ------------------------
  const { context, page, errors } = await newPage(browser());
  try {
    const session = await signIn(page, DEMO_EDITOR);
    await page.getByTestId('nav-review').click();
    await page.getByTestId('review-desk').waitFor();
    const row = page.getByTestId('desk-row').filter({ hasText: title });
    await Promise.any([
      row.waitFor({ timeout: 20_000 }),
      page.getByTestId('review-desk-error').waitFor({ timeout: 20_000 }).then(async () => {
        throw new Error(`the review desk failed: ${await page.getByTestId('review-desk-error').textContent()}`);
      }),
    ]).catch((err) => {
      throw new Error(`The submitted proof "${title}" did not appear on the editor's review desk (${err.errors?.map((e) => e.message).join('; ') ?? err.message})`);
    });
    assert.equal((await row.getByTestId('desk-publication').textContent())?.trim(), pubs[0].title);
    assert.match((await row.getByTestId('desk-age').textContent()) ?? '', /^\d+ (min|h|d)$/);
    assert.equal((await row.getByTestId('desk-version').textContent())?.trim(), `v${created.currentVersion.number}`);

    await row.getByTestId('desk-title').click();
    await page.getByTestId('proof-page').waitFor({ timeout: 20_000 });
    assert.equal(new URL(page.url()).pathname, `/figures/${figureId}/proof`);
    assert.equal((await page.getByTestId('proof-status').textContent())?.trim(), 'In review');
    const approve = page.getByTestId('decide-approve');
    await approve.waitFor({ timeout: 20_000 });
    assert.equal(await page.getByTestId('decide-submit').count(), 0, 'an editor is not offered Submit');
    await page.locator('[data-testid="decide-approve"]:not([disabled])').waitFor({ timeout: 20_000 });
    await approve.click();

    await Promise.any([
      page.locator('[data-testid="proof-status"]', { hasText: 'Approved' }).waitFor({ timeout: 20_000 }),
      page.getByTestId('decision-error').waitFor({ timeout: 20_000 }).then(async () => {
        throw new Error(`the approval was refused: ${await page.getByTestId('decision-error').textContent()}`);
      }),
    ]).catch((err) => {
      throw new Error(`The proof did not become Approved (${err.errors?.map((e) => e.message).join('; ') ?? err.message})`);
    });
    await page.locator('[data-testid="audit-entry"][data-action="approve"]').waitFor({ timeout: 10_000 });

    // What the server recorded.
    const fig = await apiGet(`/api/figures/${figureId}`, session.accessToken);
    assert.equal(fig.status, 'approved');
    const trail = await apiGet(`/api/figures/${figureId}/audit`, session.accessToken);
    const actions = trail.map((e) => e.action);
    assert.ok(actions.indexOf('submit') >= 0 && actions.indexOf('submit') < actions.lastIndexOf('approve'), `submit comes before approve in ${JSON.stringify(actions)}`);
    const approved = trail[actions.lastIndexOf('approve')];
    assert.equal(approved.toStatus, 'approved');
    assert.equal(approved.fromStatus, 'in_review');
    assert.equal(approved.actorId, session.user.id, 'the approve entry names the editor who clicked');

    assert.deepEqual(errors.map(String), [], 'no uncaught errors in the page');
  } finally {
    await context.close();
  }
});
