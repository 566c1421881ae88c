import { Logger } from '@nestjs/common';
import Redis from 'ioredis';
import { requestRedisOptions } from './request-redis';

/**
 * The one way Psiform opens a Redis connection.
 * - 'requests' (api clients, queue producers): request-redis.ts's options: a command fails after one retry, a connect
 *   after 2 s and a stalled command after 1 s, so a request path answers 503 quickly while Redis is down or stalled.
 * - 'worker' (BullMQ Workers): BullMQ requires maxRetriesPerRequest null (stack notes) and waits for Redis to return.
 * ioredis reconnects by itself; only the first error of each outage is logged (/api/health reports it).
 */
export function openRedis(url: string, role: 'requests' | 'worker', name = 'Redis'): Redis {
  const redis =
    role === 'worker'
      ? new Redis(url, { maxRetriesPerRequest: null })
      : new Redis(url, requestRedisOptions());
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
