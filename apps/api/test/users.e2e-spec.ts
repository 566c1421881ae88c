import { startTestApp, login, runEmail, DEMO_PASSWORD, type TestApp } from './support';

describe('users (e2e)', () => {
  let t: TestApp;
  let adminToken: string;
  let illustratorToken: string;

  beforeAll(async () => {
    t = await startTestApp();
    adminToken = (await login(t, 'admin@demo.psiform.test', DEMO_PASSWORD)).accessToken;
    illustratorToken = (await login(t, 'illustrator@demo.psiform.test', DEMO_PASSWORD)).accessToken;
  });
  afterAll(() => t?.close());

  const post = (token: string, body: object) => t.http().post('/api/users').set('Authorization', `Bearer ${token}`).send(body);

  it('an admin creates a user (email lower-cased) who can then sign in', async () => {
    const email = runEmail('Colourist');
    const res = await post(adminToken, { email: email.toUpperCase(), displayName: 'Nell Ashgrove', password: 'long-enough-pw', role: 'illustrator' }).expect(201);
    expect(res.body).toMatchObject({ email: email.toLowerCase(), displayName: 'Nell Ashgrove', role: 'illustrator' });
    expect(res.body).not.toHaveProperty('passwordHash');
    const signedIn = await login(t, email, 'long-enough-pw');
    expect(signedIn.user.id).toBe(res.body.id);
    const list = await t.http().get('/api/users').query({ q: email, pageSize: 100 }).set('Authorization', `Bearer ${adminToken}`).expect(200);
    expect(list.body.items.map((u: { email: string }) => u.email)).toEqual([email.toLowerCase()]);
    expect(list.body.items.every((u: object) => !('passwordHash' in u))).toBe(true);
  });

  it('answers 409 for a duplicate email (any case) and stores nothing', async () => {
    const email = runEmail('dup');
    await post(adminToken, { email, displayName: 'First', password: 'long-enough-pw', role: 'editor' }).expect(201);
    const res = await post(adminToken, { email: email.toUpperCase(), displayName: 'Second', password: 'long-enough-pw', role: 'editor' }).expect(409);
    expect(res.body).toMatchObject({ statusCode: 409, error: 'Conflict' });
    const [{ n }] = await t.ds.query('SELECT count(*)::int AS n FROM users WHERE email = $1', [email.toLowerCase()]);
    expect(n).toBe(1);
  });

  it('answers 400 naming the field on validation errors and stores nothing', async () => {
    const email = runEmail('invalid');
    const short = await post(adminToken, { email, displayName: 'Short Pw', password: 'nine-char', role: 'editor' }).expect(400);
    expect(short.body).toMatchObject({ statusCode: 400, error: 'Bad Request', message: ['password must be at least 10 characters'] });
    const role = await post(adminToken, { email, displayName: 'X', password: 'long-enough-pw', role: 'superuser' }).expect(400);
    expect(role.body.message).toEqual(['role must be one of: illustrator, editor, art_director, admin']);
    const extra = await post(adminToken, { email, displayName: 'X', password: 'long-enough-pw', role: 'editor', isRoot: true }).expect(400);
    expect(extra.body.message).toEqual(['property isRoot should not exist']);
    const badEmail = await post(adminToken, { email: 'not-an-email', displayName: 'X', password: 'long-enough-pw', role: 'editor' }).expect(400);
    expect(badEmail.body.message).toEqual(['email must be a valid email address']);
    const [{ n }] = await t.ds.query('SELECT count(*)::int AS n FROM users WHERE email = $1', [email]);
    expect(n).toBe(0);
  });

  it('answers 403 when an illustrator tries to create or list users', async () => {
    const res = await post(illustratorToken, { email: runEmail('nope'), displayName: 'X', password: 'long-enough-pw', role: 'admin' }).expect(403);
    expect(res.body).toMatchObject({ statusCode: 403, error: 'Forbidden', message: 'this action requires the role admin' });
    await t.http().get('/api/users').set('Authorization', `Bearer ${illustratorToken}`).expect(403);
  });
});
