import { hostname } from 'node:os';
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import type { INestApplicationContext } from '@nestjs/common';
import { Queue, QueueEvents } from 'bullmq';
import { HEALTH_PING_JOB, QUEUES } from '@psiform/contracts';
import { loadWorkerConfig, type WorkerConfig } from '@psiform/server';
import { createWorker } from '../src/worker.factory';

/** Runs against the real services named by the environment (the test runner sets them); fails loudly without them. */
function config(): WorkerConfig {
  try {
    return loadWorkerConfig(process.env);
  } catch (err) {
    throw new Error(`Worker e2e tests need REDIS_URL, DATABASE_URL and S3_* (the test runner sets them): ${(err as Error).message}`);
  }
}

// Jobs are kept after they finish: with removeOnComplete a fast worker can delete the job before
// waitUntilFinished reads it ("Missing key for job"); the test Redis is thrown away after the run.
describe('worker health ping (e2e)', () => {
  let worker: INestApplicationContext;
  let queue: Queue;
  let events: QueueEvents;

  beforeAll(async () => {
    const c = config();
    worker = await createWorker(c, { logger: ['error'] });
    const connection = { url: c.redis.url };
    queue = new Queue(QUEUES.health, { connection });
    events = new QueueEvents(QUEUES.health, { connection });
    await events.waitUntilReady();
  });

  afterAll(async () => {
    await events?.close();
    await queue?.close();
    await worker?.close();
  });

  it('answers a ping job with pong and the worker id', async () => {
    const job = await queue.add(HEALTH_PING_JOB, {});
    const result = await job.waitUntilFinished(events, 10000);
    expect(result.pong).toBe(true);
    expect(result.worker).toMatch(new RegExp(`^${hostname()}/\\d+$`));
    // Another worker left on the same Redis (an earlier suite's child) may take the job; only when ours is the
    // only one connected must the answer carry this process's id.
    if ((await queue.getWorkersCount()) === 1) expect(result.worker).toBe(`${hostname()}/${process.pid}`);
  });

  it('fails a job with an unknown name, with a message', async () => {
    const job = await queue.add('no-such-job', {}, { attempts: 1 });
    await expect(job.waitUntilFinished(events, 10000)).rejects.toThrow('unknown job name "no-such-job" on queue psiform-health');
  });

  it('handles several pings concurrently', async () => {
    const jobs = await queue.addBulk(Array.from({ length: 10 }, () => ({ name: HEALTH_PING_JOB, data: {} })));
    const results = await Promise.all(jobs.map((j) => j.waitUntilFinished(events, 10000)));
    expect(results.every((r) => r.pong === true)).toBe(true);
  });
});

describe('worker entry point (compiled)', () => {
  const main = join(__dirname, '..', 'dist', 'main.js');

  it('exits 1 naming REDIS_URL when it is not a redis URL', async () => {
    if (!existsSync(main)) throw new Error('apps/worker/dist is missing: run `npm run build -w @psiform/worker` first');
    const r = await new Promise<{ code: number | null; stderr: string }>((resolve) => {
      const child = spawn(process.execPath, [main], { env: { PATH: process.env.PATH, REDIS_URL: 'http://127.0.0.1:1' } });
      let stderr = '';
      child.stderr.on('data', (d) => (stderr += d));
      child.on('exit', (code) => resolve({ code, stderr }));
    });
    expect(r.code).toBe(1);
    expect(r.stderr).toContain('Invalid configuration: REDIS_URL must be a redis:// URL');
  });

  it('starts, answers a ping from another process, and stops on SIGTERM', async () => {
    const c = config();
    const child = spawn(process.execPath, [main], { env: { ...process.env, WORKER_CONCURRENCY: '1' } });
    let out = '';
    child.stdout.on('data', (d) => (out += d));
    child.stderr.on('data', (d) => (out += d));
    const queue = new Queue(QUEUES.health, { connection: { url: c.redis.url } });
    const events = new QueueEvents(QUEUES.health, { connection: { url: c.redis.url } });
    try {
      await new Promise<void>((resolve, reject) => {
        const t = setTimeout(() => reject(new Error(`worker not ready: ${out}`)), 15000);
        const check = () => (out.includes(`worker ${child.pid} ready`) ? (clearTimeout(t), resolve()) : setTimeout(check, 50));
        check();
      });
      await events.waitUntilReady();
      // Our in-process worker is closed by now, so the child answers.
      const job = await queue.add(HEALTH_PING_JOB, {});
      expect(await job.waitUntilFinished(events, 10000)).toEqual({ pong: true, worker: `${hostname()}/${child.pid}` });
      const exited = new Promise<NodeJS.Signals | null>((resolve) => child.on('exit', (_c, s) => resolve(s)));
      child.kill('SIGTERM');
      expect(await exited).toBe('SIGTERM');
    } finally {
      if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
      await events.close();
      await queue.close();
    }
  });
});
