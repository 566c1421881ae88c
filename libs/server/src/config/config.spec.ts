import { ConfigError, loadConfig, loadDatabaseConfig } from './config';

const good = {
  DATABASE_URL: 'postgres://u:p@127.0.0.1:5432/db',
  REDIS_URL: 'redis://127.0.0.1:6379',
  S3_ENDPOINT: 'http://127.0.0.1:4569',
  S3_BUCKET: 'bucket',
  S3_ACCESS_KEY_ID: 'key',
  S3_SECRET_ACCESS_KEY: 'secret',
  SMTP_URL: 'smtp://127.0.0.1:2525',
  JWT_SECRET: 'x'.repeat(32),
};

function problemsOf(env: Record<string, string | undefined>): string[] {
  try {
    loadConfig(env);
  } catch (err) {
    expect(err).toBeInstanceOf(ConfigError);
    return (err as ConfigError).problems;
  }
  throw new Error('expected a ConfigError');
}

describe('loadConfig', () => {
  it('accepts a complete environment and applies the documented defaults', () => {
    const c = loadConfig(good);
    expect(c.database.url).toBe(good.DATABASE_URL);
    expect(c.s3).toEqual({ endpoint: good.S3_ENDPOINT, bucket: 'bucket', accessKeyId: 'key', secretAccessKey: 'secret', region: 'us-east-1' });
    expect(c.smtp.from).toBe('Psiform <no-reply@psiform.test>');
    expect(c.jwt.ttl).toBe('8h');
    expect(c.http).toEqual({ port: 3000, host: '127.0.0.1', webDist: undefined, trustProxy: false, publicBaseUrl: 'http://127.0.0.1:3000' });
    expect(c.uploads.maxBytes).toBe(536870912);
    expect(c.uploads.orphanAgeSeconds).toBe(21600);
    expect(c.limits.requestsPerMinute).toBe(1200);
    expect(c.database.requestTimeoutMs).toBe(1500);
  });

  it('DB_REQUEST_TIMEOUT_MS: whole milliseconds from 100 to 600000', () => {
    expect(loadConfig({ ...good, DB_REQUEST_TIMEOUT_MS: '15000' }).database.requestTimeoutMs).toBe(15000);
    expect(problemsOf({ ...good, DB_REQUEST_TIMEOUT_MS: '50' }).join()).toContain('DB_REQUEST_TIMEOUT_MS');
    expect(problemsOf({ ...good, DB_REQUEST_TIMEOUT_MS: 'soon' }).join()).toContain('DB_REQUEST_TIMEOUT_MS');
  });

  it('PUBLIC_BASE_URL: an http(s) URL without query or fragment, trailing slash dropped; default from HOST and PORT', () => {
    expect(loadConfig({ ...good, PUBLIC_BASE_URL: 'https://figures.example.org/' }).http.publicBaseUrl).toBe('https://figures.example.org');
    expect(loadConfig({ ...good, PUBLIC_BASE_URL: 'https://example.org/psiform/' }).http.publicBaseUrl).toBe('https://example.org/psiform');
    expect(loadConfig({ ...good, PORT: '4100', HOST: '0.0.0.0' }).http.publicBaseUrl).toBe('http://127.0.0.1:4100');
    expect(loadConfig({ ...good, PORT: '0' }).http.publicBaseUrl).toBe('http://127.0.0.1:3000');
    expect(problemsOf({ ...good, PUBLIC_BASE_URL: 'figures.example.org' })).toEqual(['PUBLIC_BASE_URL must be an http:// or https:// URL such as https://figures.example.org']);
    expect(problemsOf({ ...good, PUBLIC_BASE_URL: 'ftp://example.org' })[0]).toMatch(/^PUBLIC_BASE_URL must be an http/);
    expect(problemsOf({ ...good, PUBLIC_BASE_URL: 'https://example.org/?a=1' })).toEqual(['PUBLIC_BASE_URL must not have a query or fragment']);
    expect(problemsOf({ ...good, PUBLIC_BASE_URL: 'https://example.org/#x' })).toEqual(['PUBLIC_BASE_URL must not have a query or fragment']);
    expect(problemsOf({ ...good, PUBLIC_BASE_URL: 'https://u:p@example.org' })).toEqual(['PUBLIC_BASE_URL must not contain credentials']);
  });

  it('reads UPLOAD_MAX_BYTES and names it when bad', () => {
    expect(loadConfig({ ...good, UPLOAD_MAX_BYTES: '1000' }).uploads.maxBytes).toBe(1000);
    expect(problemsOf({ ...good, UPLOAD_MAX_BYTES: '0' })[0]).toMatch(/^UPLOAD_MAX_BYTES must be an integer/);
    expect(problemsOf({ ...good, UPLOAD_MAX_BYTES: '1.5e6' })[0]).toMatch(/^UPLOAD_MAX_BYTES must be an integer/);
    expect(loadConfig({ ...good, UPLOAD_ORPHAN_AGE_SECONDS: '60' }).uploads.orphanAgeSeconds).toBe(60);
    expect(problemsOf({ ...good, UPLOAD_ORPHAN_AGE_SECONDS: '0' })[0]).toMatch(/^UPLOAD_ORPHAN_AGE_SECONDS must be an integer/);
    expect(problemsOf({ ...good, RATE_LIMIT_PER_MINUTE: '-1' })[0]).toMatch(/^RATE_LIMIT_PER_MINUTE must be an integer/);
  });

  it('reads overrides', () => {
    const c = loadConfig({ ...good, PORT: '8081', HOST: '0.0.0.0', JWT_TTL: '30m', WEB_DIST: '/srv/web', S3_REGION: 'eu-west-1', TRUST_PROXY: 'loopback, 10.0.0.0/8' });
    expect(c.http).toEqual({ port: 8081, host: '0.0.0.0', webDist: '/srv/web', trustProxy: ['loopback', '10.0.0.0/8'], publicBaseUrl: 'http://127.0.0.1:8081' });
    expect(c.jwt.ttl).toBe('30m');
    expect(c.s3.region).toBe('eu-west-1');
  });

  it('reads TRUST_PROXY as Express reads trust proxy, and names it when bad', () => {
    expect(loadConfig({ ...good, TRUST_PROXY: '1' }).http.trustProxy).toBe(1);
    expect(loadConfig({ ...good, TRUST_PROXY: 'true' }).http.trustProxy).toBe(true);
    expect(loadConfig({ ...good, TRUST_PROXY: 'false' }).http.trustProxy).toBe(false);
    expect(problemsOf({ ...good, TRUST_PROXY: 'everyone' })[0]).toMatch(/^TRUST_PROXY must be false, true, a hop count/);
  });

  it('names DATABASE_URL when it is not a postgres URL', () => {
    expect(problemsOf({ ...good, DATABASE_URL: 'mysql://h/db' })).toEqual(['DATABASE_URL must be a postgres:// URL']);
    expect(problemsOf({ ...good, DATABASE_URL: 'not a url' })).toEqual(['DATABASE_URL must be a postgres:// URL']);
  });

  it('names each missing variable', () => {
    const p = problemsOf({});
    for (const name of ['DATABASE_URL', 'REDIS_URL', 'S3_ENDPOINT', 'S3_BUCKET', 'S3_ACCESS_KEY_ID', 'S3_SECRET_ACCESS_KEY', 'SMTP_URL', 'JWT_SECRET']) {
      expect(p.some((m) => m.startsWith(name + ' '))).toBe(true);
    }
    expect(p.some((m) => m.startsWith('PORT'))).toBe(false);
  });

  it('rejects a short JWT secret, a bad TTL, a bad port and wrong schemes', () => {
    expect(problemsOf({ ...good, JWT_SECRET: 'x'.repeat(31) })).toEqual(['JWT_SECRET must be at least 32 characters']);
    expect(problemsOf({ ...good, JWT_TTL: 'eight hours' })[0]).toMatch(/^JWT_TTL must be a duration/);
    expect(problemsOf({ ...good, PORT: '70000' })[0]).toMatch(/^PORT must be an integer/);
    expect(problemsOf({ ...good, PORT: '3k' })[0]).toMatch(/^PORT must be an integer/);
    expect(problemsOf({ ...good, REDIS_URL: 'http://x:1' })).toEqual(['REDIS_URL must be a redis:// URL']);
    expect(problemsOf({ ...good, SMTP_URL: 'smtps://x:1' })).toEqual(['SMTP_URL must be an smtp://host:port URL']);
    expect(problemsOf({ ...good, S3_ENDPOINT: 'ftp://x' })).toEqual(['S3_ENDPOINT must be an http:// or https:// URL']);
  });

  it('the message starts with "Invalid configuration:"', () => {
    expect(() => loadConfig({ ...good, DATABASE_URL: '' })).toThrow('Invalid configuration: DATABASE_URL is required (a postgres:// URL)');
  });
});

describe('loadDatabaseConfig', () => {
  it('needs only DATABASE_URL', () => {
    expect(loadDatabaseConfig({ DATABASE_URL: good.DATABASE_URL })).toEqual({ url: good.DATABASE_URL });
    expect(() => loadDatabaseConfig({ DATABASE_URL: 'redis://x' })).toThrow('DATABASE_URL must be a postgres:// URL');
  });
});
