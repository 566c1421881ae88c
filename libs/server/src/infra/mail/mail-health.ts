import { Injectable } from '@nestjs/common';
import type { HealthProbe } from '../../health/health.probe';
import { Mailer } from './mailer';

@Injectable()
export class MailHealthProbe implements HealthProbe {
  readonly name = 'mail' as const;
  constructor(private readonly mailer: Mailer) {}

  check(): Promise<void> {
    return this.mailer.verify();
  }
}
