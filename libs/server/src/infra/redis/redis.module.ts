import { Global, Inject, Module, type OnApplicationShutdown } from '@nestjs/common';
import type Redis from 'ioredis';
import { APP_CONFIG } from '../../config/config.tokens';
import type { AppConfig } from '../../config/config';
import { REDIS_CLIENT } from './redis.tokens';
import { AttemptGate } from './attempt-gate';
import { RedisAttemptGate } from './redis-attempt-gate';
import { closeRedis, openRedis } from './redis-connection';

@Global()
@Module({
  providers: [
    {
      provide: REDIS_CLIENT,
      inject: [APP_CONFIG],
      useFactory: (config: AppConfig) => openRedis(config.redis.url, 'requests'),
    },
    { provide: AttemptGate, useClass: RedisAttemptGate },
  ],
  exports: [REDIS_CLIENT, AttemptGate],
})
export class RedisModule implements OnApplicationShutdown {
  constructor(@Inject(REDIS_CLIENT) private readonly redis: Redis) {}

  async onApplicationShutdown(): Promise<void> {
    await closeRedis(this.redis);
  }
}
