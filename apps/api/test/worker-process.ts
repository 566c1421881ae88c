import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { join } from 'node:path';

export const WORKER_MAIN = join(__dirname, '..', '..', 'worker', 'dist', 'main.js');

export interface WorkerProcess {
  child: ChildProcess;
  output: () => string;
  /** SIGTERM and wait for the exit. */
  stop: () => Promise<void>;
  /** SIGKILL (no clean-up at all) and wait for the exit. */
  kill: () => Promise<void>;
}

/**
 * Spawns the compiled worker (`node apps/worker/dist/main.js`) with the test services' env; resolves once ready.
 * Thumbnails after mesh jobs are off unless a spec asks for them (THUMBNAILS: 'on'): they add png assets and
 * objects while other specs count theirs.
 */
export async function startWorkerProcess(env: Record<string, string> = {}): Promise<WorkerProcess> {
  if (!existsSync(WORKER_MAIN)) throw new Error('apps/worker/dist is missing: run `npm run build -w @psiform/worker` first');
  const child = spawn(process.execPath, [WORKER_MAIN], { env: { ...process.env, WORKER_CONCURRENCY: '2', THUMBNAILS: 'off', ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
  let out = '';
  child.stdout!.on('data', (d) => (out += d));
  child.stderr!.on('data', (d) => (out += d));
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  await new Promise<void>((resolve, reject) => {
    // 60 s: the worker loads sharp, pdfkit and Nest; on the shared 2-core machine under load it has taken over 20 s.
    // A worker that never got ready is killed: left running it would take jobs meant for the next spec's worker.
    let waiting = true;
    const t = setTimeout(() => {
      waiting = false;
      child.kill('SIGKILL');
      reject(new Error(`worker not ready after 60 s:\n${out}`));
    }, 60000);
    const check = () => {
      if (!waiting) return;
      if (out.includes(`worker ${child.pid} ready`)) {
        clearTimeout(t);
        resolve();
      } else if (child.exitCode !== null) {
        clearTimeout(t);
        reject(new Error(`worker exited during start-up:\n${out}`));
      } else setTimeout(check, 50);
    };
    check();
  });
  const end = async (signal: NodeJS.Signals) => {
    if (child.exitCode === null && child.signalCode === null) child.kill(signal);
    await exited;
  };
  return { child, output: () => out, stop: () => end('SIGTERM'), kill: () => end('SIGKILL') };
}

/** Reads a text/event-stream response body (fetch) and yields each `data:` payload parsed as JSON. */
export async function* readSse(body: ReadableStream<Uint8Array>): AsyncGenerator<unknown> {
  const reader = body.getReader();
  const dec = new TextDecoder();
  let buf = '';
  for (;;) {
    const { value, done } = await reader.read();
    if (done) break;
    buf += dec.decode(value, { stream: true });
    let i: number;
    while ((i = buf.indexOf('\n\n')) >= 0) {
      const event = buf.slice(0, i);
      buf = buf.slice(i + 2);
      const data = event
        .split('\n')
        .filter((l) => l.startsWith('data:'))
        .map((l) => l.slice(5).trimStart())
        .join('\n');
      if (data) yield JSON.parse(data);
    }
  }
}

/**
 * The body of a 200 answer to a poll, or undefined for a 503 (the API's "try again shortly": on the shared 2-core test
 * machine a poll can meet a database call that ran out of time while jobs hold the cores); anything else fails.
 */
export async function polled<T>(req: PromiseLike<{ status: number; body: T; text?: string }>): Promise<T | undefined> {
  const res = await req;
  if (res.status === 503) return undefined;
  if (res.status !== 200) throw new Error(`expected 200 "OK", got ${res.status}: ${res.text ?? ''}`);
  return res.body;
}

/** Polls until the predicate holds (or throws after timeoutMs). */
export async function waitFor<T>(what: string, fn: () => Promise<T | undefined | null | false>, timeoutMs = 30000, everyMs = 100): Promise<T> {
  const t0 = Date.now();
  for (;;) {
    const v = await fn();
    if (v) return v;
    if (Date.now() - t0 > timeoutMs) throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}
