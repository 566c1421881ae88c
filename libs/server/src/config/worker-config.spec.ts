import { ConfigError, DEFAULT_WEB_DIST, loadWorkerConfig } from './config';

const good = {
  REDIS_URL: 'redis://127.0.0.1:6379',
  DATABASE_URL: 'postgres://u:p@127.0.0.1:5432/db',
  S3_ENDPOINT: 'http://127.0.0.1:4569',
  S3_BUCKET: 'bucket',
  S3_ACCESS_KEY_ID: 'key',
  S3_SECRET_ACCESS_KEY: 'secret',
};

describe('loadWorkerConfig', () => {
  it('reads the services and defaults WORKER_CONCURRENCY to 2 and WORKER_LOCK_MS to 30 s', () => {
    expect(loadWorkerConfig(good)).toEqual({
      redis: { url: good.REDIS_URL },
      database: { url: good.DATABASE_URL },
      s3: { endpoint: good.S3_ENDPOINT, bucket: 'bucket', accessKeyId: 'key', secretAccessKey: 'secret', region: 'us-east-1' },
      concurrency: 2,
      lockMs: 30000,
      render: { webDist: DEFAULT_WEB_DIST, chromiumPath: '/usr/bin/chromium', thumbnails: true, timeoutMs: 120000 },
      outbox: { sweepMs: 30000, staleMs: 60000 },
    });
    expect(DEFAULT_WEB_DIST).toMatch(/apps\/web\/dist$/);
    expect(loadWorkerConfig({ ...good, THUMBNAILS: 'off', WEB_DIST: '/srv/web' }).render).toMatchObject({ thumbnails: false, webDist: '/srv/web' });
    expect(() => loadWorkerConfig({ ...good, THUMBNAILS: 'maybe' })).toThrow('THUMBNAILS must be on or off');
    expect(loadWorkerConfig({ ...good, WORKER_CONCURRENCY: '8', WORKER_LOCK_MS: '5000' })).toMatchObject({ concurrency: 8, lockMs: 5000 });
  });

  it('names the bad variable', () => {
    expect(() => loadWorkerConfig({ ...good, REDIS_URL: '' })).toThrow('Invalid configuration: REDIS_URL is required (a redis:// URL)');
    expect(() => loadWorkerConfig({ ...good, REDIS_URL: 'http://h:1' })).toThrow('REDIS_URL must be a redis:// URL');
    expect(() => loadWorkerConfig({ ...good, DATABASE_URL: 'mysql://h/db' })).toThrow('DATABASE_URL must be a postgres:// URL');
    expect(() => loadWorkerConfig({ ...good, S3_BUCKET: ' ' })).toThrow('S3_BUCKET is required');
    for (const bad of ['0', '-1', '1.5', 'two', '65']) {
      expect(() => loadWorkerConfig({ ...good, WORKER_CONCURRENCY: bad })).toThrow('WORKER_CONCURRENCY must be an integer from 1 to 64');
    }
    expect(() => loadWorkerConfig({ ...good, WORKER_LOCK_MS: '10' })).toThrow('WORKER_LOCK_MS must be an integer from 1000 to 600000');
  });

  it('reports every problem at once', () => {
    try {
      loadWorkerConfig({ REDIS_URL: 'x', WORKER_CONCURRENCY: 'x' });
      throw new Error('expected ConfigError');
    } catch (err) {
      const p = (err as ConfigError).problems;
      for (const name of ['REDIS_URL', 'DATABASE_URL', 'S3_ENDPOINT', 'S3_BUCKET', 'S3_ACCESS_KEY_ID', 'S3_SECRET_ACCESS_KEY', 'WORKER_CONCURRENCY']) {
        expect(p.some((m) => m.startsWith(name + ' '))).toBe(true);
      }
    }
  });
});
