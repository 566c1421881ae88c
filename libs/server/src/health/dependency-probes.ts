import type Redis from 'ioredis';
import type { DataSource } from 'typeorm';
import type { HealthProbe } from './health.probe';
import type { ObjectStorage } from '../infra/storage/object-storage';
import type { Mailer } from '../infra/mail/mailer';

/**
 * The api's dependency checks (GET /api/health), in the order the response lists them. Each is one call on the client
 * the app already holds, so one list serves all four instead of a probe class per service.
 */
export function dependencyProbes(c: { ds: DataSource; redis: Redis; storage: ObjectStorage; mailer: Mailer }): HealthProbe[] {
  return [
    {
      name: 'database',
      check: async () => {
        await c.ds.query('SELECT 1');
      },
    },
    {
      name: 'redis',
      check: async () => {
        const answer = await c.redis.ping();
        if (answer !== 'PONG') throw new Error(`unexpected PING answer ${answer}`);
      },
    },
    { name: 'storage', check: () => c.storage.check() },
    { name: 'mail', check: () => c.mailer.verify() },
  ];
}
