import { Module } from '@nestjs/common';
import { DataSource } from 'typeorm';
import type Redis from 'ioredis';
import { HealthController } from './health.controller';
import { HealthService } from './health.service';
import { HEALTH_PROBES, Mailer, ObjectStorage, REDIS_CLIENT, dependencyProbes } from '@psiform/server';

@Module({
  controllers: [HealthController],
  providers: [
    HealthService,
    {
      provide: HEALTH_PROBES,
      inject: [DataSource, REDIS_CLIENT, ObjectStorage, Mailer],
      useFactory: (ds: DataSource, redis: Redis, storage: ObjectStorage, mailer: Mailer) => dependencyProbes({ ds, redis, storage, mailer }),
    },
  ],
})
export class HealthModule {}
