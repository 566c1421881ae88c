import { Global, Inject, Module, type DynamicModule, type OnApplicationShutdown } from '@nestjs/common';
import type Redis from 'ioredis';
import { closeRedis, openRedis, type WorkerConfig } from '@psiform/server';

/** The worker's BullMQ connection (libs/server openRedis, role 'worker'); only the JobRunner uses it. */
export const REDIS_CONNECTION = Symbol('REDIS_CONNECTION');

@Global()
@Module({})
export class RedisConnectionModule implements OnApplicationShutdown {
  constructor(@Inject(REDIS_CONNECTION) private readonly redis: Redis) {}

  static forRoot(config: WorkerConfig): DynamicModule {
    return {
      module: RedisConnectionModule,
      providers: [{ provide: REDIS_CONNECTION, useFactory: () => openRedis(config.redis.url, 'worker') }],
      exports: [REDIS_CONNECTION],
    };
  }

  /** Runs after the JobRunner closed its workers (beforeApplicationShutdown). */
  async onApplicationShutdown(): Promise<void> {
    await closeRedis(this.redis);
  }
}
