import request from 'supertest';
import { startTestApp, runEmail, RUN_ID, e2eConfig, type TestApp } from './support';
import { createApp } from '../src/app.factory';
import { ObjectStorage, Mailer } from '@psiform/server';

describe('health and adapters (e2e)', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await startTestApp();
  });
  afterAll(() => t?.close());

  it('GET /api/health is public and reports every service ok', async () => {
    const res = await t.http().get('/api/health').expect(200);
    expect(res.body).toEqual({ status: 'ok', services: { database: 'ok', redis: 'ok', storage: 'ok', mail: 'ok' } });
  });

  it('storage adapter: the bucket exists after start-up; put, get and a presigned GET round-trip the bytes', async () => {
    const storage = t.app.get(ObjectStorage);
    const key = `e2e/${RUN_ID}/probe.bin`;
    const bytes = Buffer.from([0, 1, 2, 250, 251, 252, 10, 13]);
    await storage.put(key, bytes, 'application/octet-stream');
    expect(Buffer.compare(await storage.get(key), bytes)).toBe(0);
    const url = await storage.presignGet(key, 60);
    const res = await fetch(url);
    expect(res.status).toBe(200);
    expect(Buffer.compare(Buffer.from(await res.arrayBuffer()), bytes)).toBe(0);
  });

  it('mail adapter: the SMTP server accepts a message', async () => {
    const to = runEmail('mailcheck');
    await expect(t.app.get(Mailer).send({ to, subject: 'Psiform e2e', text: 'hello' })).resolves.toEqual([to]);
  });

  it('answers 503 "degraded" with its own word for each down service, quickly', async () => {
    const config = e2eConfig();
    // Port 1 on loopback: nothing listens there, so connections are refused.
    const broken = { ...config, s3: { ...config.s3, endpoint: 'http://127.0.0.1:1' }, smtp: { ...config.smtp, url: 'smtp://127.0.0.1:1' } };
    const app = await createApp(broken, { logger: false });
    await app.init();
    try {
      const started = Date.now();
      const res = await request(app.getHttpServer()).get('/api/health').expect(503);
      expect(Date.now() - started).toBeLessThan(5000);
      expect(res.body).toEqual({ status: 'degraded', services: { database: 'ok', redis: 'ok', storage: 'unreachable', mail: 'unreachable' } });
    } finally {
      await app.close();
    }
  });
});
