import { Global, Module, type DynamicModule } from '@nestjs/common';
import type { AppConfig } from './config';
import { APP_CONFIG } from './config.tokens';

/** Makes the already-validated AppConfig injectable everywhere as APP_CONFIG. */
@Global()
@Module({})
export class ConfigModule {
  static forRoot(config: AppConfig): DynamicModule {
    return { module: ConfigModule, providers: [{ provide: APP_CONFIG, useValue: config }], exports: [APP_CONFIG] };
  }
}
