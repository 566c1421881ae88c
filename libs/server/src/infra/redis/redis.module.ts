import { Global, Inject, Logger, Module, type OnApplicationShutdown } from '@nestjs/common';
import Redis from 'ioredis';
import { APP_CONFIG } from '../../config/config.tokens';
import type { AppConfig } from '../../config/config';
import { REDIS_CLIENT } from './redis.tokens';
import { requestRedisOptions } from './request-redis';
import { AttemptGate } from './attempt-gate';
import { RedisAttemptGate } from './redis-attempt-gate';
import { RedisHealthProbe } from './redis-health';

@Global()
@Module({
  providers: [
    {
      provide: REDIS_CLIENT,
      inject: [APP_CONFIG],
      useFactory: (config: AppConfig) => {
        // Fail a command quickly when Redis is down or stalled instead of waiting for it (request-redis.ts).
        const redis = new Redis(config.redis.url, requestRedisOptions());
        // ioredis reconnects by itself; log the first error of each outage only (health reports it).
        const log = new Logger('Redis');
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
      },
    },
    { provide: AttemptGate, useClass: RedisAttemptGate },
    RedisHealthProbe,
  ],
  exports: [REDIS_CLIENT, AttemptGate, RedisHealthProbe],
})
export class RedisModule implements OnApplicationShutdown {
  constructor(@Inject(REDIS_CLIENT) private readonly redis: Redis) {}

  async onApplicationShutdown(): Promise<void> {
    await this.redis.quit().catch(() => this.redis.disconnect());
  }
}
