import { startTestApp, login, RUN_ID, DEMO_PASSWORD, DEMO_PUBLICATION, DEMO_USERS, type TestApp, newAccount } from './support';

describe('publications (e2e)', () => {
  let t: TestApp;
  let admin: string;
  let illustrator: string;
  let editor: string;
  let otherPubId: string;
  const auth = (token: string) => ({ Authorization: `Bearer ${token}` });

  beforeAll(async () => {
    t = await startTestApp();
    admin = (await login(t, 'admin@demo.psiform.test', DEMO_PASSWORD)).accessToken;
    illustrator = (await login(t, 'illustrator@demo.psiform.test', DEMO_PASSWORD)).accessToken;
    editor = (await login(t, 'editor@demo.psiform.test', DEMO_PASSWORD)).accessToken;
    const created = await t
      .http()
      .post('/api/publications')
      .set(auth(admin))
      .send({ title: `Journal of Lattice Notes, vol. 3 ${RUN_ID}`, publisher: 'Sedgefield Press', kind: 'journal_volume' })
      .expect(201);
    otherPubId = created.body.id;
    expect(created.body).toMatchObject({ kind: 'journal_volume', description: '', publisher: 'Sedgefield Press' });
  });
  afterAll(() => t?.close());

  it('every demo user is a member of the demo publication and sees it', async () => {
    const res = await t.http().get('/api/publications').set(auth(illustrator)).expect(200);
    expect(res.body.map((p: { id: string }) => p.id)).toContain(DEMO_PUBLICATION.id);
    const members = await t.http().get(`/api/publications/${DEMO_PUBLICATION.id}/members`).set(auth(illustrator)).expect(200);
    expect(members.body.map((u: { email: string }) => u.email).sort()).toEqual(expect.arrayContaining(DEMO_USERS.map((u) => u.email)));
  });

  it("another publication's data is not visible to a non-member (404), but is to an admin", async () => {
    const list = await t.http().get('/api/publications').set(auth(illustrator)).expect(200);
    expect(list.body.map((p: { id: string }) => p.id)).not.toContain(otherPubId);
    const one = await t.http().get(`/api/publications/${otherPubId}`).set(auth(illustrator)).expect(404);
    expect(one.body).toMatchObject({ statusCode: 404, error: 'Not Found' });
    await t.http().get(`/api/publications/${otherPubId}/members`).set(auth(illustrator)).expect(404);
    await t.http().get(`/api/publications/${otherPubId}`).set(auth(admin)).expect(200);
    const all = await t.http().get('/api/publications').set(auth(admin)).expect(200);
    expect(all.body.map((p: { id: string }) => p.id)).toEqual(expect.arrayContaining([otherPubId, DEMO_PUBLICATION.id]));
  });

  it('an admin adds a member, who then sees the publication; a second add is 409', async () => {
    const editorId = (await t.http().get('/api/auth/me').set(auth(editor)).expect(200)).body.id;
    await t.http().get(`/api/publications/${otherPubId}`).set(auth(editor)).expect(404);
    const added = await t.http().post(`/api/publications/${otherPubId}/members`).set(auth(admin)).send({ userId: editorId }).expect(201);
    expect(added.body).toEqual({ publicationId: otherPubId, userId: editorId, role: 'editor' });
    await t.http().get(`/api/publications/${otherPubId}`).set(auth(editor)).expect(200);
    const members = await t.http().get(`/api/publications/${otherPubId}/members`).set(auth(editor)).expect(200);
    expect(members.body.map((u: { id: string }) => u.id)).toEqual([editorId]);
    await t.http().post(`/api/publications/${otherPubId}/members`).set(auth(admin)).send({ userId: editorId }).expect(409);
  });

  it('adding an unknown user or to an unknown publication is 404; a bad id is 400 naming it', async () => {
    await t.http().post(`/api/publications/${otherPubId}/members`).set(auth(admin)).send({ userId: '00000000-0000-4000-8000-000000000000' }).expect(404);
    await t.http().post('/api/publications/00000000-0000-4000-8000-000000000000/members').set(auth(admin)).send({ userId: '00000000-0000-4000-8000-000000000000' }).expect(404);
    const badBody = await t.http().post(`/api/publications/${otherPubId}/members`).set(auth(admin)).send({ userId: 'me' }).expect(400);
    expect(badBody.body.message).toEqual(['userId must be a UUID']);
    const badParam = await t.http().get('/api/publications/not-a-uuid').set(auth(admin)).expect(400);
    expect(badParam.body.message).toBe('id must be a UUID');
  });

  it('only admins create publications or memberships (403), and bad input is 400 naming the field', async () => {
    await t.http().post('/api/publications').set(auth(editor)).send({ title: `T ${RUN_ID}`, publisher: 'P', kind: 'book' }).expect(403);
    await t.http().post(`/api/publications/${DEMO_PUBLICATION.id}/members`).set(auth(editor)).send({ userId: '00000000-0000-4000-8000-000000000000' }).expect(403);
    const bad = await t.http().post('/api/publications').set(auth(admin)).send({ title: `  `, publisher: 'P', kind: 'pamphlet' }).expect(400);
    expect(bad.body.message).toEqual(expect.arrayContaining(['title must not be empty', 'kind must be one of: book, journal_volume']));
    const [{ n }] = await t.ds.query(`SELECT count(*)::int AS n FROM publications WHERE publisher = 'P'`);
    expect(n).toBe(0);
  });

  it('each publication has one length unit for its figures: art directors choose it, every saved version takes it', async () => {
    const artDirector = (await login(t, 'artdirector@demo.psiform.test', DEMO_PASSWORD)).accessToken;
    const pub = (await t.http().post('/api/publications').set(auth(admin)).send({ title: `Units ${RUN_ID}`, publisher: 'Sedgefield Press', kind: 'book' }).expect(201)).body;
    expect(pub.lengthUnit).toBe('angstrom'); // the default
    for (const email of ['illustrator@demo.psiform.test', 'artdirector@demo.psiform.test']) {
      const u = (await t.http().get('/api/users').query({ q: email }).set(auth(admin)).expect(200)).body.items.find((x: { email: string }) => x.email === email);
      await t.http().post(`/api/publications/${pub.id}/members`).set(auth(admin)).send({ userId: u.id }).expect(201);
    }
    // Bad input names the field; the wrong role is 403; nothing changes.
    const bad = await t.http().put(`/api/publications/${pub.id}/length-unit`).set(auth(artDirector)).send({ lengthUnit: 'parsec' }).expect(400);
    expect(bad.body.message).toEqual(['lengthUnit must be one of: angstrom, bohr']);
    await t.http().put(`/api/publications/${pub.id}/length-unit`).set(auth(illustrator)).send({ lengthUnit: 'bohr' }).expect(403);
    expect((await t.http().get(`/api/publications/${pub.id}`).set(auth(illustrator)).expect(200)).body.lengthUnit).toBe('angstrom');
    const set = await t.http().put(`/api/publications/${pub.id}/length-unit`).set(auth(artDirector)).send({ lengthUnit: 'bohr' }).expect(200);
    expect(set.body.lengthUnit).toBe('bohr');
    // A figure saved in Å (with a fixed Å bar length) is stored in a0: one unit per figure, the publication's.
    const recipe = { version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 32 }, surface: { rule: 'enclosed', fraction: 0.9 }, annotations: { scaleBar: { show: true, unit: 'angstrom', length: 2 } } };
    const fig = (await t.http().post('/api/figures').set(auth(illustrator)).send({ publicationId: pub.id, title: `Unit ${RUN_ID}`, recipe }).expect(201)).body;
    expect(fig.currentVersion.recipe.annotations.scaleBar).toEqual({ show: true, unit: 'bohr' });
    await t.http().put(`/api/publications/${pub.id}/length-unit`).set(auth(artDirector)).send({ lengthUnit: 'angstrom' }).expect(200);
    const next = (await t.http().patch(`/api/figures/${fig.id}`).set(auth(illustrator)).send({ recipe: { ...recipe, grid: { n: 40 } } }).expect(200)).body;
    expect(next.currentVersion.number).toBe(2);
    expect(next.currentVersion.recipe.annotations.scaleBar.unit).toBe('angstrom');

    // A figure set carries its caption (printed under the lettered panels); an over-long one is refused naming the field.
    const setBody = { publicationId: pub.id, title: `Set ${RUN_ID}`, figureIds: [fig.id], columns: 1 };
    const long = await t.http().post('/api/figure-sets').set(auth(illustrator)).send({ ...setBody, caption: 'x'.repeat(2001) }).expect(400);
    expect(long.body.message).toEqual(['caption: must be a text of at most 2000 characters']);
    const created = (await t.http().post('/api/figure-sets').set(auth(illustrator)).send({ ...setBody, caption: 'a, the 2p_z orbital.' }).expect(201)).body;
    expect(created.caption).toBe('a, the 2p_z orbital.');
  });

  it('a fresh user with no memberships sees an empty list', async () => {
    const { token } = await newAccount(t, admin, { name: 'loner', displayName: 'Lone Reader', role: 'editor' });
    const res = await t.http().get('/api/publications').set(auth(token)).expect(200);
    expect(res.body).toEqual([]);
    await t.http().get(`/api/publications/${DEMO_PUBLICATION.id}`).set(auth(token)).expect(404);
  });
});
