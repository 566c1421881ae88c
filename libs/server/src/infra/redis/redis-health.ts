import { Inject, Injectable } from '@nestjs/common';
import type Redis from 'ioredis';
import { REDIS_CLIENT } from './redis.tokens';
import type { HealthProbe } from '../../health/health.probe';

@Injectable()
export class RedisHealthProbe implements HealthProbe {
  readonly name = 'redis' as const;
  constructor(@Inject(REDIS_CLIENT) private readonly redis: Redis) {}

  async check(): Promise<void> {
    const answer = await this.redis.ping();
    if (answer !== 'PONG') throw new Error(`unexpected PING answer ${answer}`);
  }
}
