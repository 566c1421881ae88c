/**
 * Node-only parallel grid sampler (subpath export '@psiform/orbitals/node'). Splits the grid into z-slabs,
 * one per worker thread, writing into SharedArrayBuffer-backed Float32Arrays, so no copying back.
 * Workers are pooled and kept unref'd while idle (the process can exit without closeParallelSampler()).
 * The browser uses the same compileState in a Web Worker; this file is the only one importing Node modules.
 */
import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { join } from 'node:path';
import { Worker } from 'node:worker_threads';
import { compileState } from '../compile';
import { GridSpec, assertGridSpec } from '../grid';
import { OrbitalState, assertState, isRealState } from '../state';

export interface ParallelResult {
  /** psi (real states) or Re psi, n³ values, x fastest; backed by a SharedArrayBuffer. */
  re: Float32Array;
  /** Im psi for complex states, null for real ones. */
  im: Float32Array | null;
}

interface PoolWorker {
  worker: Worker;
  busy: number;
  ready: Promise<void>;
}

const pool: PoolWorker[] = [];
let nextId = 1;
const pending = new Map<number, { resolve: () => void; reject: (e: Error) => void; pw: PoolWorker }>();

function workerScript(): string {
  // Compiled layout: dist/node/sampler-worker.js beside this file. When this file runs from src/ (tests
  // through Vitest), fall back to the built copy, since worker_threads cannot load TypeScript.
  const here = join(__dirname, 'sampler-worker.js');
  if (existsSync(here)) return here;
  const built = join(__dirname, '..', '..', 'dist', 'node', 'sampler-worker.js');
  if (existsSync(built)) return built;
  throw new Error('sampleGridParallel: worker script not found; build @psiform/orbitals first (npx tsc -p tsconfig.build.json)');
}

function spawn(): PoolWorker {
  const worker = new Worker(workerScript());
  let markReady: () => void = () => undefined;
  const ready = new Promise<void>((resolve) => {
    markReady = resolve;
  });
  const pw: PoolWorker = { worker, busy: 0, ready };
  worker.unref();
  worker.on('message', (msg: { id: number; ok: boolean; error?: string; ready?: boolean }) => {
    if (msg.ready) {
      markReady();
      return;
    }
    const p = pending.get(msg.id);
    if (!p) return;
    pending.delete(msg.id);
    release(p.pw);
    if (msg.ok) p.resolve();
    else p.reject(new Error(msg.error ?? 'worker failed'));
  });
  worker.on('error', (err) => {
    for (const [id, p] of pending) {
      if (p.pw === pw) {
        pending.delete(id);
        p.reject(err);
      }
    }
    const i = pool.indexOf(pw);
    if (i >= 0) pool.splice(i, 1);
    markReady();
  });
  pool.push(pw);
  return pw;
}

function acquire(pw: PoolWorker): void {
  if (pw.busy++ === 0) pw.worker.ref();
}

function release(pw: PoolWorker): void {
  if (--pw.busy === 0) pw.worker.unref();
}

/**
 * Samples psi on the grid with `threads` worker threads (default: available cores, at most 16).
 * Same values as compileState(state).sampleGrid(grid, ...), bit for bit.
 */
export async function sampleGridParallel(state: OrbitalState, grid: GridSpec, opts: { threads?: number; into?: SamplingBuffers } = {}): Promise<ParallelResult> {
  assertState(state);
  assertGridSpec(grid);
  const n = grid.n;
  const threads = Math.max(1, Math.min(opts.threads ?? Math.min(availableParallelism(), 16), n, 64));
  if (!Number.isInteger(threads)) throw new RangeError(`threads must be a positive integer, got ${String(opts.threads)}`);
  const real = isRealState(state);
  const count = n * n * n;
  const reBuf = opts.into ? opts.into.reserve(count, real).re : new SharedArrayBuffer(count * 4);
  const imBuf = opts.into ? opts.into.reserve(count, real).im : real ? null : new SharedArrayBuffer(count * 4);
  const view = (b: SharedArrayBuffer) => new Float32Array(b, 0, count);
  if (threads === 1) {
    compileState(state).sampleGrid(grid, view(reBuf), imBuf ? view(imBuf) : null);
    return { re: view(reBuf), im: imBuf ? view(imBuf) : null };
  }
  while (pool.length < threads) spawn();
  const plain: OrbitalState = { Z: state.Z, terms: state.terms.map((t) => ({ ...t })) };
  const jobs: Promise<void>[] = [];
  for (let w = 0; w < threads; w++) {
    const zStart = Math.floor((w * n) / threads);
    const zEnd = Math.floor(((w + 1) * n) / threads);
    if (zEnd <= zStart) continue;
    const pw = pool[w];
    const id = nextId++;
    acquire(pw);
    jobs.push(
      new Promise<void>((resolve, reject) => {
        pending.set(id, { resolve, reject, pw });
        pw.worker.postMessage({ id, state: plain, grid: { n: grid.n, extent: grid.extent }, zStart, zEnd, count, re: reBuf, im: imBuf });
      }),
    );
  }
  await Promise.all(jobs);
  return { re: view(reBuf), im: imBuf ? view(imBuf) : null };
}

/**
 * Output buffers that sampleGridParallel fills again and again instead of allocating new ones per call. Why: a
 * SharedArrayBuffer handed to the sampling threads stays alive until each thread's own garbage collector runs, and
 * idle threads hardly ever collect, so a fresh n³ buffer per job was kept for good (a worker grew by about 200 MB
 * per 384³ job). Reusing one pair keeps the threads pointing at the same memory. Grow-only: a larger grid replaces
 * the pair once; smaller grids use its beginning. One SamplingBuffers serves one job at a time (see SamplingBufferPool).
 */
export class SamplingBuffers {
  private re: SharedArrayBuffer | null = null;
  private im: SharedArrayBuffer | null = null;

  /** Buffers of at least `count` float32 values (im only for complex states); contents are overwritten by sampling. */
  reserve(count: number, real: boolean): { re: SharedArrayBuffer; im: SharedArrayBuffer | null } {
    if (!this.re || this.re.byteLength < count * 4) this.re = new SharedArrayBuffer(count * 4);
    if (!real && (!this.im || this.im.byteLength < count * 4)) this.im = new SharedArrayBuffer(count * 4);
    return { re: this.re, im: real ? null : this.im };
  }

  /** Bytes held (for reports). */
  get bytes(): number {
    return (this.re?.byteLength ?? 0) + (this.im?.byteLength ?? 0);
  }
}

/**
 * At most `size` SamplingBuffers, one per job running at the same time (a worker's concurrency). A job beyond that
 * waits for one to be released, so memory is bounded by size × (the largest grid's buffers).
 */
export class SamplingBufferPool {
  private readonly free: SamplingBuffers[] = [];
  private created = 0;
  private readonly waiting: Array<(b: SamplingBuffers) => void> = [];

  constructor(readonly size: number) {
    if (!Number.isInteger(size) || size < 1) throw new RangeError(`pool size must be a positive integer, got ${String(size)}`);
  }

  async acquire(): Promise<SamplingBuffers> {
    const b = this.free.pop();
    if (b) return b;
    if (this.created < this.size) {
      this.created++;
      return new SamplingBuffers();
    }
    return new Promise((resolve) => this.waiting.push(resolve));
  }

  release(b: SamplingBuffers): void {
    const next = this.waiting.shift();
    if (next) next(b);
    else this.free.push(b);
  }

  /** Runs `fn` with buffers from the pool and gives them back afterwards, whatever happens. */
  async with<T>(fn: (b: SamplingBuffers) => Promise<T>): Promise<T> {
    const b = await this.acquire();
    try {
      return await fn(b);
    } finally {
      this.release(b);
    }
  }
}

/**
 * Starts `threads` pooled workers (default: available cores) and resolves once each has warmed up its
 * sampling loops, so a following sampleGridParallel call measures sampling, not start-up.
 */
export async function prewarmParallelSampler(opts: { threads?: number } = {}): Promise<void> {
  const threads = Math.max(1, Math.min(opts.threads ?? Math.min(availableParallelism(), 16), 64));
  while (pool.length < threads) spawn();
  const ws = pool.slice(0, threads);
  for (const pw of ws) acquire(pw); // keep the process alive while warming up
  try {
    await Promise.all(ws.map((pw) => pw.ready));
  } finally {
    for (const pw of ws) release(pw);
  }
}

/** Terminates the pooled workers (optional; idle workers do not keep the process alive). */
export async function closeParallelSampler(): Promise<void> {
  const ws = pool.splice(0, pool.length);
  await Promise.all(ws.map((pw) => pw.worker.terminate()));
}
