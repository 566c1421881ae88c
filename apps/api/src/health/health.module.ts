import { Module } from '@nestjs/common';
import { HealthController } from './health.controller';
import { HealthService } from './health.service';
import { HEALTH_PROBES, type HealthProbe } from './health.probe';
import { DatabaseHealthProbe } from '../infra/database/database-health';
import { RedisHealthProbe } from '../infra/redis/redis-health';
import { StorageHealthProbe } from '../infra/storage/storage-health';
import { MailHealthProbe } from '../infra/mail/mail-health';

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
