import { hostname } from 'node:os';
import { Injectable } from '@nestjs/common';
import type { HealthPingResult } from '@psiform/contracts';
import type { PlainJobHandler } from '@psiform/server';

/** Answers ping jobs on the health queue so callers can tell a worker is alive. */
@Injectable()
export class HealthPingProcessor implements PlainJobHandler<'ping'> {
  readonly kind = 'plain';
  readonly name = 'ping';

  async run(): Promise<HealthPingResult> {
    return { pong: true, worker: `${hostname()}/${process.pid}` };
  }
}
