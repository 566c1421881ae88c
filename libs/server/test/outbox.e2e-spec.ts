import 'reflect-metadata';
import { Queue } from 'bullmq';
import { DataSource } from 'typeorm';
import { QUEUES } from '@psiform/contracts';
import { BullJobQueue } from '../src/infra/queue/bull-job-queue';
import { JobQueue } from '../src/infra/queue/job-queue';
import { dataSourceOptions } from '../src/db/schema';
import { runMigrations } from '../src/db/run-migrations';
import { enqueueIn, TypeormOutboxStore } from '../src/outbox/outbox.repository';
import { OutboxRelay } from '../src/outbox/outbox-relay';
import { OutboxSweeper } from '../src/outbox/outbox-sweeper';
import { TypeormJobsStore } from '../src/jobs/jobs.repository';
import { JobEntity } from '../src/jobs/job.entity';
import { OutboxEntity } from '../src/outbox/outbox.entity';

/**
 * The transactional outbox on the real PostgreSQL and Redis of the test run: rows live and die with their transaction,
 * the relay survives a queue that is down, and the sweeper re-drives what the queue lost. Uses the health queue (ping
 * jobs carry nothing) and removes what it made.
 */
const need = (name: string) => {
  const v = process.env[name];
  if (!v) throw new Error(`${name} is not set: run through \`npm test -- server\` (it starts the services)`);
  return v;
};

/** A queue whose Redis is a closed port: every add fails at once, as when Redis is down. */
class DownQueue extends JobQueue {
  async add(): Promise<string> {
    throw new Error('connect ECONNREFUSED 127.0.0.1:1');
  }
  async state(): Promise<string | null> {
    throw new Error('connect ECONNREFUSED 127.0.0.1:1');
  }
}

describe('outbox, relay and sweeper (e2e)', () => {
  let ds: DataSource;
  let queue: BullJobQueue;
  let health: Queue;
  const made: string[] = [];
  const relaySettings = { pollMs: 50, batch: 50, sendTimeoutMs: 1000 };

  beforeAll(async () => {
    const url = need('DATABASE_URL');
    await runMigrations(url);
    ds = await new DataSource(dataSourceOptions(url)).initialize();
    queue = new BullJobQueue({ redis: { url: need('REDIS_URL') } });
    health = new Queue(QUEUES.health, { connection: { url: need('REDIS_URL') } });
  });

  afterAll(async () => {
    for (const id of made) await (await health.getJob(id))?.remove().catch(() => undefined);
    if (made.length) await ds?.query(`DELETE FROM outbox WHERE id = ANY($1)`, [made]);
    await health?.close();
    await queue?.onApplicationShutdown();
    await ds?.destroy();
  });

  const state = async (id: string) => (await ds.query(`SELECT state, last_error, relay_attempts FROM outbox WHERE id = $1`, [id]))[0];

  it('a request lives and dies with its transaction', async () => {
    let kept = '';
    let dropped = '';
    await ds.transaction(async (em) => {
      kept = await enqueueIn(em, { name: 'ping', data: {} });
    });
    await expect(
      ds.transaction(async (em) => {
        dropped = await enqueueIn(em, { name: 'ping', data: {} });
        throw new Error('the change failed');
      }),
    ).rejects.toThrow('the change failed');
    made.push(kept);
    expect(await state(kept)).toMatchObject({ state: 'pending', relay_attempts: 0 });
    expect(await state(dropped)).toBeUndefined();
    await ds.query(`UPDATE outbox SET state = 'done' WHERE id = $1`, [kept]); // not for the relays below
    // A payload the contract refuses fails the transaction instead of a worker later.
    await expect(ds.transaction((em) => enqueueIn(em, { name: 'ping', data: { stray: 1 } } as never))).rejects.toThrow('malformed ping job: (payload): Unrecognized key: "stray"');
  });

  it('while the queue is down rows stay pending with the reason; once it is back the relay sends each once', async () => {
    const store = new TypeormOutboxStore(ds.getRepository(OutboxEntity));
    const id = await store.enqueue({ name: 'ping', data: {} });
    made.push(id);
    const down = new OutboxRelay(store, new DownQueue(), relaySettings);
    expect(await down.relayOnce()).toBe(0);
    expect(await state(id)).toMatchObject({ state: 'pending', relay_attempts: 1, last_error: 'relay: connect ECONNREFUSED 127.0.0.1:1' });
    // Not due again at once (0.5 s backoff), then relayed by a working relay.
    const up = new OutboxRelay(store, queue, relaySettings);
    await new Promise((r) => setTimeout(r, 600));
    await up.relayOnce();
    expect(await state(id)).toMatchObject({ state: 'relayed', last_error: null });
    const job = await health.getJob(id);
    expect(job?.name).toBe('ping');
    expect(job?.data).toEqual({});
    // Relaying the same row again (two relays racing) is still one job: BullMQ keys it by the row id.
    await queue.add(QUEUES.health, 'ping', id, {}, { attempts: 1, backoff: { type: 'fixed', delay: 1 } });
    expect((await health.getJobs(['waiting', 'active', 'completed', 'failed', 'delayed'])).filter((j) => j.id === id)).toHaveLength(1);
  });

  it('two relays at once never send one row twice (FOR UPDATE SKIP LOCKED)', async () => {
    const store = new TypeormOutboxStore(ds.getRepository(OutboxEntity));
    const ids = await Promise.all(Array.from({ length: 20 }, () => store.enqueue({ name: 'ping', data: {} })));
    made.push(...ids);
    const sent: string[] = [];
    const counting = new (class extends JobQueue {
      async add(q: string, n: string, jobId: string, d: Record<string, unknown>, o: Parameters<JobQueue['add']>[4]): Promise<string> {
        sent.push(jobId);
        await new Promise((r) => setTimeout(r, 5));
        return queue.add(q, n, jobId, d, o);
      }
      state = (q: string, id: string) => queue.state(q, id);
    })();
    const a = new OutboxRelay(store, counting, relaySettings);
    const b = new OutboxRelay(store, counting, relaySettings);
    await Promise.all([a.relayOnce(), b.relayOnce(), a.relayOnce(), b.relayOnce()]);
    const mine = sent.filter((x) => ids.includes(x));
    expect(new Set(mine).size).toBe(20);
    expect(mine).toHaveLength(20);
  });

  it('the sweeper re-drives a relayed row whose queue entry is gone, and a queued job row that never reached the queue', async () => {
    const store = new TypeormOutboxStore(ds.getRepository(OutboxEntity));
    const jobs = new TypeormJobsStore(ds.getRepository(JobEntity));
    const relay = new OutboxRelay(store, queue, relaySettings);
    const id = await store.enqueue({ name: 'ping', data: {} });
    made.push(id);
    await relay.relayOnce();
    await (await health.getJob(id))!.remove(); // the queue lost it (a Redis restarted without its data)
    await ds.query(`UPDATE outbox SET relayed_at = now() - interval '1 hour', due_at = now() WHERE id = $1`, [id]);

    // A mesh job row left queued an hour ago with no queue entry (written before the outbox, or by a process that died).
    const [pub] = await ds.query(`SELECT id FROM publications LIMIT 1`);
    const [orphan] = await ds.query(
      `INSERT INTO jobs (type, state, stage, progress, publication_id, updated_at) VALUES ('mesh', 'queued', 'queued', 0, $1, now() - interval '1 hour') RETURNING id`,
      [pub.id],
    );
    try {
      const sweeper = new OutboxSweeper(store, jobs, queue, { everyMs: 60_000, staleMs: 60_000 });
      const swept = await sweeper.sweep();
      expect(swept.redrivenRows).toContain(id);
      expect(await state(id)).toMatchObject({ state: 'pending', last_error: 'sweeper: its ping job was gone from the queue' });
      expect(swept.redrivenJobs).toContain(orphan.id);
      const [row] = await ds.query(`SELECT bull_job_id FROM jobs WHERE id = $1`, [orphan.id]);
      made.push(row.bull_job_id);
      expect(await ds.query(`SELECT name, payload, state FROM outbox WHERE id = $1`, [row.bull_job_id])).toEqual([{ name: 'mesh', payload: { jobId: orphan.id, params: {} }, state: 'pending' }]);
      // A second sweep right away finds nothing to do: the row's clock moved on, the job has a pending request.
      expect(await sweeper.sweep()).toEqual({ redrivenRows: [], redrivenJobs: [] });
      await relay.relayOnce();
      expect(await health.getJob(id)).toBeTruthy();
    } finally {
      const [row] = await ds.query(`SELECT bull_job_id FROM jobs WHERE id = $1`, [orphan.id]);
      if (row?.bull_job_id) {
        const mesh = new Queue(QUEUES.mesh, { connection: { url: need('REDIS_URL') } });
        await (await mesh.getJob(row.bull_job_id))?.remove().catch(() => undefined);
        await mesh.close();
      }
      await ds.query(`DELETE FROM jobs WHERE id = $1`, [orphan.id]);
    }
  });
});
