// Shared helpers for Psiform browser tests (node --test test/e2e/).
// Launches the system Chromium (never a downloaded one) with exact flags and a throw-away profile.
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { after, before } from 'node:test';
import { chromium } from 'playwright-core';
import { CHROMIUM_FLAGS } from '@psiform/contracts';

export const DEMO_ILLUSTRATOR = { email: 'illustrator@demo.psiform.test', password: 'psiform-demo' };
export const DEMO_EDITOR = { email: 'editor@demo.psiform.test', password: DEMO_ILLUSTRATOR.password };
export const DEMO_ART_DIRECTOR = { email: 'artdirector@demo.psiform.test', password: DEMO_ILLUSTRATOR.password };
export const DEMO_ADMIN = { email: 'admin@demo.psiform.test', password: DEMO_ILLUSTRATOR.password };

/** A 2p_z figure on a coarse 24³ grid (90% enclosed): quick to mesh and render, for tests that only need a figure. */
export const QUICK_2PZ_RECIPE = Object.freeze({
  version: 1,
  label: '2p_z',
  content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1, im: 0 }] },
  grid: { n: 24, extent: 'auto' },
  surface: { rule: 'enclosed', fraction: 0.9 },
});

export const CHROMIUM_PATH = '/usr/bin/chromium';


/** The stack under test, from PSIFORM_URL; throws (failing the test loudly) when it is not set. */
export function baseUrl() {
  const url = process.env.PSIFORM_URL;
  if (!url) {
    throw new Error('PSIFORM_URL is not set: point it at a running Psiform, e.g. PSIFORM_URL=http://127.0.0.1:3000');
  }
  return url.replace(/\/+$/, '');
}

/**
 * Starts Chromium with exactly our flags (Playwright's defaults are switched off so nothing else is added,
 * except the pipe Playwright talks over). Returns { browser, close } where close also deletes the profile.
 */
export async function launchBrowser() {
  const profile = await mkdtemp(join(tmpdir(), 'psiform-chromium-'));
  let browser;
  try {
    browser = await chromium.launch({
      executablePath: CHROMIUM_PATH,
      ignoreDefaultArgs: true,
      args: [...CHROMIUM_FLAGS, `--user-data-dir=${profile}`, '--remote-debugging-pipe', '--no-startup-window'],
      timeout: 60_000,
    });
  } catch (err) {
    await rm(profile, { recursive: true, force: true });
    throw err;
  }
  return {
    browser,
    async close() {
      await browser.close().catch(() => {});
      await rm(profile, { recursive: true, force: true });
    },
  };
}

/**
 * The browser of one test file: launched before its tests (after checking PSIFORM_URL, so a missing stack fails
 * before Chromium starts) and closed, its profile deleted, after them. Returns a function that gives the browser.
 */
export function browserPerFile() {
  let launched;
  before(async () => {
    baseUrl();
    launched = await launchBrowser();
  });
  after(async () => {
    await launched?.close();
  });
  return () => launched.browser;
}

/** A fresh context and page; uncaught page errors land in `errors`, every requested URL in `requests`. */
export async function newPage(browser) {
  const context = await browser.newContext({ viewport: { width: 1280, height: 800 } });
  const page = await context.newPage();
  const errors = [];
  const requests = [];
  page.on('pageerror', (err) => errors.push(err));
  page.on('request', (req) => requests.push(req.url()));
  // Generous: a wait polls its condition, and the first page of a run compiles shaders on a busy machine.
  page.setDefaultTimeout(30_000);
  return { context, page, errors, requests };
}

/**
 * Signs in through the real form and waits for the app shell. Returns the session the client stored
 * ({ accessToken, user }) so a test can call the API with the same token.
 */
export async function signIn(page, { email, password } = DEMO_ILLUSTRATOR, url = baseUrl()) {
  await page.goto(`${url}/sign-in`);
  await page.getByLabel('Email').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByTestId('signin-submit').click();
  await page.getByTestId('masthead').waitFor({ state: 'visible' }).catch(async (err) => {
    const shown = await page.getByTestId('signin-error').textContent().catch(() => null);
    throw new Error(`Sign-in as ${email} did not reach the app${shown ? `: the page says "${shown}"` : ''} (${err.message})`);
  });
  const session = await page.evaluate(() => JSON.parse(window.sessionStorage.getItem('psiform.session') ?? 'null'));
  if (!session?.accessToken) throw new Error('Signed in, but no session was stored in sessionStorage');
  return session;
}

/** GET a JSON route of the API with a Bearer token (from Node, not the page). */
export async function apiGet(path, token, url = baseUrl()) {
  const res = await fetch(`${url}${path}`, { headers: { Authorization: `Bearer ${token}`, Accept: 'application/json' } });
  const text = await res.text();
  if (!res.ok) throw new Error(`GET ${path} answered ${res.status}: ${text.slice(0, 200)}`);
  return JSON.parse(text);
}

/** Calls the API from Node; throws naming the step and the server's answer unless the status is one of `expect`
 * (a missing route says so, with `hint` naming what should have been deployed). */
export async function apiCall(step, method, path, { token, body, expect = [200, 201], hint = 'is this server side deployed?', url = baseUrl() } = {}) {
  const res = await fetch(`${url}${path}`, {
    method,
    headers: { Accept: 'application/json', ...(body ? { 'Content-Type': 'application/json' } : {}), ...(token ? { Authorization: `Bearer ${token}` } : {}) },
    body: body ? JSON.stringify(body) : undefined,
  });
  const text = await res.text();
  if (!expect.includes(res.status)) {
    const missing = res.status === 404 && /Cannot (GET|POST|PATCH|PUT|DELETE)/.test(text) ? ` (the route does not exist: ${hint})` : '';
    throw new Error(`${step}: ${method} ${path} answered ${res.status}${missing}: ${text.slice(0, 300)}`);
  }
  return { status: res.status, body: text ? JSON.parse(text) : null };
}

/** Signs in through the API (not the page) and returns the access token. */
export async function apiLogin(account) {
  const { body } = await apiCall(`Signing in ${account.email} through the API`, 'POST', '/api/auth/login', { body: account });
  if (!body?.accessToken) throw new Error(`the login answer for ${account.email} carries no access token`);
  return body.accessToken;
}

/** Waits for the page to reach `ok`, or throws with the first error the page shows instead (by data-testid). */
export async function expectOutcome(page, { ok, errors, what, timeout }) {
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

/** expectOutcome where the outcome is the element `testId` turning up (visible, or only `attached` for a marker). */
export function expectShown(page, testId, { errors, what, timeout, state = 'visible' }) {
  return expectOutcome(page, { ok: () => page.getByTestId(testId).waitFor({ state, timeout }), errors, what, timeout });
}
