import { execFile } from 'node:child_process';
import { join } from 'node:path';
import { promisify } from 'node:util';
import type { AddressInfo } from 'node:net';
import { MESH_STAGES, type JobDto } from '@psiform/contracts';
import { ObjectStorage } from '@psiform/server';
import { auth, demoTokens, jobEnded, jobOf, smallRecipe, startTestApp, DEMO_PUBLICATION, RUN_ID, type TestApp, newAccount } from './support';
import { readSse, startWorkerProcess, waitFor, type WorkerProcess } from './worker-process';

// Khronos glTF validator (npm gltf-validator), the reference check for glTF 2.0 files.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const validator = require('gltf-validator') as { validateBytes(b: Uint8Array): Promise<{ issues: { numErrors: number; messages: unknown[] } }> };

const CLI = join(__dirname, '..', '..', 'cli', 'bin', 'psiform.js');
const LOCK_MS = '3000';

/** Figures become jobs, end to end: api in-process, the compiled worker as a child process, real services. */
describe('mesh pipeline (e2e)', () => {
  let t: TestApp;
  let base: string;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let outsider: string;
  let worker: WorkerProcess | undefined;
  let storage: ObjectStorage;
  const pub = DEMO_PUBLICATION.id;

  const createFigure = async (title: string, recipe: unknown): Promise<string> =>
    (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `${title} ${RUN_ID}`, recipe }).expect(201)).body.id;
  const queueMesh = async (figureId: string): Promise<string> => (await t.http().post(`/api/figures/${figureId}/meshes`).set(auth(tok.illustrator)).expect(201)).body.jobId;
  const getJob = (jobId: string): Promise<JobDto> => jobOf(t, tok.editor, jobId);
  const finished = (jobId: string, timeoutMs = 60000) => jobEnded(t, tok.editor, jobId, timeoutMs);

  /** The SSE stream as the client reads it (fetch with a bearer token). */
  async function events(jobId: string, token = tok.editor): Promise<JobDto[]> {
    const res = await fetch(`${base}/api/jobs/${jobId}/events`, { headers: auth(token) });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/^text\/event-stream/);
    const out: JobDto[] = [];
    for await (const e of readSse(res.body!)) out.push(e as JobDto);
    return out;
  }

  async function download(assetId: string, token = tok.editor): Promise<Uint8Array> {
    const res = await t.http().get(`/api/assets/${assetId}/download`).set(auth(token)).expect(302);
    const url = res.headers.location as string;
    expect(url).toMatch(/X-Amz-Expires=300/);
    const file = await fetch(url);
    expect(file.status).toBe(200);
    return new Uint8Array(await file.arrayBuffer());
  }

  beforeAll(async () => {
    t = await startTestApp();
    await t.app.listen(0, '127.0.0.1');
    base = `http://127.0.0.1:${(t.app.getHttpServer().address() as AddressInfo).port}`;
    tok = await demoTokens(t);
    outsider = (await newAccount(t, tok.admin, { name: 'pipeline-outsider', displayName: 'Outside Viewer', role: 'editor' })).token;
    storage = t.app.get(ObjectStorage);
    worker = await startWorkerProcess({ WORKER_LOCK_MS: LOCK_MS });
  }, 60000);

  afterAll(async () => {
    await worker?.stop();
    await t?.close();
  });

  it('a queued mesh job streams its stages in order and ends completed; the GLB passes the Khronos validator; stats are stored', async () => {
    const figureId = await createFigure('Stream 2p_z', smallRecipe({ grid: { n: 48 } }));
    const jobId = await queueMesh(figureId);
    const seen = await events(jobId);
    expect(seen.length).toBeGreaterThanOrEqual(1);
    const last = seen[seen.length - 1];
    expect(last).toMatchObject({ id: jobId, state: 'completed', stage: 'done', progress: 100 });
    // Stages only move forward (the stream polls the row, so fast stages may be skipped, never reordered).
    const order = seen.map((e) => MESH_STAGES.indexOf(e.stage as (typeof MESH_STAGES)[number]));
    expect(order.every((i) => i >= 0)).toBe(true);
    expect([...order].sort((a, b) => a - b)).toEqual(order);
    expect(seen.map((e) => e.progress)).toEqual([...seen.map((e) => e.progress)].sort((a, b) => a - b));
    expect(last.assets.map((a) => a.kind).sort()).toEqual(['glb', 'stl']);
    expect(Object.keys(last.timings ?? {})).toEqual(expect.arrayContaining(['sample', 'threshold', 'extract', 'encode', 'store', 'total']));

    const glb = last.assets.find((a) => a.kind === 'glb')!;
    const bytes = await download(glb.id);
    expect(bytes.length).toBe(glb.bytes);
    const report = await validator.validateBytes(bytes);
    expect(report.issues.numErrors).toBe(0);

    // 2p_z: two lobes of opposite sign, mirror images through the nodal plane z = 0, each one closed surface.
    const s = glb.stats!;
    expect(s.enclosed).toBeGreaterThan(0.89);
    expect(s.isovalue).toBeGreaterThan(0);
    expect(s.grid).toMatchObject({ n: 48 });
    expect(s.surfaces!.map((x) => x.phase)).toEqual(['+', '-']);
    for (const surf of s.surfaces!) expect(surf).toMatchObject({ watertight: true, components: 1, euler: 2 });
    expect(s.surfaces![0].vertices).toBe(s.surfaces![1].vertices);
    expect(s.surfaces![0].area).toBeCloseTo(s.surfaces![1].area, 6);
    const figure = (await t.http().get(`/api/figures/${figureId}`).set(auth(tok.artDirector)).expect(200)).body;
    expect(figure.assets.map((a: { id: string }) => a.id).sort()).toEqual(last.assets.map((a) => a.id).sort());
  });

  it('acceptance: the CLI recipe for 3d_xy (grid 96, 90% enclosed) is posted, meshed, downloaded and valid', async () => {
    const { stdout } = await promisify(execFile)(process.execPath, [CLI, 'recipe', '--orbital', '3dxy', '--grid', '96', '--enclose', '0.9']);
    const recipe = JSON.parse(stdout);
    const figureId = await createFigure('3d_xy from the CLI', recipe);
    const jobId = await queueMesh(figureId);
    const last = (await events(jobId)).pop()!;
    expect(last.state).toBe('completed');
    const glb = last.assets.find((a) => a.kind === 'glb')!;
    const report = await validator.validateBytes(await download(glb.id));
    expect(report.issues.numErrors).toBe(0);
    // 3d_xy: four lobes, two of each sign (alternating quadrants of the xy plane).
    expect(glb.stats!.surfaces!.map((x) => [x.phase, x.components, x.watertight])).toEqual([
      ['+', 2, true],
      ['-', 2, true],
    ]);
    const stl = last.assets.find((a) => a.kind === 'stl')!;
    const stlBytes = await download(stl.id);
    // Binary STL: 84-byte header + 50 bytes per triangle (the format's fixed record size).
    const triangles = glb.stats!.surfaces!.reduce((n, x) => n + x.triangles, 0);
    expect(stlBytes.length).toBe(84 + 50 * triangles);
  }, 120000);

  it('a box that cuts the surface is said in the job result: warnings with the box to widen to, all-space and in-box fractions', async () => {
    const recipe = { version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 48, extent: 3 }, surface: { rule: 'enclosed', fraction: 0.9 } };
    const job = await finished(await queueMesh(await createFigure('2p_z in a narrow box', recipe)), 120000);
    expect(job.state).toBe('completed');
    const box = job.warnings!.find((w) => w.code === 'box-cuts-surface')!;
    expect(box.message).toMatch(/box/);
    expect(box.suggestedExtent).toBeGreaterThan(3);
    const stats = job.assets.find((a) => a.kind === 'glb')!.stats!;
    // 90% over all space (the level solved against the whole state), of which the ±3 a0 cube holds visibly less.
    expect(stats.enclosed).toBeCloseTo(0.9, 6);
    expect(stats.enclosedInBox!).toBeLessThan(0.8);
    expect(stats.warnings!.map((w) => w.code)).toContain('box-cuts-surface');
    expect(stats.units).toMatchObject({ length: expect.stringContaining('a0') });
  });

  it('a non-member gets 404 for the figure, its job, its event stream and its downloads; the link endpoint gives 5 minutes', async () => {
    const figureId = await createFigure('Members only', smallRecipe({ label: 'members-only' }));
    const jobId = await queueMesh(figureId);
    const job = await finished(jobId);
    expect(job.state).toBe('completed');
    const assetId = job.assets[0].id;
    await t.http().get(`/api/figures/${figureId}`).set(auth(outsider)).expect(404);
    await t.http().get(`/api/jobs/${jobId}`).set(auth(outsider)).expect(404);
    const sse = await fetch(`${base}/api/jobs/${jobId}/events`, { headers: auth(outsider) });
    expect(sse.status).toBe(404);
    const dl = await t.http().get(`/api/assets/${assetId}/download`).set(auth(outsider)).expect(404);
    expect(dl.headers.location).toBeUndefined();
    await t.http().get(`/api/assets/${assetId}/link`).set(auth(outsider)).expect(404);
    await t.http().get(`/api/assets/${assetId}/download`).expect(401);
    const link = (await t.http().get(`/api/assets/${assetId}/link`).set(auth(tok.editor)).expect(200)).body;
    const ttl = (Date.parse(link.expiresAt) - Date.now()) / 1000;
    expect(ttl).toBeGreaterThan(290);
    expect(ttl).toBeLessThanOrEqual(300);
    expect((await fetch(link.url)).status).toBe(200);
  });

  it('queueing again after completion runs a new job that reuses the same objects and asset rows', async () => {
    const figureId = await createFigure('Twice', smallRecipe({ label: 'twice', grid: { n: 36 } }));
    const first = await finished(await queueMesh(figureId));
    const second = await finished(await queueMesh(figureId));
    expect(second.id).not.toBe(first.id);
    expect(second.state).toBe('completed');
    expect(second.assets.map((a) => a.id).sort()).toEqual(first.assets.map((a) => a.id).sort());
    const rows = await t.ds.query(`SELECT a.kind FROM assets a JOIN figure_versions v ON v.id = a.figure_version_id WHERE v.figure_id = $1`, [figureId]);
    expect(rows).toHaveLength(2);
  });

  it('20 jobs queued at once (different figures) all complete, none lost or duplicated', async () => {
    const figureIds = await Promise.all(Array.from({ length: 20 }, (_, i) => createFigure(`Batch ${i}`, smallRecipe({ label: `batch-${i}`, surface: { rule: 'enclosed', fraction: 0.5 + i * 0.02 } }))));
    const jobIds = await Promise.all(figureIds.map(queueMesh));
    const jobs = await Promise.all(jobIds.map((id) => finished(id, 120000)));
    expect(jobs.map((j) => j.state)).toEqual(Array(20).fill('completed'));
    const [{ n }] = await t.ds.query(
      `SELECT count(*)::int AS n FROM assets a JOIN figure_versions v ON v.id = a.figure_version_id WHERE v.figure_id = ANY($1)`,
      [figureIds],
    );
    expect(n).toBe(40);
    const states = await t.ds.query(`SELECT state, count(*)::int AS n FROM jobs WHERE figure_id = ANY($1) GROUP BY state`, [figureIds]);
    expect(states).toEqual([{ state: 'completed', n: 20 }]);
    const fractions = new Set(jobs.map((j) => j.assets[0].stats!.enclosed!.toFixed(2)));
    expect(fractions.size).toBe(20);
  }, 150000);

  it('a worker killed (SIGKILL) during a 160³ job: the next worker completes it, one glb and one stl row, no duplicate objects', async () => {
    await worker!.stop();
    worker = undefined;
    const doomed = await startWorkerProcess({ WORKER_LOCK_MS: LOCK_MS, WORKER_CONCURRENCY: '1' });
    const figureId = await createFigure('Killed mid-job', smallRecipe({ label: 'kill-160', grid: { n: 160 } }));
    const jobId = await queueMesh(figureId);
    try {
      await waitFor('the job to be active', async () => (await getJob(jobId)).state === 'active', 30000, 20);
    } finally {
      await doomed.kill(); // also when the wait failed: a worker left running would take the next specs' jobs
    }
    expect((await getJob(jobId)).state).toBe('active'); // the dead worker could not report anything
    worker = await startWorkerProcess({ WORKER_LOCK_MS: LOCK_MS });
    const job = await finished(jobId, 90000);
    expect(job.state).toBe('completed');
    const [row] = await t.ds.query(`SELECT attempts FROM jobs WHERE id = $1`, [jobId]);
    expect(row.attempts).toBeGreaterThanOrEqual(1);
    const assets = await t.ds.query(
      `SELECT a.kind, a.storage_key FROM assets a JOIN figure_versions v ON v.id = a.figure_version_id WHERE v.figure_id = $1 ORDER BY a.kind`,
      [figureId],
    );
    expect(assets.map((a: { kind: string }) => a.kind)).toEqual(['glb', 'stl']);
    const prefix = (assets[0].storage_key as string).replace(/mesh\.glb$/, '');
    expect((await storage.list(prefix)).sort()).toEqual([`${prefix}mesh.glb`, `${prefix}mesh.stl`]);
    const glb = job.assets.find((a) => a.kind === 'glb')!;
    expect((await validator.validateBytes(await download(glb.id))).issues.numErrors).toBe(0);
  }, 150000);
});
