import { startTestApp, login, clearLoginCounters, runEmail, DEMO_PASSWORD, DEMO_USERS, type TestApp } from './support';

describe('auth (e2e)', () => {
  let t: TestApp;
  const admin = DEMO_USERS.find((u) => u.role === 'admin')!;
  const throttled = runEmail('throttled');

  beforeAll(async () => {
    t = await startTestApp();
    await clearLoginCounters(t.redis);
  });
  afterAll(async () => {
    await clearLoginCounters(t.redis, [throttled]);
    await t?.close();
  });

  it('signs in with the right password and returns a token and the user without its hash', async () => {
    const res = await t.http().post('/api/auth/login').send({ email: admin.email.toUpperCase(), password: DEMO_PASSWORD }).expect(200);
    expect(typeof res.body.accessToken).toBe('string');
    expect(res.body.user).toMatchObject({ email: admin.email, role: 'admin', displayName: admin.displayName });
    expect(res.body.user).not.toHaveProperty('passwordHash');
  });

  it('answers 401 for a wrong password', async () => {
    const res = await t.http().post('/api/auth/login').send({ email: admin.email, password: 'not-the-password' }).expect(401);
    expect(res.body).toEqual({ statusCode: 401, message: 'email or password is incorrect', error: 'Unauthorized' });
    await clearLoginCounters(t.redis);
  });

  it('answers 401 without a token and with a forged token', async () => {
    await t.http().get('/api/publications').expect(401);
    await t.http().get('/api/auth/me').set('Authorization', 'Bearer not.a.jwt').expect(401);
  });

  it('answers 400 naming the field when the sign-in body is malformed', async () => {
    const res = await t.http().post('/api/auth/login').send({ email: admin.email }).expect(400);
    expect(res.body.message).toEqual(expect.arrayContaining([expect.stringMatching(/^password /)]));
  });

  it.each(DEMO_USERS.map((u) => [u.role, u.email] as const))('demo %s signs in and /api/auth/me reports its role', async (role, email) => {
    const { accessToken } = await login(t, email, DEMO_PASSWORD);
    const me = await t.http().get('/api/auth/me').set('Authorization', `Bearer ${accessToken}`).expect(200);
    expect(me.body).toMatchObject({ email, role });
    expect(me.body).not.toHaveProperty('passwordHash');
  });

  describe('throttling', () => {
    afterEach(() => clearLoginCounters(t.redis, [throttled]));

    it('after 5 failures for one email answers 429 with Retry-After, even for a correct password', async () => {
      for (let i = 0; i < 5; i++) {
        await t.http().post('/api/auth/login').send({ email: throttled, password: `wrong-${i}` }).expect(401);
      }
      const res = await t.http().post('/api/auth/login').send({ email: throttled, password: 'anything-else' }).expect(429);
      expect(res.body).toMatchObject({ statusCode: 429, error: 'Too Many Requests' });
      expect(res.body.message).toMatch(/too many failed sign-in attempts/);
      const retryAfter = Number(res.headers['retry-after']);
      expect(retryAfter).toBeGreaterThan(14 * 60);
      expect(retryAfter).toBeLessThanOrEqual(15 * 60);
      // the IP is blocked too: a correct sign-in from it now also gets 429
      await t.http().post('/api/auth/login').send({ email: admin.email, password: DEMO_PASSWORD }).expect(429);
    });

    it('counts failures per IP across different emails', async () => {
      for (let i = 0; i < 5; i++) {
        await t.http().post('/api/auth/login').send({ email: runEmail(`nobody${i}`), password: 'wrong-password' }).expect(401);
      }
      await t.http().post('/api/auth/login').send({ email: runEmail('nobody-else'), password: 'wrong-password' }).expect(429);
    });

    it('a successful sign-in clears the email counter', async () => {
      await clearLoginCounters(t.redis, [admin.email]);
      for (let i = 0; i < 4; i++) await t.http().post('/api/auth/login').send({ email: admin.email, password: 'wrong-password' }).expect(401);
      await clearLoginCounters(t.redis); // IP only: the email counter stays at 4
      expect(Number(await t.redis.get(`psiform:attempts:login:email:${admin.email}`))).toBe(4);
      await login(t, admin.email, DEMO_PASSWORD);
      expect(await t.redis.get(`psiform:attempts:login:email:${admin.email}`)).toBeNull();
    });
  });
});
