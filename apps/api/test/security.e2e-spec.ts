import { auth, demoTokens, login, startTestApp, DEMO_PASSWORD, DEMO_USERS, type TestApp } from './support';

/** Security headers, caching of signed-in answers and the general rate limit (issue "Stays up and stays scoped"). */
describe('security headers and rate limits (e2e)', () => {
  let t: TestApp;
  let tok: Awaited<ReturnType<typeof demoTokens>>;

  beforeAll(async () => {
    t = await startTestApp();
    tok = await demoTokens(t);
  }, 60_000);
  afterAll(() => t?.close());

  it('every answer carries nosniff, frame protection, a referrer policy and a CSP without inline or eval scripts', async () => {
    for (const res of [await t.http().get('/api/health'), await t.http().get('/api/publications').set(auth(tok.editor)), await t.http().get('/api/nope')]) {
      expect(res.headers['x-content-type-options']).toBe('nosniff');
      expect(res.headers['x-frame-options']).toBe('DENY');
      expect(res.headers['referrer-policy']).toBe('no-referrer');
      expect(res.headers['x-powered-by']).toBeUndefined();
      const csp: string = res.headers['content-security-policy'];
      const directive = (name: string) => csp.split(';').map((d) => d.trim()).find((d) => d.startsWith(`${name} `));
      expect(directive('script-src')).toBe("script-src 'self'");
      expect(directive('frame-ancestors')).toBe("frame-ancestors 'none'");
      expect(directive('object-src')).toBe("object-src 'none'");
      // Presigned storage links are fetched by the client: the storage origin is allowed for connect and img.
      expect(directive('connect-src')).toContain(new URL(process.env.S3_ENDPOINT!).origin);
    }
  });

  it('signed-in JSON is never cached (Cache-Control: no-store)', async () => {
    const res = await t.http().get('/api/auth/me').set(auth(tok.illustrator)).expect(200);
    expect(res.headers['cache-control']).toBe('no-store');
    const login = await t.http().post('/api/auth/login').send({ email: DEMO_USERS[0].email, password: DEMO_PASSWORD }).expect(200);
    expect(login.headers['cache-control']).toBe('no-store');
  });

  it('the general rate limit answers 429 with Retry-After per account, and leaves health checks alone', async () => {
    const limited = await startTestApp({ RATE_LIMIT_PER_MINUTE: '5' });
    try {
      const { accessToken } = await login(limited, 'editor@demo.psiform.test', DEMO_PASSWORD);
      const other = (await login(limited, 'artdirector@demo.psiform.test', DEMO_PASSWORD)).accessToken;
      const codes: number[] = [];
      for (let i = 0; i < 7; i++) codes.push((await limited.http().get('/api/publications').set(auth(accessToken))).status);
      expect(codes.slice(0, 5)).toEqual([200, 200, 200, 200, 200]);
      expect(codes.slice(5)).toEqual([429, 429]);
      const refused = await limited.http().get('/api/publications').set(auth(accessToken)).expect(429);
      expect(refused.body.message).toMatch(/^too many requests; try again in \d+ seconds$/);
      expect(Number(refused.headers['retry-after'])).toBeGreaterThan(0);
      await limited.http().get('/api/publications').set(auth(other)).expect(200); // another account is not affected
      for (let i = 0; i < 8; i++) await limited.http().get('/api/health').expect(200);
    } finally {
      await limited.close();
    }
  }, 60_000);
});
