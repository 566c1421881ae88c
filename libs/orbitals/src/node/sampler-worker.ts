/**
 * worker_threads entry for sampleGridParallel: compiles the state once per job and fills its z-slab of the
 * shared output arrays. Messages: { id, state, grid, zStart, zEnd, re: SharedArrayBuffer, im: SharedArrayBuffer | null }.
 */
import { parentPort } from 'node:worker_threads';
import { compileState } from '../compile';
import type { GridSpec } from '../grid';
import type { OrbitalState } from '../state';

interface Job {
  id: number;
  state: OrbitalState;
  grid: GridSpec;
  zStart: number;
  zEnd: number;
  /** Values in use (n³): the buffers may be larger when they are reused for a smaller grid. */
  count: number;
  re: SharedArrayBuffer;
  im: SharedArrayBuffer | null;
}

/**
 * Warm-up: a few small grids so the sampling loops are optimised by the JIT before the first real job
 * (otherwise a fresh worker spends its first slab in the interpreter).
 */
function warmUp(): void {
  const g = { n: 24, extent: 10 as GridSpec['extent'] };
  const re = new Float32Array(24 * 24 * 24);
  const im = new Float32Array(24 * 24 * 24);
  const real = compileState({ Z: 1, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1, im: 0 }] });
  const cplx = compileState({ Z: 1, terms: [{ n: 2, l: 1, m: 1, basis: 'complex', re: 1, im: 0 }] });
  for (let i = 0; i < 8; i++) {
    real.sampleGrid(g, re, null);
    cplx.sampleGrid(g, re, im);
  }
}

if (parentPort) {
  const port = parentPort;
  warmUp();
  port.postMessage({ id: 0, ok: true, ready: true });
  port.on('message', (job: Job) => {
    try {
      const c = compileState(job.state);
      const re = new Float32Array(job.re, 0, job.count);
      const im = job.im ? new Float32Array(job.im, 0, job.count) : null;
      c.sampleGrid(job.grid, re, im, job.zStart, job.zEnd);
      port.postMessage({ id: job.id, ok: true });
    } catch (e) {
      port.postMessage({ id: job.id, ok: false, error: e instanceof Error ? e.message : String(e) });
    }
  });
}
