// Browser end-to-end: an admin invites someone from the People page; the invitation in the local outbox carries a
// one-time link; the invitee chooses a password there and signs in; the admin adds them to a new publication and
// they see exactly that one. Run against a running stack (npm test starts one): PSIFORM_URL=… node --test test/e2e/
import assert from 'node:assert/strict';
import { randomBytes } from 'node:crypto';
import { test } from 'node:test';
import { apiGet, baseUrl, browserPerFile, DEMO_ADMIN, expectOutcome, newPage, signIn } from './browser.mjs';

const browser = browserPerFile();

/** The newest mail to `email` in the local SMTP fake's outbox (GET /api/dev/outbox, admins), waiting for the worker to send it. */
async function waitForMail(token, email, timeoutMs = 30_000) {
  const t0 = Date.now();
  for (;;) {
    const rows = await apiGet('/api/dev/outbox', token);
    const hit = rows.find((m) => m.to.includes(email));
    if (hit) return hit;
    if (Date.now() - t0 > timeoutMs) throw new Error(`no mail to ${email} reached the outbox within ${timeoutMs / 1000} s (is a worker with SMTP_URL running?)`);
    await new Promise((r) => setTimeout(r, 300));
  }
}

test('admin invites; the mailed link sets a password once; the new illustrator signs in and sees only the publication they were added to', { timeout: 240_000 }, async () => {
  const run = randomBytes(4).toString('hex');
  const email = `odile-${run}@e2e.psiform.test`;
  const name = `Odile Marsh ${run}`;
  const pubTitle = `Field Guide to Nodes ${run}`;
  const admin = await newPage(browser());
  const invitee = await newPage(browser());
  try {
    const session = await signIn(admin.page, DEMO_ADMIN);
    const page = admin.page;

    // Invite from the People page.
    await page.getByTestId('nav-people').click();
    await page.getByTestId('people-table').waitFor();
    await page.getByTestId('invite-open').click();
    await page.getByTestId('invite-email').fill(email);
    await page.getByTestId('invite-name').fill(name);
    await page.getByTestId('invite-role').selectOption('illustrator');
    await page.getByTestId('invite-submit').click();
    await expectOutcome(page, { ok: () => page.getByTestId('invite-done').waitFor(), errors: ['invite-email-error', 'invite-error'], what: 'the invitation', timeout: 15_000 });

    // A second invitation to the same address says so beside the field.
    await page.getByTestId('invite-open').click();
    await page.getByTestId('invite-email').fill(email.toUpperCase());
    await page.getByTestId('invite-name').fill('Someone Else');
    await page.getByTestId('invite-submit').click();
    assert.equal(await page.getByTestId('invite-email-error').textContent(), `${email} is already registered`);

    // The mail: text and HTML parts, the same one-time link under the app's public address.
    const mail = await waitForMail(session.accessToken, email);
    assert.equal(mail.subject, 'You are invited to Psiform');
    const link = /(https?:\/\/\S+\/set-password#token=[A-Za-z0-9_-]+)/.exec(mail.text)?.[1];
    assert.ok(link, `the invitation text has a set-password link: ${mail.text}`);
    assert.ok(mail.html.includes(`href="${link}"`), 'the HTML part links to the same address');
    assert.equal(new URL(link).origin, new URL(baseUrl()).origin, 'the link opens this Psiform');

    // The invitee opens the link, chooses a password, and lands on sign-in with their address filled in.
    const ip = invitee.page;
    await ip.goto(link);
    await ip.getByTestId('set-password-for').waitFor();
    assert.match(await ip.getByTestId('set-password-for').textContent(), new RegExp(email));
    await ip.getByTestId('set-password-password').fill('nodal-planes-42');
    await ip.getByTestId('set-password-again').fill('nodal-planes-42');
    await ip.getByTestId('set-password-submit').click();
    await expectOutcome(ip, { ok: () => ip.getByTestId('signin-arrived').waitFor(), errors: ['set-password-error', 'set-password-bad-link'], what: 'setting the password', timeout: 15_000 });
    assert.equal(await ip.getByTestId('signin-email').inputValue(), email);
    await ip.getByTestId('signin-password').fill('nodal-planes-42');
    await ip.getByTestId('signin-submit').click();
    await ip.getByTestId('masthead').waitFor();
    assert.equal(await ip.getByTestId('user-name').textContent(), name);
    await ip.getByTestId('publications-empty').waitFor();

    // The link works once.
    const again = await invitee.context.newPage();
    await again.goto(link);
    await again.getByTestId('set-password-bad-link').waitFor();
    await again.close();

    // The admin creates a publication and adds the invitee as an illustrator there.
    await page.getByTestId('nav-manage/publications').click();
    await page.getByTestId('pubs-new').click();
    await page.getByTestId('pub-title').fill(pubTitle);
    await page.getByTestId('pub-publisher').fill('Harrowgate Press');
    await page.getByText('Bohr radius (a₀)').click();
    await page.getByTestId('pub-submit').click();
    await page.getByTestId('pubs-created').getByRole('link').click();
    await page.getByTestId('publication-admin').waitFor();
    await page.getByTestId('add-member-search').fill(run);
    const candidate = page.locator(`[data-testid=add-member-candidate][data-email="${email}"]`);
    await candidate.waitFor();
    await candidate.getByTestId('add-member-role').selectOption('illustrator');
    await candidate.getByTestId('add-member-submit').click();
    await page.locator(`[data-testid=member-row][data-email="${email}"]`).waitFor();
    await page.getByTestId('subject-audit-entry').filter({ hasText: 'added a member' }).waitFor();

    // The invitee sees exactly that publication.
    await ip.reload();
    await ip.getByTestId('publication-card').first().waitFor();
    assert.deepEqual(await ip.getByTestId('publication-title').allTextContents(), [pubTitle]);
    const mine = await apiGet('/api/publications', await ip.evaluate(() => JSON.parse(sessionStorage.getItem('psiform.session')).accessToken));
    assert.deepEqual(mine.map((p) => p.title), [pubTitle]);
    assert.equal(mine[0].lengthUnit, 'bohr');

    assert.deepEqual([...admin.errors, ...invitee.errors].map(String), [], 'no uncaught errors in either page');
  } finally {
    await admin.context.close();
    await invitee.context.close();
  }
});
