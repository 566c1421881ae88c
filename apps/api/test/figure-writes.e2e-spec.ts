import { execFileSync } from 'node:child_process';
import type { AuditEntryDto, FigureDto } from '@psiform/contracts';
import { auth, demoTokens, smallRecipe, startTestApp, DEMO_PUBLICATION, RUN_ID, type TestApp } from './support';
import { waitFor } from './worker-process';

/**
 * The one writer of figure versions (FiguresService.saveVersion) and the outbox, end to end without a worker:
 * PATCH is one transaction under the figure's row lock with its audit entries; a title PATCH racing a submit never
 * renames a proof; a notice written while Redis stalls is sent once Redis answers again.
 */
describe('figure writes and the outbox (e2e)', () => {
  let t: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  const pub = DEMO_PUBLICATION.id;

  beforeAll(async () => {
    t = await startTestApp();
    tok = await demoTokens(t);
  });
  afterAll(async () => {
    await t?.close();
  });

  const create = async (title: string): Promise<FigureDto> =>
    (await t.http().post('/api/figures').set(auth(tok.illustrator)).send({ publicationId: pub, title: `${title} ${RUN_ID}`, recipe: smallRecipe() }).expect(201)).body;
  const audit = async (id: string): Promise<AuditEntryDto[]> => (await t.http().get(`/api/figures/${id}/audit`).set(auth(tok.editor)).expect(200)).body;
  const versions = async (id: string) => (await t.ds.query(`SELECT count(*)::int AS n FROM figure_versions WHERE figure_id = $1`, [id]))[0].n as number;

  it('PATCH of title and recipe is one write: a new version, the new title, and both audit entries; the same recipe again adds nothing', async () => {
    const f = await create('Figure 2.1 2p_z');
    const recipe = smallRecipe({ palette: { positive: '#aa3311', negative: '#1133aa' } });
    const res = await t.http().patch(`/api/figures/${f.id}`).set(auth(tok.illustrator)).send({ title: `Figure 2.1 2p_z lobes ${RUN_ID}`, recipe }).expect(200);
    expect(res.body).toMatchObject({ title: `Figure 2.1 2p_z lobes ${RUN_ID}`, currentVersion: { number: 2 } });
    const entries = await audit(f.id);
    expect(entries.map((e) => e.action)).toEqual(['revise', 'retitle']);
    expect(entries[0]).toMatchObject({ fromStatus: 'draft', toStatus: 'draft', note: 'version 2 created' });
    expect(entries[1].note).toBe(`title "Figure 2.1 2p_z ${RUN_ID}" → "Figure 2.1 2p_z lobes ${RUN_ID}"`);
    // Idempotent: the same recipe (and title) again is no new version and no new audit entry.
    await t.http().patch(`/api/figures/${f.id}`).set(auth(tok.illustrator)).send({ title: `Figure 2.1 2p_z lobes ${RUN_ID}`, recipe }).expect(200);
    expect(await versions(f.id)).toBe(2);
    expect(await audit(f.id)).toHaveLength(2);
  });

  it('a bad recipe in a PATCH changes nothing, not even the title sent with it', async () => {
    const f = await create('Figure 2.2 3d_xy');
    const bad = smallRecipe({ grid: { n: 4 } });
    await t.http().patch(`/api/figures/${f.id}`).set(auth(tok.illustrator)).send({ title: `Renamed ${RUN_ID}`, recipe: bad }).expect(400);
    const after = (await t.http().get(`/api/figures/${f.id}`).set(auth(tok.editor)).expect(200)).body;
    expect(after.title).toBe(f.title);
    expect(await versions(f.id)).toBe(1);
    expect(await audit(f.id)).toEqual([]);
  });

  it('a title PATCH racing a submit never renames a proof in review (8 races)', async () => {
    for (let i = 0; i < 8; i++) {
      const f = await create(`Race ${i}`);
      const [patch, submit] = await Promise.all([
        t.http().patch(`/api/figures/${f.id}`).set(auth(tok.illustrator)).send({ title: `Race ${i} renamed ${RUN_ID}` }),
        t.http().post(`/api/figures/${f.id}/submit`).set(auth(tok.illustrator)).send({}),
      ]);
      expect(submit.status).toBe(200);
      expect([200, 409]).toContain(patch.status);
      const entries = await audit(f.id);
      const submitAt = entries.findIndex((e) => e.action === 'submit');
      const retitleAt = entries.findIndex((e) => e.action === 'retitle');
      const now = (await t.http().get(`/api/figures/${f.id}`).set(auth(tok.editor)).expect(200)).body;
      expect(now.status).toBe('in_review');
      if (patch.status === 409) {
        // The submit held the lock first: the proof keeps the title it was submitted with.
        expect(patch.body.message).toBe('cannot edit a figure that is in_review: allowed only from draft or changes_requested');
        expect(now.title).toBe(f.title);
        expect(retitleAt).toBe(-1);
      } else {
        // The rename committed before the submit: the proof was submitted with the new title.
        expect(now.title).toBe(`Race ${i} renamed ${RUN_ID}`);
        expect(retitleAt).toBeGreaterThanOrEqual(0);
        expect(retitleAt).toBeLessThan(submitAt);
      }
    }
  }, 60000);

  it('a notice written while Redis does not answer is kept in the outbox and queued once Redis is back', async () => {
    const f = await create('Figure 2.4 stalled queue');
    const port = new URL(process.env.REDIS_URL!).port;
    // Every client's writes wait for 4 s: the relay's add times out (3 s), the request itself never touches Redis.
    execFileSync('redis-cli', ['-p', port, 'CLIENT', 'PAUSE', '4000', 'WRITE']);
    const t0 = Date.now();
    await t.http().post(`/api/figures/${f.id}/submit`).set(auth(tok.illustrator)).send({}).expect(200);
    expect(Date.now() - t0).toBeLessThan(2000);
    const rows = async () => t.ds.query(`SELECT id, state, last_error, payload FROM outbox WHERE name = 'notice' AND payload->>'subject' LIKE $1`, [`%${f.title}%`]);
    const [pending] = await rows();
    expect(pending.state).toBe('pending');
    expect(pending.payload.to.length).toBeGreaterThan(0);
    const [relayed] = await waitFor('the notice relayed after the pause', async () => {
      const r = await rows();
      return r[0]?.state !== 'pending' ? r : undefined;
    }, 20000, 100);
    expect(['relayed', 'done']).toContain(relayed.state);
    expect(await rows()).toHaveLength(1); // one notice, whatever the retries
  }, 30000);
});
