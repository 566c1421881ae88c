import type { BatchDto, FigureDto, JobDto } from '@psiform/contracts';
import { auth, demoTokens, staffedPublication, smallRecipe, startTestApp, RUN_ID, type TestApp } from './support';
import { polled, startWorkerProcess, waitFor, type WorkerProcess } from './worker-process';

/** Batch re-render after a swatchbook change: api in this process, the compiled worker as its own process (as in production), real services. */
describe('batch re-render (e2e)', () => {
  let t: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let worker: WorkerProcess | undefined;
  let pubId: string;
  let sbId: string;
  const tiny = () => smallRecipe({ grid: { n: 16 } });
  const post = (path: string, token: string, body: object = {}) => t.http().post(path).set(auth(token)).send(body);
  const getFigure = async (id: string): Promise<FigureDto> => (await t.http().get(`/api/figures/${id}`).set(auth(tok.editor)).expect(200)).body;

  beforeAll(async () => {
    t = await startTestApp();
    tok = await demoTokens(t);
    pubId = await staffedPublication(t, tok, { title: `Periodic Trends Workbook ${RUN_ID}`, publisher: 'Fenwick Lane Books', kind: 'book' });
    sbId = (await post('/api/swatchbooks', tok.artDirector, { name: `Workbook palette ${RUN_ID}`, publicationId: pubId, colors: { positive: '#c8553d', negative: '#2f6690', background: '#fbfaf7', label: '#1a1a1a' } }).expect(201)).body.id;
    await t.http().put(`/api/publications/${pubId}/house-style`).set(auth(tok.artDirector)).send({ swatchbookId: sbId }).expect(200);
    worker = await startWorkerProcess({});
  }, 60000);

  afterAll(async () => {
    await worker?.stop();
    if (t) {
      await t.ds.query(`DELETE FROM house_styles WHERE publication_id = $1`, [pubId]);
      await t.ds.query(`DELETE FROM swatchbooks WHERE id = $1`, [sbId]); // its batches cascade
      await t.close(); // figures, then the publication
    }
  }, 30000);

  it('re-renders the 10 draft figures with the new colours and leaves approved proofs untouched', async () => {
    const figures: string[] = [];
    for (let i = 1; i <= 12; i++) {
      figures.push((await post('/api/figures', tok.illustrator, { publicationId: pubId, title: `Figure 7.${i} ${RUN_ID}`, recipe: tiny() }).expect(201)).body.id);
    }
    // two approved proofs, one of them with meshes already made
    const [approvedA, approvedB] = figures.slice(10);
    const meshJob = (await post(`/api/figures/${approvedA}/meshes`, tok.illustrator).expect(201)).body.jobId as string;
    await waitFor('the first mesh', async () => {
      const j: JobDto | undefined = await polled(t.http().get(`/api/jobs/${meshJob}`).set(auth(tok.editor)));
      return j?.state === 'completed' ? j : undefined;
    }, 60000, 200);
    for (const id of [approvedA, approvedB]) {
      await post(`/api/figures/${id}/submit`, tok.illustrator).expect(200);
      await post(`/api/figures/${id}/approve`, tok.editor).expect(200);
    }
    const snapshot = async (id: string) => ({
      versions: await t.ds.query(`SELECT id, number, recipe_hash FROM figure_versions WHERE figure_id = $1 ORDER BY number`, [id]),
      assets: await t.ds.query(`SELECT a.id, a.sha256 FROM assets a JOIN figure_versions v ON v.id = a.figure_version_id WHERE v.figure_id = $1 ORDER BY a.id`, [id]),
    });
    const before = { a: await snapshot(approvedA), b: await snapshot(approvedB) };
    expect(before.a.assets.length).toBeGreaterThan(0);

    // the art director changes the palette and starts the batch (others may not)
    await t.http().patch(`/api/swatchbooks/${sbId}`).set(auth(tok.artDirector)).send({ colors: { positive: '#b3402a', negative: '#245a86' } }).expect(200);
    await post(`/api/publications/${pubId}/rerender`, tok.illustrator).expect(403);
    await post(`/api/publications/${pubId}/rerender`, tok.editor).expect(403);
    const batch: BatchDto = (await post(`/api/publications/${pubId}/rerender`, tok.artDirector).expect(201)).body;
    expect(batch.total).toBe(10);
    expect(batch.jobs.map((j) => j.figureId).sort()).toEqual(figures.slice(0, 10).sort());
    expect(batch.skipped.map((s) => [s.figureId, s.reason]).sort()).toEqual(
      [approvedA, approvedB].map((id) => [id, 'status is approved: only draft and changes_requested figures are re-rendered']).sort(),
    );

    const done: BatchDto = await waitFor('the batch to finish', async () => {
      const b: BatchDto | undefined = await polled(t.http().get(`/api/batches/${batch.batchId}`).set(auth(tok.illustrator)));
      return b && b.state !== 'running' ? b : undefined;
    }, 120000, 300);
    expect(done).toMatchObject({ state: 'completed', total: 10, completed: 10, failed: 0 });

    for (const id of figures.slice(0, 10)) {
      const f = await getFigure(id);
      expect(f.status).toBe('draft');
      expect(f.currentVersion.number).toBe(2);
      expect(f.currentVersion.recipe.palette).toEqual({ swatchbookId: sbId, positive: '#b3402a', negative: '#245a86' });
      expect(f.assets.map((a) => a.kind).sort()).toEqual(expect.arrayContaining(['glb']));
    }
    const audit = (await t.http().get(`/api/figures/${figures[0]}/audit`).set(auth(tok.editor)).expect(200)).body;
    expect(audit.at(-1)).toMatchObject({ action: 'rerender', fromStatus: 'draft', toStatus: 'draft' });
    expect(audit.at(-1).note).toContain(`Workbook palette ${RUN_ID}`);

    // approved proofs: same versions, same assets, still approved with the old colours
    expect(await snapshot(approvedA)).toEqual(before.a);
    expect(await snapshot(approvedB)).toEqual(before.b);
    const a = await getFigure(approvedA);
    expect(a.status).toBe('approved');
    expect(a.currentVersion.recipe.palette.positive).toBe('#c8553d');

    // Idempotent: re-rendering again with unchanged colours adds no version and queues no job.
    const jobsBefore = (await t.ds.query(`SELECT count(*)::int AS n FROM jobs WHERE figure_id = ANY($1)`, [figures]))[0].n;
    const again: BatchDto = (await post(`/api/publications/${pubId}/rerender`, tok.artDirector).expect(201)).body;
    expect(again.total).toBe(0);
    expect(again.skipped.filter((s) => s.reason === `already has the colours of swatchbook "Workbook palette ${RUN_ID}" v2`).map((s) => s.figureId).sort()).toEqual(figures.slice(0, 10).sort());
    for (const id of figures.slice(0, 10)) expect((await getFigure(id)).currentVersion.number).toBe(2);
    expect((await t.ds.query(`SELECT count(*)::int AS n FROM jobs WHERE figure_id = ANY($1)`, [figures]))[0].n).toBe(jobsBefore);

    // an unknown batch is 404
    await t.http().get('/api/batches/00000000-0000-4000-8000-000000000000').set(auth(tok.admin)).expect(404);
  }, 180000);
});
