import { randomBytes } from 'node:crypto';
import type { INestApplication } from '@nestjs/common';
import request from 'supertest';
import { DataSource } from 'typeorm';
import type Redis from 'ioredis';
import type { JobDto, LoginResponse } from '@psiform/contracts';
import { loadConfig, type AppConfig, runMigrations, dataSourceOptions, REDIS_CLIENT } from '@psiform/server';
import { runSeed } from '../src/seed/seed';
import { createApp } from '../src/app.factory';
import { DEMO_PASSWORD as DEMO_PASSWORD_VALUE } from '../src/seed/demo-scenario';
import { waitFor } from './worker-process';

export { DEMO_PASSWORD, DEMO_USERS, DEMO_PUBLICATION } from '../src/seed/demo-scenario';

/**
 * E2E specs run against the real PostgreSQL, Redis, S3 and SMTP named by the environment
 * (DATABASE_URL, REDIS_URL, S3_*, SMTP_URL, JWT_SECRET). Missing variables fail the suite loudly.
 */
export function e2eConfig(overrides: Record<string, string> = {}): AppConfig {
  try {
    // General rate limits off unless a spec sets them: specs poll jobs many times a second from one account, and
    // security.e2e-spec exercises the limit itself with its own setting. The database's request limit is 15 s, not the
    // production 1.5 s: on the shared 2-core test machine a plain SELECT can take seconds while a mesh job holds the
    // cores; faults.e2e-spec tests the production limit with its own setting.
    return loadConfig({ ...process.env, PORT: '0', RATE_LIMIT_PER_MINUTE: '0', DB_REQUEST_TIMEOUT_MS: '15000', ...overrides });
  } catch (err) {
    throw new Error(
      `E2E tests need the service environment (the test runner sets it; see DEVELOPERS.md): ${(err as Error).message}`,
    );
  }
}

/** A suffix unique to this run, for emails and titles the spec creates and later deletes. */
export const RUN_ID = `${Date.now().toString(36)}${randomBytes(3).toString('hex')}`;
export const runEmail = (name: string) => `${name}-${RUN_ID}@e2e.psiform.test`;

export interface TestApp {
  app: INestApplication;
  http: () => ReturnType<typeof request>;
  ds: DataSource;
  redis: Redis;
  close: () => Promise<void>;
}

/** Migrates, seeds (both idempotent), builds the app exactly as main.ts does, and inits it. */
export async function startTestApp(overrides: Record<string, string> = {}): Promise<TestApp> {
  const config = e2eConfig(overrides);
  await runMigrations(config.database.url);
  const seedDs = await new DataSource(dataSourceOptions(config.database.url)).initialize();
  try {
    await runSeed(seedDs);
  } finally {
    await seedDs.destroy();
  }
  const app = await createApp(config, { logger: ['error'] });
  await app.init();
  const ds = app.get(DataSource);
  const redis = app.get<Redis>(REDIS_CLIENT);
  return {
    app,
    http: () => request(app.getHttpServer()),
    ds,
    redis,
    close: async () => {
      await ds.query(`DELETE FROM figures WHERE title LIKE $1`, [`%${RUN_ID}%`]);
      await ds.query(`DELETE FROM figures WHERE owner_id IN (SELECT id FROM users WHERE email LIKE $1)`, [`%-${RUN_ID}@e2e.psiform.test`]);
      await ds.query(`DELETE FROM publications WHERE title LIKE $1`, [`%${RUN_ID}%`]);
      await ds.query(`DELETE FROM users WHERE email LIKE $1`, [`%-${RUN_ID}@e2e.psiform.test`]);
      await deleteKeys(redis, `psiform:attempts:login:email:*-${RUN_ID}@e2e.psiform.test`);
      await app.close();
    },
  };
}

export async function login(t: TestApp, email: string, password: string): Promise<LoginResponse> {
  const res = await t.http().post('/api/auth/login').send({ email, password });
  if (res.status !== 200) throw new Error(`login ${email} answered ${res.status}: ${JSON.stringify(res.body)}`);
  return res.body as LoginResponse;
}

async function deleteKeys(redis: Redis, pattern: string, extra: string[] = []): Promise<void> {
  const keys = [...extra];
  let cursor = '0';
  do {
    const [next, found] = await redis.scan(cursor, 'MATCH', pattern, 'COUNT', 200);
    keys.push(...found);
    cursor = next;
  } while (cursor !== '0');
  if (keys.length) await redis.del(...keys);
}

/** Removes sign-in failure counters of the IPs (every request here comes from loopback) and of the given emails. */
export async function clearLoginCounters(redis: Redis, emails: string[] = []): Promise<void> {
  await deleteKeys(redis, 'psiform:attempts:login:ip:*', emails.map((e) => `psiform:attempts:login:email:${e.toLowerCase()}`));
}

export const auth = (token: string) => ({ Authorization: `Bearer ${token}` });

/** The password of the accounts the suites make (at least MIN_PASSWORD_LENGTH). */
export const ACCOUNT_PASSWORD = 'long-enough-pw';

/**
 * A fresh account made by an admin (POST /api/users, email from runEmail(name)), optionally added to the publication
 * `memberOf`, then signed in. Its row goes with the run (TestApp.close deletes the run's users).
 */
export async function newAccount(
  t: TestApp,
  adminToken: string,
  a: { name: string; displayName: string; role: 'illustrator' | 'editor' | 'art_director' | 'admin'; memberOf?: string },
): Promise<{ id: string; email: string; token: string }> {
  const email = runEmail(a.name);
  const user = (await t.http().post('/api/users').set(auth(adminToken)).send({ email, displayName: a.displayName, password: ACCOUNT_PASSWORD, role: a.role }).expect(201)).body as { id: string };
  if (a.memberOf) await t.http().post(`/api/publications/${a.memberOf}/members`).set(auth(adminToken)).send({ userId: user.id }).expect(201);
  return { id: user.id, email, token: (await login(t, email, ACCOUNT_PASSWORD)).accessToken };
}

/** The demo illustrator's, editor's and admin's tokens. */
export async function demoTokens(t: TestApp): Promise<{ illustrator: string; editor: string; artDirector: string; admin: string }> {
  const [illustrator, editor, artDirector, admin] = await Promise.all(
    ['illustrator', 'editor', 'artdirector', 'admin'].map(async (n) => (await login(t, `${n}@demo.psiform.test`, DEMO_PASSWORD_VALUE)).accessToken),
  );
  return { illustrator, editor, artDirector, admin };
}

/** The job as `token` sees it (GET /api/jobs/:id, expected 200). */
export async function jobOf(t: TestApp, token: string, jobId: string): Promise<JobDto> {
  return (await t.http().get(`/api/jobs/${jobId}`).set(auth(token)).expect(200)).body as JobDto;
}

/** Polls the job as `token` sees it until it has completed or failed, and returns it (a timeout throws). */
export function jobEnded(t: TestApp, token: string, jobId: string, timeoutMs = 60000, everyMs = 200, what = `job ${jobId} to finish`): Promise<JobDto> {
  return waitFor(what, async () => {
    const j = await jobOf(t, token, jobId);
    return j.state === 'completed' || j.state === 'failed' ? j : undefined;
  }, timeoutMs, everyMs);
}

/**
 * A publication of this run (POST /api/publications as the demo admin) with the demo illustrator, editor and art
 * director as members; its row goes with the run (TestApp.close deletes the run's publications by title).
 */
export async function staffedPublication(
  t: TestApp,
  tok: { illustrator: string; editor: string; artDirector: string; admin: string },
  body: { title: string; publisher: string; kind: string },
): Promise<string> {
  const pubId = (await t.http().post('/api/publications').set(auth(tok.admin)).send(body).expect(201)).body.id as string;
  for (const token of [tok.illustrator, tok.editor, tok.artDirector]) {
    const me = (await t.http().get('/api/auth/me').set(auth(token)).expect(200)).body as { id: string };
    await t.http().post(`/api/publications/${pubId}/members`).set(auth(tok.admin)).send({ userId: me.id }).expect(201);
  }
  return pubId;
}

/** A small valid recipe document (real 2p_z, Z = 1); `over` replaces top-level parts. */
export function smallRecipe(over: Record<string, unknown> = {}): Record<string, any> {
  return {
    version: 1,
    label: '2pz',
    content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] },
    grid: { n: 32 },
    surface: { rule: 'enclosed', fraction: 0.9 },
    ...over,
  };
}

/** Hue in degrees (hexcone HSV, common practice), saturation and value in 0..1. */
function hsv(r: number, g: number, b: number): { h: number; s: number; v: number } {
  const max = Math.max(r, g, b) / 255;
  const min = Math.min(r, g, b) / 255;
  const d = max - min;
  let h = 0;
  if (d > 0) {
    const [R, G, B] = [r / 255, g / 255, b / 255];
    h = max === R ? 60 * (((G - B) / d) % 6) : max === G ? 60 * ((B - R) / d + 2) : 60 * ((R - G) / d + 4);
  }
  return { h: (h + 360) % 360, s: max === 0 ? 0 : d / max, v: max };
}

/**
 * Pixels of an RGBA image (x from x0 to x1) that read as each of `colours` under shading: lighting changes
 * brightness and saturation, not hue, so a pixel counts when its hue is within 20° of the colour's and it is
 * clearly coloured (s ≥ 0.25, v ≥ 0.12). Our own tolerances (common practice), as in test/e2e/pixels.mjs.
 */
export function phasePixels(img: { width: number; height: number; data: Uint8Array | Buffer }, colours: string[], x0 = 0, x1 = img.width): number[] {
  const targets = colours.map((c) => hsv(parseInt(c.slice(1, 3), 16), parseInt(c.slice(3, 5), 16), parseInt(c.slice(5, 7), 16)).h);
  const counts = colours.map(() => 0);
  for (let y = 0; y < img.height; y++) {
    for (let x = x0; x < x1; x++) {
      const i = (y * img.width + x) * 4;
      if (img.data[i + 3] === 0) continue;
      const p = hsv(img.data[i], img.data[i + 1], img.data[i + 2]);
      if (p.s < 0.25 || p.v < 0.12) continue;
      targets.forEach((h, k) => {
        const d = Math.abs(p.h - h) % 360;
        if ((d > 180 ? 360 - d : d) <= 20) counts[k] += 1;
      });
    }
  }
  return counts;
}

/** Removes figure sets a spec made, with their PNGs (the set's asset rows have no figure version to cascade from). */
export async function deleteFigureSets(ds: DataSource, setIds: string[]): Promise<void> {
  if (!setIds.length) return;
  await ds.query(`UPDATE figure_sets SET png_asset_id = NULL WHERE id = ANY($1)`, [setIds]);
  await ds.query(`DELETE FROM assets WHERE stats->>'figureSetId' = ANY($1)`, [setIds]);
  await ds.query(`DELETE FROM figure_sets WHERE id = ANY($1)`, [setIds]);
}
