import { Global, Inject, Logger, Module, type DynamicModule, type OnApplicationShutdown } from '@nestjs/common';
import Redis from 'ioredis';
import type { WorkerConfig } from '../config/config';

/** Shared ioredis connection for BullMQ; only adapters (WorkerHost) use it. */
export const REDIS_CONNECTION = Symbol('REDIS_CONNECTION');

@Global()
@Module({})
export class RedisConnectionModule implements OnApplicationShutdown {
  constructor(@Inject(REDIS_CONNECTION) private readonly redis: Redis) {}

  static forRoot(config: WorkerConfig): DynamicModule {
    return {
      module: RedisConnectionModule,
      providers: [
        {
          provide: REDIS_CONNECTION,
          useFactory: () => {
            // BullMQ workers require maxRetriesPerRequest: null (stack notes).
            const redis = new Redis(config.redis.url, { maxRetriesPerRequest: null });
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
      ],
      exports: [REDIS_CONNECTION],
    };
  }

  /** Runs after WorkerHost closed the workers (beforeApplicationShutdown). */
  async onApplicationShutdown(): Promise<void> {
    await this.redis.quit().catch(() => this.redis.disconnect());
  }
}
