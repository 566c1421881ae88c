import { ConfigError, loadWorkerConfig } from './config';

describe('loadWorkerConfig', () => {
  it('reads REDIS_URL and defaults WORKER_CONCURRENCY to 2', () => {
    expect(loadWorkerConfig({ REDIS_URL: 'redis://127.0.0.1:6379' })).toEqual({ redis: { url: 'redis://127.0.0.1:6379' }, concurrency: 2 });
    expect(loadWorkerConfig({ REDIS_URL: 'redis://h:1', WORKER_CONCURRENCY: '8' }).concurrency).toBe(8);
  });

  it('names the bad variable', () => {
    expect(() => loadWorkerConfig({})).toThrow('Invalid configuration: REDIS_URL is required (a redis:// URL)');
    expect(() => loadWorkerConfig({ REDIS_URL: 'http://h:1' })).toThrow('REDIS_URL must be a redis:// URL');
    for (const bad of ['0', '-1', '1.5', 'two', '65']) {
      expect(() => loadWorkerConfig({ REDIS_URL: 'redis://h:1', WORKER_CONCURRENCY: bad })).toThrow('WORKER_CONCURRENCY must be an integer from 1 to 64');
    }
  });

  it('reports every problem at once', () => {
    try {
      loadWorkerConfig({ REDIS_URL: 'x', WORKER_CONCURRENCY: 'x' });
      throw new Error('expected ConfigError');
    } catch (err) {
      expect((err as ConfigError).problems).toHaveLength(2);
    }
  });
});
