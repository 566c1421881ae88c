import { Logger, Module, type DynamicModule, type OnApplicationShutdown } from '@nestjs/common';
import { APP_FILTER } from '@nestjs/core';
import { TypeOrmModule } from '@nestjs/typeorm';
import type { AppConfig } from './config/config';
import { ConfigModule } from './config/config.module';
import { dataSourceOptions } from './db/schema';
import { RedisModule } from './infra/redis/redis.module';
import { StorageModule } from './infra/storage/storage.module';
import { MailModule } from './infra/mail/mail.module';
import { UsersModule } from './users/users.module';
import { AuthModule } from './auth/auth.module';
import { PublicationsModule } from './publications/publications.module';
import { HealthModule } from './health/health.module';
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
        TypeOrmModule.forRoot({ ...dataSourceOptions(config.database.url), retryAttempts: 3, retryDelay: 1000 }),
        RedisModule,
        StorageModule,
        MailModule,
        UsersModule,
        AuthModule,
        PublicationsModule,
        HealthModule,
      ],
      providers: [{ provide: APP_FILTER, useClass: HttpErrorFilter }],
    };
  }
}
