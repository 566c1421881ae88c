import { HealthService, describeFailure } from './health.service';
import { type HealthProbe, type ServiceName } from '@psiform/server';

const probe = (name: ServiceName, check: () => Promise<void>): HealthProbe => ({ name, check });
const ok = (name: ServiceName) => probe(name, async () => undefined);

describe('HealthService', () => {
  it('reports ok when every probe answers', async () => {
    const svc = new HealthService([ok('database'), ok('redis'), ok('storage'), ok('mail')], 100);
    await expect(svc.check()).resolves.toEqual({ status: 'ok', services: { database: 'ok', redis: 'ok', storage: 'ok', mail: 'ok' } });
  });

  it('gives each failing service its own word and reports degraded', async () => {
    const refused = Object.assign(new Error('connect ECONNREFUSED'), { code: 'ECONNREFUSED' });
    const svc = new HealthService(
      [
        ok('database'),
        probe('redis', () => Promise.reject(refused)),
        probe('storage', () => new Promise<void>(() => undefined)), // never answers
        probe('mail', () => Promise.reject(Object.assign(new Error('x'), { code: 'EAUTH' }))),
      ],
      50,
    );
    const started = Date.now();
    const res = await svc.check();
    expect(Date.now() - started).toBeLessThan(1000);
    expect(res).toEqual({ status: 'degraded', services: { database: 'ok', redis: 'unreachable', storage: 'timeout', mail: 'error: EAUTH' } });
  });

  it('a missing probe counts as not ok', async () => {
    const res = await new HealthService([ok('database'), ok('redis'), ok('storage')], 50).check();
    expect(res.status).toBe('degraded');
    expect(res.services.mail).toBe('unknown');
  });
});

describe('describeFailure', () => {
  it('maps the shapes our clients produce', () => {
    expect(describeFailure(Object.assign(new Error(''), { code: 'ESOCKET', originalCode: 'ECONNREFUSED' }))).toBe('unreachable'); // nodemailer
    expect(describeFailure(new AggregateError([Object.assign(new Error(''), { code: 'ECONNREFUSED' })]))).toBe('unreachable'); // net happy eyeballs
    expect(describeFailure(Object.assign(new Error('max'), { name: 'MaxRetriesPerRequestError' }))).toBe('unreachable'); // ioredis
    expect(describeFailure(Object.assign(new Error('nf'), { name: 'NotFound' }))).toBe('error: NotFound'); // AWS SDK HeadBucket 404
    expect(describeFailure(new Error('AWS SDK error wrapper for Error: connect ECONNREFUSED 127.0.0.1:1'))).toBe('unreachable');
    expect(describeFailure(new Error('plain'))).toBe('error: unknown');
  });
});
