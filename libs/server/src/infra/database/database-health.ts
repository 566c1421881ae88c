import { Injectable } from '@nestjs/common';
import { DataSource } from 'typeorm';
import type { HealthProbe } from '../../health/health.probe';

@Injectable()
export class DatabaseHealthProbe implements HealthProbe {
  readonly name = 'database' as const;
  constructor(private readonly ds: DataSource) {}

  async check(): Promise<void> {
    await this.ds.query('SELECT 1');
  }
}
