import { loadWorkerConfig } from './config';

const base = {
  REDIS_URL: 'redis://127.0.0.1:6379',
  DATABASE_URL: 'postgres://u:p@127.0.0.1:5432/db',
  S3_ENDPOINT: 'http://127.0.0.1:4569',
  S3_BUCKET: 'bucket',
  S3_ACCESS_KEY_ID: 'key',
  S3_SECRET_ACCESS_KEY: 'secret',
};

describe('worker mail configuration', () => {
  it('SMTP_URL and MAIL_FROM (default as in the api) when set; absent otherwise', () => {
    expect(loadWorkerConfig({ ...base, SMTP_URL: 'smtp://127.0.0.1:2525' }).smtp).toEqual({ url: 'smtp://127.0.0.1:2525', from: 'Psiform <no-reply@psiform.test>' });
    expect(loadWorkerConfig({ ...base, SMTP_URL: 'smtp://h:1', MAIL_FROM: 'Desk <desk@x.test>' }).smtp?.from).toBe('Desk <desk@x.test>');
    expect(loadWorkerConfig(base).smtp).toBeUndefined();
  });
  it('names a bad SMTP_URL', () => {
    expect(() => loadWorkerConfig({ ...base, SMTP_URL: 'http://h:1' })).toThrow('SMTP_URL must be an smtp://host:port URL');
  });
});
