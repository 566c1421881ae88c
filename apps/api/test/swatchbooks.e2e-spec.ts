import { converter, differenceCiede2000 } from 'culori';
import { auth, demoTokens, RUN_ID, startTestApp, DEMO_PUBLICATION, type TestApp } from './support';

/** Swatchbooks and house styles over HTTP, real PostgreSQL. */
describe('swatchbooks (e2e)', () => {
  let t: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;
  let lonePub: string;
  const colors = { positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' };
  const name = (n: string) => `${n} ${RUN_ID}`;

  beforeAll(async () => {
    t = await startTestApp();
    tok = await demoTokens(t);
    lonePub = (await t.http().post('/api/publications').set(auth(tok.admin)).send({ title: `No members yet ${RUN_ID}`, publisher: 'Fenwick Lane Books', kind: 'book' }).expect(201)).body.id;
  });
  afterAll(async () => {
    if (!t) return;
    await t.ds.query(`DELETE FROM house_styles WHERE swatchbook_id IN (SELECT id FROM swatchbooks WHERE name LIKE $1)`, [`%${RUN_ID}%`]);
    await t.ds.query(`DELETE FROM swatchbooks WHERE name LIKE $1`, [`%${RUN_ID}%`]);
    await t.close();
  });

  it('an art director creates one (an illustrator may not); bad colours are 400 naming the field and store nothing', async () => {
    await t.http().post('/api/swatchbooks').set(auth(tok.illustrator)).send({ name: name('Forbidden'), publicationId: DEMO_PUBLICATION.id, colors }).expect(403);
    const bad = await t.http().post('/api/swatchbooks').set(auth(tok.artDirector)).send({ name: name('Bad'), publicationId: DEMO_PUBLICATION.id, colors: { ...colors, positive: 'crimson', label: undefined } }).expect(400);
    expect(bad.body.message).toEqual(['colors.positive must be a colour like #1a2b3c (# and six hex digits)', 'colors.label is required']);
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM swatchbooks WHERE name LIKE $1`, [`%${RUN_ID}%`]);
    expect(n).toBe(0);
    const created = await t.http().post('/api/swatchbooks').set(auth(tok.artDirector)).send({ name: name('Brackwater house'), publicationId: DEMO_PUBLICATION.id, colors }).expect(201);
    expect(created.body).toMatchObject({ name: name('Brackwater house'), colors, locked: false, version: 1 });
    // any signed-in user reads it
    expect((await t.http().get(`/api/swatchbooks/${created.body.id}`).set(auth(tok.illustrator)).expect(200)).body.colors).toEqual(colors);
    expect(((await t.http().get('/api/swatchbooks').set(auth(tok.editor)).expect(200)).body as { id: string }[]).map((s) => s.id)).toContain(created.body.id);
    await t.http().get(`/api/swatchbooks/00000000-0000-4000-8000-000000000000`).set(auth(tok.editor)).expect(404);
  });

  it('checks report the phase ΔE00 (CIEDE2000 in CIELAB D65) and its values under colour-vision deficiency', async () => {
    const s = (await t.http().post('/api/swatchbooks').set(auth(tok.artDirector)).send({ name: name('Checked'), publicationId: DEMO_PUBLICATION.id, colors }).expect(201)).body;
    const checks = (await t.http().get(`/api/swatchbooks/${s.id}/checks`).set(auth(tok.illustrator)).expect(200)).body;
    const lab = converter('lab65');
    const expected = differenceCiede2000()(lab(colors.positive)!, lab(colors.negative)!);
    expect(checks.figures.phaseDeltaE2000).toBeCloseTo(expected, 2);
    for (const k of ['phaseDeltaE2000Protan', 'phaseDeltaE2000Deutan', 'phaseDeltaE2000Tritan', 'labelContrast']) expect(typeof checks.figures[k]).toBe('number');
    expect(checks.warnings.filter((w: { code: string }) => w.code === 'phases_too_similar')).toEqual([]);
    const close = (await t.http().post('/api/swatchbooks').set(auth(tok.artDirector)).send({ name: name('Too close'), publicationId: DEMO_PUBLICATION.id, colors: { ...colors, negative: '#c4583f' } }).expect(201)).body;
    const warned = (await t.http().get(`/api/swatchbooks/${close.id}/checks`).set(auth(tok.artDirector)).expect(200)).body;
    expect(warned.warnings).toEqual(expect.arrayContaining([expect.objectContaining({ code: 'phases_too_similar', level: 'error', colors: ['positive', 'negative'] })]));
  });

  it('edits make versions; a locked swatchbook refuses PATCH with 409 until unlocked', async () => {
    const s = (await t.http().post('/api/swatchbooks').set(auth(tok.artDirector)).send({ name: name('Versioned'), publicationId: DEMO_PUBLICATION.id, colors }).expect(201)).body;
    await t.http().patch(`/api/swatchbooks/${s.id}`).set(auth(tok.illustrator)).send({ colors: { negative: '#305f85' } }).expect(403);
    const v2 = (await t.http().patch(`/api/swatchbooks/${s.id}`).set(auth(tok.artDirector)).send({ colors: { negative: '#305F85' } }).expect(200)).body;
    expect(v2).toMatchObject({ version: 2, colors: { ...colors, negative: '#305f85' } });
    const badPatch = await t.http().patch(`/api/swatchbooks/${s.id}`).set(auth(tok.artDirector)).send({ colors: { label: '#12' } }).expect(400);
    expect(badPatch.body.message).toEqual(['colors.label must be a colour like #1a2b3c (# and six hex digits)']);
    expect((await t.http().post(`/api/swatchbooks/${s.id}/lock`).set(auth(tok.artDirector)).expect(200)).body).toMatchObject({ locked: true, version: 3 });
    const refused = await t.http().patch(`/api/swatchbooks/${s.id}`).set(auth(tok.artDirector)).send({ name: name('Renamed') }).expect(409);
    expect(refused.body.message).toContain('is locked');
    expect((await t.http().get(`/api/swatchbooks/${s.id}`).set(auth(tok.artDirector)).expect(200)).body).toMatchObject({ version: 3, name: name('Versioned') });
    await t.http().post(`/api/swatchbooks/${s.id}/unlock`).set(auth(tok.artDirector)).expect(200);
    await t.http().patch(`/api/swatchbooks/${s.id}`).set(auth(tok.artDirector)).send({ name: name('Renamed') }).expect(200);
    const versions = (await t.http().get(`/api/swatchbooks/${s.id}/versions`).set(auth(tok.editor)).expect(200)).body as { version: number; action: string; colors: { negative: string }; locked: boolean }[];
    expect(versions.map((v) => [v.version, v.action, v.locked])).toEqual([
      [1, 'create', false],
      [2, 'update', false],
      [3, 'lock', true],
      [4, 'unlock', false],
      [5, 'update', false],
    ]);
    expect(versions[0].colors.negative).toBe('#2f6690');
  });

  it('export gives a JSON file that import takes back; a bad file is 400', async () => {
    const s = (await t.http().post('/api/swatchbooks').set(auth(tok.artDirector)).send({ name: name('Exported'), publicationId: DEMO_PUBLICATION.id, colors: { ...colors, nucleus: '#333333', wheel: { lightness: 0.7, chroma: 0.1 } } }).expect(201)).body;
    const res = await t.http().get(`/api/swatchbooks/${s.id}/export`).set(auth(tok.illustrator)).expect(200);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename=".+\.swatchbook\.json"$/);
    expect(res.body).toMatchObject({ format: 'psiform-swatchbook', formatVersion: 1, name: name('Exported'), colors: s.colors });
    const imported = (await t.http().post('/api/swatchbooks/import').set(auth(tok.artDirector)).send({ ...res.body, name: name('Imported'), publicationId: DEMO_PUBLICATION.id }).expect(201)).body;
    expect(imported.id).not.toBe(s.id);
    expect(imported.colors).toEqual(s.colors);
    expect(((await t.http().get(`/api/swatchbooks/${imported.id}/versions`).set(auth(tok.artDirector)).expect(200)).body as { action: string }[])[0].action).toBe('import');
    const bad = await t.http().post('/api/swatchbooks/import').set(auth(tok.artDirector)).send({ ...res.body, formatVersion: 7, publicationId: DEMO_PUBLICATION.id }).expect(400);
    expect(bad.body.message).toEqual(['formatVersion must be 1']);
    await t.http().post('/api/swatchbooks/import').set(auth(tok.illustrator)).send({ ...res.body, publicationId: DEMO_PUBLICATION.id }).expect(403);
  });

  it('house style: art directors who are members pin a swatchbook; others get 403 or 404', async () => {
    const s = (await t.http().post('/api/swatchbooks').set(auth(tok.admin)).send({ name: name('Pinned'), colors, publicationId: lonePub }).expect(201)).body;
    const demoBook = (await t.http().post('/api/swatchbooks').set(auth(tok.artDirector)).send({ name: name('Demo only'), colors, publicationId: DEMO_PUBLICATION.id }).expect(201)).body;
    // Another publication's swatchbook cannot be pinned (its colours would flow into this publication's figures).
    const foreign = await t.http().put(`/api/publications/${lonePub}/house-style`).set(auth(tok.admin)).send({ swatchbookId: demoBook.id }).expect(400);
    expect(foreign.body.message).toEqual([`swatchbookId: no swatchbook ${demoBook.id} in this publication`]);
    await t.http().put(`/api/publications/${lonePub}/house-style`).set(auth(tok.artDirector)).send({ swatchbookId: s.id }).expect(404);
    await t.http().put(`/api/publications/${lonePub}/house-style`).set(auth(tok.illustrator)).send({ swatchbookId: s.id }).expect(403);
    const bad = await t.http().put(`/api/publications/${lonePub}/house-style`).set(auth(tok.admin)).send({ swatchbookId: '00000000-0000-4000-8000-000000000000' }).expect(400);
    expect(bad.body.message).toEqual(['swatchbookId: no swatchbook 00000000-0000-4000-8000-000000000000 in this publication']);
    await t.http().get(`/api/publications/${lonePub}/house-style`).set(auth(tok.admin)).expect(404);
    const put = (await t.http().put(`/api/publications/${lonePub}/house-style`).set(auth(tok.admin)).send({ swatchbookId: s.id, requireColourSignOff: true }).expect(200)).body;
    expect(put).toMatchObject({ publicationId: lonePub, swatchbookId: s.id, swatchbookName: name('Pinned'), requireColourSignOff: true, allowOverride: false });
    const wrongType = await t.http().put(`/api/publications/${lonePub}/house-style`).set(auth(tok.admin)).send({ swatchbookId: s.id, allowOverride: 'yes' }).expect(400);
    expect(wrongType.body.message).toEqual(['allowOverride must be true or false']);
    // the demo publication is left without a house style by this suite
    expect((await t.ds.query(`SELECT count(*)::int AS n FROM house_styles WHERE publication_id = $1`, [DEMO_PUBLICATION.id]))[0].n).toBe(0);
  });
});
