import { hostname } from 'node:os';
import { Injectable } from '@nestjs/common';
import { HEALTH_PING_JOB, QUEUES, type HealthPingResult } from '@psiform/contracts';
import type { JobProcessor } from '../queues/job-processor';

/** Answers ping jobs on the health queue so callers can tell a worker is alive. */
@Injectable()
export class HealthPingProcessor implements JobProcessor<unknown, HealthPingResult> {
  readonly queue = QUEUES.health;

  async process(job: { name: string }): Promise<HealthPingResult> {
    if (job.name !== HEALTH_PING_JOB) throw new Error(`unknown job name "${job.name}" on queue ${this.queue}`);
    return { pong: true, worker: `${hostname()}/${process.pid}` };
  }
}
