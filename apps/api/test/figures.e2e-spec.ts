import { Queue } from 'bullmq';
import { fractionProblem, gridProblem, QUEUES, RECIPE_LIMITS } from '@psiform/contracts';
import { auth, demoTokens, smallRecipe, startTestApp, DEMO_PUBLICATION, RUN_ID, type TestApp, newAccount } from './support';
import { waitFor } from './worker-process';

/** Figures API without a worker: create / read / edit / list, roles, membership, and refused recipes. */
describe('figures (e2e)', () => {
  let t: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let outsider: string;
  let meshQueue: Queue;
  const pub = DEMO_PUBLICATION.id;

  const counts = async () => {
    const [[f], [v], [j], [o]] = await Promise.all([
      t.ds.query(`SELECT count(*)::int AS n FROM figures`),
      t.ds.query(`SELECT count(*)::int AS n FROM figure_versions`),
      t.ds.query(`SELECT count(*)::int AS n FROM jobs`),
      t.ds.query(`SELECT count(*)::int AS n FROM outbox`),
    ]);
    const q = await meshQueue.getJobCounts('waiting', 'delayed', 'active', 'completed', 'failed', 'prioritized', 'waiting-children');
    return { figures: f.n, versions: v.n, jobs: j.n, outbox: o.n, queued: Object.values(q).reduce((a, b) => a + b, 0) };
  };

  beforeAll(async () => {
    t = await startTestApp();
    tok = await demoTokens(t);
    outsider = (await newAccount(t, tok.admin, { name: 'outsider', displayName: 'Outside Reader', role: 'illustrator' })).token;
    meshQueue = new Queue(QUEUES.mesh, { connection: { url: process.env.REDIS_URL! } });
  });
  afterAll(async () => {
    await meshQueue?.close();
    await t?.close();
  });

  it('an illustrator creates a figure: version 1, the defaults-filled recipe, its hash and the engine version', async () => {
    const res = await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `  Lobes of 2p_z ${RUN_ID} `, recipe: smallRecipe() }).expect(201);
    const f = res.body;
    expect(f).toMatchObject({ publicationId: pub, title: `Lobes of 2p_z ${RUN_ID}`, status: 'draft', assets: [] });
    expect(f.currentVersion).toMatchObject({ number: 1, locked: false, figureId: f.id });
    expect(f.currentVersion.engineVersion).toMatch(/^meshing-\d+\.\d+\.\d+_orbitals-\d+\.\d+\.\d+$/);
    // Defaults filled in by parseRecipe (contracts): imaginary part, extent, palette, canvas.
    expect(f.currentVersion.recipe.content.terms[0].im).toBe(0);
    expect(f.currentVersion.recipe.grid.extent).toBe('auto');
    expect(f.currentVersion.recipe.canvas).toEqual({ widthMm: 89, heightMm: 60, dpi: 300 });
    const [row] = await t.ds.query(`SELECT recipe_hash FROM figure_versions WHERE figure_id = $1`, [f.id]);
    expect(row.recipe_hash).toMatch(/^[0-9a-f]{64}$/);
    const got = await t.http().get(`/api/figures/${f.id}`).set(auth(tok.editor)).expect(200);
    expect(got.body.currentVersion.id).toBe(f.currentVersion.id);
    await t.http().get(`/api/figures/${f.id}`).set(auth(tok.artDirector)).expect(200);
  });

  it('equal recipes written in a different key order hash equally', async () => {
    const a = smallRecipe();
    const b = { surface: a.surface, grid: a.grid, content: a.content, label: a.label, version: 1 };
    const [ra, rb] = await Promise.all(
      [a, b].map((recipe) => t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Order ${RUN_ID}`, recipe }).expect(201)),
    );
    const hashes = await t.ds.query(`SELECT recipe_hash FROM figure_versions WHERE figure_id = ANY($1)`, [[ra.body.id, rb.body.id]]);
    expect(hashes).toHaveLength(2);
    expect(hashes[0].recipe_hash).toBe(hashes[1].recipe_hash);
  });

  it('PATCH: a recipe change is a new version (number + 1, current); versions are never modified; the title changes alone', async () => {
    const created = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Edits ${RUN_ID}`, recipe: smallRecipe() }).expect(201)).body;
    const v1 = created.currentVersion;
    const titled = (await t.http().patch(`/api/figures/${created.id}`).set(auth(tok.illustrator)).send({ title: `Edits renamed ${RUN_ID}` }).expect(200)).body;
    expect(titled.title).toBe(`Edits renamed ${RUN_ID}`);
    expect(titled.currentVersion.number).toBe(1);
    const same = (await t.http().patch(`/api/figures/${created.id}`).set(auth(tok.illustrator)).send({ recipe: smallRecipe() }).expect(200)).body;
    expect(same.currentVersion.id).toBe(v1.id);
    const changed = (await t.http().patch(`/api/figures/${created.id}`).set(auth(tok.illustrator)).send({ recipe: smallRecipe({ grid: { n: 40 } }) }).expect(200)).body;
    expect(changed.currentVersion.number).toBe(2);
    expect(changed.currentVersion.recipe.grid.n).toBe(40);
    const rows = await t.ds.query(`SELECT number, recipe FROM figure_versions WHERE figure_id = $1 ORDER BY number`, [created.id]);
    expect(rows.map((r: { number: number }) => r.number)).toEqual([1, 2]);
    expect(rows[0].recipe.grid.n).toBe(32);
    // A locked version (a proof) cannot change even by a direct UPDATE: the database refuses it.
    await t.ds.query(`UPDATE figure_versions SET locked = true WHERE figure_id = $1 AND number = 2`, [created.id]);
    await expect(t.ds.query(`UPDATE figure_versions SET recipe_hash = repeat('0', 64) WHERE figure_id = $1 AND number = 2`, [created.id])).rejects.toThrow(/is locked/);
    // PATCH with the same recipe on a locked current version makes version 3 instead of touching 2.
    const after = (await t.http().patch(`/api/figures/${created.id}`).set(auth(tok.illustrator)).send({ recipe: smallRecipe({ grid: { n: 40 } }) }).expect(200)).body;
    expect(after.currentVersion).toMatchObject({ number: 3, locked: false });
    const bad = await t.http().patch(`/api/figures/${created.id}`).set(auth(tok.illustrator)).send({ recipe: smallRecipe({ grid: { n: 8 } }) }).expect(400);
    // The words of contracts limits.ts gridProblem: the Composer shows the same under its grid field.
    expect(bad.body.message).toEqual([`recipe.grid.n: grid.n ${gridProblem(8)}`]);
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM figure_versions WHERE figure_id = $1`, [created.id]);
    expect(n).toBe(3);
  });

  it('roles: editors and art directors read but cannot create, edit or queue (403); a bad title is 400', async () => {
    const f = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Roles ${RUN_ID}`, recipe: smallRecipe() }).expect(201)).body;
    await t.http().post('/api/figures').set(auth(tok.editor)).send({ publicationId: pub, title: `No ${RUN_ID}`, recipe: smallRecipe() }).expect(403);
    await t.http().patch(`/api/figures/${f.id}`).set(auth(tok.artDirector)).send({ title: 'x' }).expect(403);
    await t.http().post(`/api/figures/${f.id}/meshes`).set(auth(tok.editor)).expect(403);
    await t.http().post('/api/figures').set(auth(tok.admin)).send({ publicationId: pub, title: `Admin made ${RUN_ID}`, recipe: smallRecipe() }).expect(201);
    const empty = await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: '   ', recipe: smallRecipe() }).expect(400);
    expect(empty.body.message).toEqual(['title must not be empty']);
    const long = await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: 'x'.repeat(201), recipe: smallRecipe() }).expect(400);
    expect(long.body.message).toEqual(['title must be at most 200 characters (this one has 201)']); // the wording of contracts titleProblem, as the client shows it
  });

  it('a non-member gets 404 for the figure, for creating in the publication and for queueing', async () => {
    const f = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Private ${RUN_ID}`, recipe: smallRecipe() }).expect(201)).body;
    await t.http().get(`/api/figures/${f.id}`).set(auth(outsider)).expect(404);
    await t.http().patch(`/api/figures/${f.id}`).set(auth(outsider)).send({ title: 'mine now' }).expect(404);
    await t.http().post(`/api/figures/${f.id}/meshes`).set(auth(outsider)).expect(404);
    await t.http().post('/api/figures').set(auth(outsider)).send({ publicationId: pub, title: `Intruder ${RUN_ID}`, recipe: smallRecipe() }).expect(404);
    const list = await t.http().get('/api/figures').set(auth(outsider)).expect(200);
    expect(list.body).toEqual({ items: [], total: 0, page: 1, pageSize: 20 });
    await t.http().get(`/api/figures?publicationId=${pub}`).set(auth(outsider)).expect(404);
  });

  it('lists with paging, search, status filter and sorting, only from member publications', async () => {
    const tag = `Listing-${RUN_ID}`;
    for (const name of ['alpha', 'beta', 'gamma']) {
      await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `${tag} ${name}`, recipe: smallRecipe({ label: `lbl-${name}` }) }).expect(201);
    }
    const p1 = await t.http().get(`/api/figures?publicationId=${pub}&q=${tag}&sort=title&order=asc&pageSize=2&page=1`).set(auth(tok.editor)).expect(200);
    expect(p1.body.total).toBe(3);
    expect(p1.body.items.map((i: { title: string }) => i.title)).toEqual([`${tag} alpha`, `${tag} beta`]);
    expect(p1.body.items[0]).toMatchObject({ publicationId: pub, status: 'draft', versionNumber: 1, label: 'lbl-alpha', ownerName: expect.any(String) });
    const p2 = await t.http().get(`/api/figures?q=${tag}&sort=title&order=asc&pageSize=2&page=2`).set(auth(tok.editor)).expect(200);
    expect(p2.body).toMatchObject({ total: 3, page: 2, pageSize: 2 });
    expect(p2.body.items.map((i: { title: string }) => i.title)).toEqual([`${tag} gamma`]);
    // Every column the library offers to sort by is one the server accepts (FIGURE_SORT_KEYS, libs/contracts).
    const byVersion = await t.http().get(`/api/figures?q=${tag}&sort=versionNumber&order=desc`).set(auth(tok.editor)).expect(200);
    expect(byVersion.body.total).toBe(3);
    const none = await t.http().get(`/api/figures?q=${tag}&status=approved`).set(auth(tok.editor)).expect(200);
    expect(none.body.total).toBe(0);
    // '%' and '_' in q are literal characters, not wildcards.
    const literal = await t.http().get(`/api/figures?q=${encodeURIComponent('%')}${tag}`).set(auth(tok.editor)).expect(200);
    expect(literal.body.total).toBe(0);
    const bad = await t.http().get('/api/figures?pageSize=500&status=lost&sort=size').set(auth(tok.editor)).expect(400);
    expect(bad.body.message).toEqual(expect.arrayContaining(['pageSize must be 1..100', expect.stringMatching(/^status must be one of/), expect.stringMatching(/^sort must be one of/)]));
  });

  describe('malformed recipes are refused with 400 naming the field, and nothing is stored or queued', () => {
    const cases: Array<[string, Record<string, unknown>, string]> = [
      ['l >= n', smallRecipe({ content: { Z: 1, terms: [{ n: 2, l: 2, m: 0, basis: 'real', re: 1 }] } }), 'recipe.content.terms.0.l: l must be less than n (got n=2, l=2)'],
      ['grid over the limit', smallRecipe({ grid: { n: RECIPE_LIMITS.gridMax + 1 } }), `recipe.grid.n: grid.n ${gridProblem(RECIPE_LIMITS.gridMax + 1)}`],
      ['NaN as a string', smallRecipe({ content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 'NaN' }] } }), 'recipe.content.terms.0.re: re must be a number'],
      ['null coefficient', smallRecipe({ content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: null }] } }), 'recipe.content.terms.0.re: re must be a number'],
      ['fraction 1', smallRecipe({ surface: { rule: 'enclosed', fraction: 1 } }), `recipe.surface.fraction: fraction ${fractionProblem(1)}`],
    ];
    it.each(cases)('%s', async (_name, recipe, message) => {
      const before = await counts();
      const res = await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Refused ${RUN_ID}`, recipe }).expect(400);
      expect(res.body.message).toContain(message);
      expect(await counts()).toEqual(before);
    });

    it('a missing recipe and an upload source naming no uploaded cube', async () => {
      const before = await counts();
      const missing = await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Refused ${RUN_ID}` }).expect(400);
      expect(missing.body.message).toEqual(['recipe is required']);
      const source = { kind: 'upload', assetId: '00000000-0000-4000-8000-000000000000', sha256: 'a'.repeat(64), sizes: [8, 8, 8], spacing: [1, 1, 1], origin: [0, 0, 0], quantity: 'psi' };
      const ghost = await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Refused ${RUN_ID}`, recipe: smallRecipe({ source }) }).expect(400);
      expect(ghost.body.message).toEqual(['recipe.source.assetId: no uploaded cube 00000000-0000-4000-8000-000000000000 in this publication']);
      expect(await counts()).toEqual(before);
    });
  });

  it('queueing creates one Job row (queued) and its outbox row in one transaction; the relay makes it one BullMQ job, with retries', async () => {
    const f = (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `Queue ${RUN_ID}`, recipe: smallRecipe() }).expect(201)).body;
    const { jobId } = (await t.http().post(`/api/figures/${f.id}/meshes`).set(auth(tok.illustrator)).expect(201)).body;
    const job = (await t.http().get(`/api/jobs/${jobId}`).set(auth(tok.editor)).expect(200)).body;
    expect(job).toMatchObject({ id: jobId, type: 'mesh', figureId: f.id, assets: [] });
    expect(['queued', 'active', 'completed']).toContain(job.state);
    const [row] = await t.ds.query(`SELECT bull_job_id FROM jobs WHERE id = $1`, [jobId]);
    const [outbox] = await t.ds.query(`SELECT name, payload FROM outbox WHERE id = $1`, [row.bull_job_id]);
    expect(outbox).toEqual({ name: 'mesh', payload: { jobId, params: {} } });
    // The relay (every 200 ms) puts it on the mesh queue under the outbox row's id, then marks the row relayed.
    const bull = await waitFor('the relayed BullMQ job', () => meshQueue.getJob(row.bull_job_id), 10000);
    expect(bull.data).toEqual({ jobId, params: {} });
    await waitFor('the outbox row marked relayed', async () => (await t.ds.query(`SELECT state FROM outbox WHERE id = $1`, [row.bull_job_id]))[0].state !== 'pending', 10000);
    expect(bull?.opts.attempts).toBe(3);
    expect(bull?.opts.backoff).toEqual({ type: 'exponential', delay: 1000 });
    await t.http().get(`/api/jobs/${jobId}`).set(auth(outsider)).expect(404);
    await t.http().get(`/api/jobs/${jobId}/events`).set(auth(outsider)).expect(404);
    // Nobody processes it in this file: remove it so no later worker picks it up. (Clean-up only: a worker another
    // spec left running may already hold it, and then it finishes the job itself.)
    await bull?.remove().catch((err: Error) => {
      if (!/locked/.test(err.message)) throw err;
    });
  });
});
