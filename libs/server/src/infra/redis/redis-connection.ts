import { Logger } from '@nestjs/common';
import Redis from 'ioredis';

/**
 * The one way Psiform opens a Redis connection.
 * - 'requests' (api clients, queue producers): a command fails after one retry and a connect after 2 s, so a request
 *   path answers quickly while Redis is down instead of queueing commands for a long time.
 * - 'worker' (BullMQ Workers): BullMQ requires maxRetriesPerRequest null (stack notes) and waits for Redis to return.
 * ioredis reconnects by itself; only the first error of each outage is logged (/api/health reports it).
 */
export function openRedis(url: string, role: 'requests' | 'worker', name = 'Redis'): Redis {
  const redis =
    role === 'worker'
      ? new Redis(url, { maxRetriesPerRequest: null })
      : new Redis(url, { maxRetriesPerRequest: 1, connectTimeout: 2000, retryStrategy: (times) => Math.min(times * 200, 2000) });
  const log = new Logger(name);
  let down = false;
  redis.on('error', (err: Error) => {
    if (!down) log.warn(`Redis connection problem: ${err.message}`);
    down = true;
  });
  redis.on('ready', () => {
    if (down) log.log('Redis connection restored');
    down = false;
  });
  return redis;
}

/** Quit politely, or drop the connection when Redis does not answer. */
export async function closeRedis(redis: Redis | undefined): Promise<void> {
  if (redis) await redis.quit().catch(() => redis.disconnect());
}
