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
export async function sampleGridParallel(state: OrbitalState, grid: GridSpec, opts: { threads?: number } = {}): Promise<ParallelResult> {
  assertState(state);
  assertGridSpec(grid);
  const n = grid.n;
  const threads = Math.max(1, Math.min(opts.threads ?? Math.min(availableParallelism(), 16), n, 64));
  if (!Number.isInteger(threads)) throw new RangeError(`threads must be a positive integer, got ${String(opts.threads)}`);
  const real = isRealState(state);
  const count = n * n * n;
  const reBuf = new SharedArrayBuffer(count * 4);
  const imBuf = real ? null : new SharedArrayBuffer(count * 4);
  if (threads === 1) {
    compileState(state).sampleGrid(grid, new Float32Array(reBuf), imBuf ? new Float32Array(imBuf) : null);
    return { re: new Float32Array(reBuf), im: imBuf ? new Float32Array(imBuf) : null };
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
        pw.worker.postMessage({ id, state: plain, grid: { n: grid.n, extent: grid.extent }, zStart, zEnd, re: reBuf, im: imBuf });
      }),
    );
  }
  await Promise.all(jobs);
  return { re: new Float32Array(reBuf), im: imBuf ? new Float32Array(imBuf) : null };
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
