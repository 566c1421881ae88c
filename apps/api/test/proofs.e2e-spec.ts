import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { FigureVersionSummaryDto, ReviewDeskItemDto, VersionComparisonDto } from '@psiform/contracts';
import { auth, clearLoginCounters, demoTokens, staffedPublication, smallRecipe, startTestApp, RUN_ID, type TestApp, newAccount } from './support';
import { MailFake, freePort } from './editorial-support';
import { polled, startWorkerProcess, waitFor, type WorkerProcess } from './worker-process';

/**
 * Review that compares: versions with their print images, recipe differences in words, a print-size render of an
 * older version (real worker and Chromium), notices that link straight to the proof, and the review desk's filters.
 */
describe('proofs: compare versions, render a version, desk filters (e2e)', () => {
  let t: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let worker: WorkerProcess | undefined;
  let fake: MailFake;
  let dir: string;
  let pubId: string;
  let figureId: string;
  let outsider: string;
  let otherIllustrator: string;
  const base = 'https://proofs.example.org';

  const post = (path: string, token: string, body: object = {}) => t.http().post(path).set(auth(token)).send(body);
  const get = (path: string, token: string) => t.http().get(path).set(auth(token));

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'psiform-proofs-e2e-'));
    fake = new MailFake(await freePort(), join(dir, 'outbox.jsonl'));
    await fake.start();
    t = await startTestApp({ MAIL_OUTBOX_FILE: fake.outbox, PUBLIC_BASE_URL: base });
    tok = await demoTokens(t);
    pubId = await staffedPublication(t, tok, { title: `Proof Bench ${RUN_ID}`, publisher: 'Harrowgate Press', kind: 'book' });
    outsider = (await newAccount(t, tok.admin, { name: 'proof-outsider', displayName: 'Outside Editor', role: 'editor' })).token;
    otherIllustrator = (await newAccount(t, tok.admin, { name: 'proof-ill2', displayName: 'Second Illustrator', role: 'illustrator', memberOf: pubId })).token;

    // Version 1, then version 2 with a brighter key light and a larger enclosed fraction; a small canvas keeps renders quick.
    const recipe = smallRecipe({ canvas: { widthMm: 30, heightMm: 20, dpi: 300 } });
    figureId = (await post('/api/figures', tok.illustrator, { publicationId: pubId, title: `Figure 5.1 ${RUN_ID}`, recipe }).expect(201)).body.id;
    const v2 = { ...recipe, surface: { rule: 'enclosed', fraction: 0.95 }, stage: { lights: { key: { intensity: 2.7, color: '#fff8ef', azimuthDeg: 35, elevationDeg: 40 } } } };
    await t.http().patch(`/api/figures/${figureId}`).set(auth(tok.illustrator)).send({ recipe: v2 }).expect(200);
    worker = await startWorkerProcess({ SMTP_URL: fake.url });
  }, 90000);

  afterAll(async () => {
    await worker?.stop();
    await clearLoginCounters(t.redis);
    await t?.close();
    await fake?.stop();
    if (dir) rmSync(dir, { recursive: true, force: true });
  }, 30000);

  it('lists the versions newest first and words the differences between any two', async () => {
    const versions = (await get(`/api/figures/${figureId}/versions`, tok.editor).expect(200)).body as FigureVersionSummaryDto[];
    expect(versions.map((v) => [v.number, v.current, v.image])).toEqual([
      [2, true, null],
      [1, false, null],
    ]);
    const cmp = (await get(`/api/figures/${figureId}/compare?from=1&to=2`, tok.editor).expect(200)).body as VersionComparisonDto;
    expect(cmp.summary).toBe('surface 90% → 95%; key light 2.2 → 2.7');
    expect(cmp.changes).toEqual([
      { path: 'surface', what: 'surface', from: '90%', to: '95%' },
      { path: 'stage.lights.key.intensity', what: 'key light', from: '2.2', to: '2.7' },
    ]);
    expect((await get(`/api/figures/${figureId}/compare?from=2&to=1`, tok.editor).expect(200)).body.summary).toBe('surface 95% → 90%; key light 2.7 → 2.2');
    expect((await get(`/api/figures/${figureId}/compare?from=2&to=2`, tok.editor).expect(200)).body.summary).toBe('no change to the recipe');
    expect((await get(`/api/figures/${figureId}/compare?from=0&to=2`, tok.editor).expect(400)).body.message).toEqual(['from must be at least 1']);
    expect((await get(`/api/figures/${figureId}/compare?from=x&to=2`, tok.editor).expect(400)).body.message).toContain('from must be a version number (an integer)');
    expect((await get(`/api/figures/${figureId}/compare?to=2`, tok.editor).expect(400)).body.message).toContain('from must be a version number (an integer)');
    expect((await get(`/api/figures/${figureId}/compare?from=1&to=9`, tok.editor).expect(404)).body.message).toBe(`to: figure ${figureId} has no version 9 (versions 1 to 2)`);
  });

  it('renders an older version at its own print size; the version then states size, dpi and colour mode', async () => {
    const { jobId } = (await post(`/api/figures/${figureId}/versions/1/render`, tok.editor).expect(201)).body;
    const done = await waitFor('the render job', async () => {
      const j = await polled(get(`/api/jobs/${jobId}`, tok.editor));
      if (j?.state === 'failed') throw new Error(`render failed: ${j.error}`);
      return j?.state === 'completed' ? j : null;
    }, 120000, 500);
    expect(done.assets.map((a: { kind: string }) => a.kind)).toContain('png');
    const versions = (await get(`/api/figures/${figureId}/versions`, tok.editor).expect(200)).body as FigureVersionSummaryDto[];
    const v1 = versions.find((v) => v.number === 1)!;
    // 30 mm × 300 dpi / 25.4 = 354.3 -> 354 px; 20 mm -> 236 px (libs/print pixelsFor rounds to the nearest pixel).
    expect(v1.image).toMatchObject({ kind: 'png', widthPx: 354, heightPx: 236, dpi: 300, widthMm: 30, heightMm: 20, colourMode: 'RGB, sRGB (IEC 61966-2-1)' });
    expect(versions.find((v) => v.number === 2)!.image).toBeNull();
    await post(`/api/figures/${figureId}/versions/3/render`, tok.editor).expect(404);
    await post(`/api/figures/${figureId}/versions/one/render`, tok.editor).expect(400);
  }, 150000);

  it('the submit notice links straight to the proof under PUBLIC_BASE_URL, in text and HTML', async () => {
    await post(`/api/figures/${figureId}/submit`, tok.illustrator).expect(200);
    const editorEmail = (await get('/api/auth/me', tok.editor).expect(200)).body.email as string;
    await waitFor('the submit notice', async () => fake.messages().find((m) => m.to.includes(editorEmail) && m.subject.includes(`Figure 5.1 ${RUN_ID}`)), 30000);
    const mail = fake.messages().find((m) => m.to.includes(editorEmail) && m.subject.includes(`Figure 5.1 ${RUN_ID}`))!;
    const url = `${base}/figures/${figureId}/proof`;
    expect(mail.text).toContain(`Open the proof: ${url}`);
    expect(mail.html).toContain(`<a href="${url}"`);
  }, 60000);

  it('the review desk filters by publication, state and age', async () => {
    const desk = (q: string, token = tok.editor) => get(`/api/review-desk${q}`, token);
    const inPub = (await desk(`?publicationId=${pubId}`).expect(200)).body as ReviewDeskItemDto[];
    expect(inPub.map((i) => [i.figureId, i.status])).toEqual([[figureId, 'in_review']]);
    expect((await desk(`?publicationId=${pubId}&minAgeHours=24`).expect(200)).body).toEqual([]);
    expect((await desk(`?publicationId=${pubId}&minAgeHours=0`).expect(200)).body).toHaveLength(1);
    await post(`/api/figures/${figureId}/request-changes`, tok.editor, { note: 'Key light a touch softer, please' }).expect(200);
    expect((await desk(`?publicationId=${pubId}`).expect(200)).body).toEqual([]);
    const changes = (await desk(`?publicationId=${pubId}&state=changes_requested`).expect(200)).body as ReviewDeskItemDto[];
    expect(changes.map((i) => [i.figureId, i.status])).toEqual([[figureId, 'changes_requested']]);
    expect((await desk(`?publicationId=${pubId}`, outsider).expect(404)).body.message).toBe(`publication ${pubId} not found`);
    expect((await desk('?state=draft').expect(400)).body.message).toEqual(['state must be one of: in_review, changes_requested, approved']);
    expect((await desk('?minAgeHours=-1').expect(400)).body.message).toEqual(['minAgeHours must be 0 or more']);
    expect((await desk('?publicationId=nope').expect(400)).body.message).toEqual(['publicationId must be a UUID']);
  });

  it('role × membership matrix of the new routes', async () => {
    const callers: Record<string, string | null> = { admin: tok.admin, owner: tok.illustrator, illustrator2: otherIllustrator, editor: tok.editor, art_director: tok.artDirector, outsider, anonymous: null };
    const read = { admin: 200, owner: 200, illustrator2: 200, editor: 200, art_director: 200, outsider: 404, anonymous: 401 };
    const rows: [string, 'get' | 'post', Record<string, number>][] = [
      [`/api/figures/${figureId}/versions`, 'get', read],
      [`/api/figures/${figureId}/compare?from=1&to=2`, 'get', read],
      [`/api/figures/${figureId}/versions/99/render`, 'post', { admin: 404, owner: 404, illustrator2: 403, editor: 404, art_director: 404, outsider: 404, anonymous: 401 }],
      [`/api/review-desk?publicationId=${pubId}`, 'get', { admin: 200, owner: 403, illustrator2: 403, editor: 200, art_director: 200, outsider: 404, anonymous: 401 }],
    ];
    const wrong: string[] = [];
    for (const [path, method, expected] of rows) {
      for (const [who, token] of Object.entries(callers)) {
        let r = t.http()[method](path);
        if (token) r = r.set(auth(token));
        const res = await r;
        if (res.status !== expected[who]) wrong.push(`${method.toUpperCase()} ${path} as ${who}: ${res.status}, expected ${expected[who]} (${JSON.stringify(res.body)})`);
      }
    }
    expect(wrong).toEqual([]);
  });
});
