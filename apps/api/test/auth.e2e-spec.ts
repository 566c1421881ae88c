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

  describe('throttling (real Redis: one Lua script per attempt, counted before the password check)', () => {
    afterEach(() => clearLoginCounters(t.redis, [throttled, admin.email]));
    const tryLogin = (app: TestApp, email: string, password: string, xff?: string) => {
      const r = app.http().post('/api/auth/login');
      return (xff ? r.set('X-Forwarded-For', xff) : r).send({ email, password });
    };
    const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

    it('30 parallel guesses at one account: only the 5 free ones reach the password check, the rest get 429 + Retry-After', async () => {
      const res = await Promise.all(Array.from({ length: 30 }, (_, i) => tryLogin(t, throttled, `parallel-guess-${i}`)));
      const codes = res.map((r) => r.status);
      expect(codes.filter((c) => c === 401 || c === 429)).toHaveLength(30);
      expect(codes.filter((c) => c === 401)).toHaveLength(5);
      expect(codes.filter((c) => c === 429)).toHaveLength(25);
      const refused = res.find((r) => r.status === 429)!;
      expect(refused.body).toMatchObject({ statusCode: 429, error: 'Too Many Requests' });
      expect(refused.body.message).toMatch(/^too many failed sign-in attempts; try again in \d+ seconds?$/);
      expect(Number(refused.headers['retry-after'])).toBeGreaterThanOrEqual(1);
      expect(Number(refused.headers['retry-after'])).toBeLessThanOrEqual(5);
      expect(await t.redis.hget(`psiform:attempts:login:email:${throttled}`, 'n')).toBe('5');
    }, 60_000);

    it('an admin is never locked out: after the back-off the right password signs in and clears the count', async () => {
      for (let i = 0; i < 5; i++) await tryLogin(t, admin.email, `wrong-${i}`).expect(401);
      const refused = await tryLogin(t, admin.email, DEMO_PASSWORD).expect(429);
      await sleep(Number(refused.headers['retry-after']) * 1000 + 100);
      await tryLogin(t, admin.email, DEMO_PASSWORD).expect(200);
      expect(await t.redis.exists(`psiform:attempts:login:email:${admin.email}`)).toBe(0);
    }, 60_000);

    it('without TRUST_PROXY no address is throttled (the socket address may be a proxy shared by everyone)', async () => {
      for (let i = 0; i < 35; i++) await tryLogin(t, runEmail(`nobody${i}`), 'wrong-password', '203.0.113.7').expect(401);
      await login(t, admin.email, DEMO_PASSWORD);
      expect(await t.redis.keys('psiform:attempts:login:ip:*')).toEqual([]);
    }, 60_000);

    it('behind a configured trust proxy the client address (X-Forwarded-For) gets its own, more lenient back-off', async () => {
      const proxied = await startTestApp({ TRUST_PROXY: 'loopback' });
      try {
        for (let i = 0; i < 30; i++) await tryLogin(proxied, runEmail(`spray${i}`), 'wrong-password', '203.0.113.9').expect(401);
        await tryLogin(proxied, admin.email, DEMO_PASSWORD, '203.0.113.9').expect(429);
        // Another client behind the same proxy is not affected, and the refusal did not count against the admin.
        await tryLogin(proxied, admin.email, DEMO_PASSWORD, '198.51.100.4').expect(200);
        expect(await proxied.redis.hget('psiform:attempts:login:ip:203.0.113.9', 'n')).toBe('30');
      } finally {
        await clearLoginCounters(proxied.redis);
        await proxied.close();
      }
    }, 60_000);
  });
});
