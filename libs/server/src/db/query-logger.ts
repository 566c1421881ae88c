import { Logger as NestLogger } from '@nestjs/common';
import type { Logger as TypeOrmLogger } from 'typeorm';

/**
 * TypeORM's own logger prints a failed query with its PARAMETERS, so a refused user insert wrote the bcrypt hash
 * (and a refused sign-up its e-mail and name) into the service log. This one logs failed queries by their SQL text
 * and the database's message only, never the values; everything else stays quiet as with `logging: ['error']`.
 */
export class ParameterFreeQueryLogger implements TypeOrmLogger {
  private readonly out = new NestLogger('Database');

  logQuery(): void {}

  logQueryError(error: string | Error, query: string, _parameters?: unknown[]): void {
    const message = typeof error === 'string' ? error : error.message;
    this.out.error(`query failed: ${query.replace(/\s+/g, ' ').slice(0, 300)} (${message})`);
  }

  logQuerySlow(): void {}

  logSchemaBuild(): void {}

  logMigration(): void {}

  log(level: 'log' | 'info' | 'warn', message: unknown): void {
    if (level === 'warn') this.out.warn(String(message));
  }
}
