import { Module } from '@nestjs/common';
import { HealthController } from './health.controller';
import { HealthService } from './health.service';
import { HEALTH_PROBES, type HealthProbe, DatabaseHealthProbe, RedisHealthProbe, StorageHealthProbe, MailHealthProbe } from '@psiform/server';

@Module({
  controllers: [HealthController],
  providers: [
    HealthService,
    DatabaseHealthProbe,
    {
      provide: HEALTH_PROBES,
      inject: [DatabaseHealthProbe, RedisHealthProbe, StorageHealthProbe, MailHealthProbe],
      useFactory: (...probes: HealthProbe[]) => probes,
    },
  ],
})
export class HealthModule {}
