import { Inject, Injectable } from '@nestjs/common';
import type Redis from 'ioredis';
import { AttemptCounter, type AttemptCount } from './attempt-counter';
import { REDIS_CLIENT } from './redis.tokens';

const PREFIX = 'psiform:attempts:';

@Injectable()
export class RedisAttemptCounter extends AttemptCounter {
  constructor(@Inject(REDIS_CLIENT) private readonly redis: Redis) {
    super();
  }

  async peek(key: string): Promise<AttemptCount> {
    const [[, count], [, ttl]] = (await this.redis.multi().get(PREFIX + key).ttl(PREFIX + key).exec()) as [[null, string | null], [null, number]];
    return { count: Number(count ?? 0), retryAfterSeconds: Math.max(0, ttl) };
  }

  async hit(key: string, windowSeconds: number): Promise<AttemptCount> {
    // EXPIRE ... NX (Redis 7) sets the window only on the first hit: a fixed window from the first failure.
    const res = (await this.redis.multi().incr(PREFIX + key).expire(PREFIX + key, windowSeconds, 'NX').ttl(PREFIX + key).exec()) as [
      [null, number],
      [null, number],
      [null, number],
    ];
    return { count: res[0][1], retryAfterSeconds: Math.max(0, res[2][1]) };
  }

  async clear(key: string): Promise<void> {
    await this.redis.del(PREFIX + key);
  }
}
