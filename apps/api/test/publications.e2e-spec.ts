import { startTestApp, login, runEmail, RUN_ID, DEMO_PASSWORD, DEMO_PUBLICATION, DEMO_USERS, type TestApp } from './support';

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

  it('a fresh user with no memberships sees an empty list', async () => {
    const email = runEmail('loner');
    await t.http().post('/api/users').set(auth(admin)).send({ email, displayName: 'Lone Reader', password: 'long-enough-pw', role: 'editor' }).expect(201);
    const token = (await login(t, email, 'long-enough-pw')).accessToken;
    const res = await t.http().get('/api/publications').set(auth(token)).expect(200);
    expect(res.body).toEqual([]);
    await t.http().get(`/api/publications/${DEMO_PUBLICATION.id}`).set(auth(token)).expect(404);
  });
});
