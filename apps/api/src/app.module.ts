import { Logger, Module, type DynamicModule, type OnApplicationShutdown } from '@nestjs/common';
import { APP_FILTER } from '@nestjs/core';
import { TypeOrmModule } from '@nestjs/typeorm';
import { type AppConfig, ConfigModule, dataSourceOptions, RedisModule, StorageModule, MailModule, QueueModule } from '@psiform/server';
import { UsersModule } from './users/users.module';
import { AuthModule } from './auth/auth.module';
import { PublicationsModule } from './publications/publications.module';
import { HealthModule } from './health/health.module';
import { AssetsModule } from './assets/assets.module';
import { JobsModule } from './jobs/jobs.module';
import { FiguresModule } from './figures/figures.module';
import { UploadsModule } from './uploads/uploads.module';
import { ReviewsModule } from './reviews/reviews.module';
import { AuditModule } from './audit/audit.module';
import { SwatchbooksModule } from './swatchbooks/swatchbooks.module';
import { DevModule } from './dev/dev.module';
import { ExportsModule } from './exports/exports.module';
import { ProofsModule } from './proofs/proofs.module';
import { DeliveryProfilesModule } from './delivery-profiles/delivery-profiles.module';
import { HttpErrorFilter } from './common/http-error.filter';

@Module({})
export class AppModule implements OnApplicationShutdown {
  onApplicationShutdown(signal?: string): void {
    new Logger('Psiform').log(`API stopped${signal ? ` (${signal})` : ''}`);
  }

  static forRoot(config: AppConfig): DynamicModule {
    return {
      module: AppModule,
      imports: [
        ConfigModule.forRoot(config),
        // Request paths: PostgreSQL calls time out (REQUEST_DB_TIMEOUTS) so a stalled database answers 503, not a hang.
        TypeOrmModule.forRoot({ ...dataSourceOptions(config.database.url, { requestTimeoutMs: config.database.requestTimeoutMs }), retryAttempts: 3, retryDelay: 1000 }),
        RedisModule,
        StorageModule,
        MailModule,
        UsersModule,
        AuthModule,
        PublicationsModule,
        HealthModule,
        QueueModule,
        AssetsModule,
        JobsModule,
        FiguresModule,
        UploadsModule,
        ReviewsModule,
        AuditModule,
        SwatchbooksModule,
        DevModule,
        ExportsModule,
        ProofsModule,
        DeliveryProfilesModule,
      ],
      providers: [{ provide: APP_FILTER, useClass: HttpErrorFilter }],
    };
  }
}
