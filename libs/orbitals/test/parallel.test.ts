import { existsSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { bohr, compileState, parseOrbitalLabel } from '../src';
import { SamplingBufferPool, SamplingBuffers, closeParallelSampler, prewarmParallelSampler, sampleGridParallel } from '../src/node/parallel';

// worker_threads cannot load TypeScript: the workers run the built dist/node/sampler-worker.js.
const built = existsSync(join(__dirname, '..', 'dist', 'node', 'sampler-worker.js'));

describe.runIf(built)('sampleGridParallel (needs `npx tsc -p tsconfig.build.json` first)', () => {
  afterAll(async () => {
    await closeParallelSampler();
  });

  it('prewarmParallelSampler starts warmed-up workers that then sample correctly (4f_x³, 2 threads)', async () => {
    await prewarmParallelSampler({ threads: 2 });
    const { state } = parseOrbitalLabel('4fx3');
    const grid = { n: 16, extent: bohr(20) };
    const want = new Float32Array(16 ** 3);
    compileState(state).sampleGrid(grid, want, null);
    expect((await sampleGridParallel(state, grid, { threads: 2 })).re).toEqual(want);
  });

  it('gives the same array as sampleGrid for a real state (3d_z², 2 and 3 threads)', async () => {
    const { state } = parseOrbitalLabel('3dz2');
    const grid = { n: 37, extent: bohr(15) };
    const want = new Float32Array(37 ** 3);
    compileState(state).sampleGrid(grid, want, null);
    for (const threads of [2, 3]) {
      const got = await sampleGridParallel(state, grid, { threads });
      expect(got.im).toBeNull();
      expect(got.re.buffer).toBeInstanceOf(SharedArrayBuffer);
      expect(got.re).toEqual(want);
    }
  });

  it('gives the same Re and Im as sampleGrid for a complex superposition', async () => {
    const state = {
      Z: 2,
      terms: [
        { n: 3, l: 2, m: 1, basis: 'complex' as const, re: 0.6, im: 0 },
        { n: 4, l: 1, m: -1, basis: 'complex' as const, re: 0, im: 0.8 },
      ],
    };
    const grid = { n: 20, extent: bohr(10) };
    const re = new Float32Array(8000);
    const im = new Float32Array(8000);
    compileState(state).sampleGrid(grid, re, im);
    const got = await sampleGridParallel(state, grid, { threads: 2 });
    expect(got.re).toEqual(re);
    expect(got.im).toEqual(im);
  });

  it('rejects bad input before starting workers', async () => {
    await expect(sampleGridParallel(parseOrbitalLabel('2pz').state, { n: 1, extent: bohr(1) })).rejects.toThrow(/grid.n/);
    await expect(sampleGridParallel({ Z: 1, terms: [] }, { n: 4, extent: bohr(1) })).rejects.toThrow(/terms/);
  });

  it('fills reused buffers: same values as fresh ones, the same memory for a smaller grid after a larger one', async () => {
    const buffers = new SamplingBuffers();
    const big = parseOrbitalLabel('3dz2').state;
    const small = { Z: 1, terms: [{ n: 2, l: 1, m: 1, basis: 'complex' as const, re: 1, im: 0 }] };
    const g1 = { n: 30, extent: bohr(15) };
    const g2 = { n: 17, extent: bohr(12) };
    const a = await sampleGridParallel(big, g1, { threads: 2, into: buffers });
    const wantA = new Float32Array(30 ** 3);
    compileState(big).sampleGrid(g1, wantA, null);
    expect(a.re).toEqual(wantA);
    const heldAfterFirst = buffers.bytes;
    const b = await sampleGridParallel(small, g2, { threads: 2, into: buffers });
    expect(b.re.buffer).toBe(a.re.buffer); // the same SharedArrayBuffer, not a new one
    expect(b.re.length).toBe(17 ** 3);
    const wantRe = new Float32Array(17 ** 3);
    const wantIm = new Float32Array(17 ** 3);
    compileState(small).sampleGrid(g2, wantRe, wantIm);
    expect(b.re).toEqual(wantRe);
    expect(b.im).toEqual(wantIm);
    expect(buffers.bytes).toBe(heldAfterFirst + 17 ** 3 * 4); // im added once, re kept
    const c = await sampleGridParallel(big, g1, { threads: 1, into: buffers });
    expect(c.re).toEqual(wantA); // one thread, same buffers, same answer
  });

  it('a pool of 2 gives out at most 2 buffer sets; a third job waits for a release', async () => {
    const pool = new SamplingBufferPool(2);
    const a = await pool.acquire();
    const b = await pool.acquire();
    expect(a).not.toBe(b);
    let third: SamplingBuffers | undefined;
    const waiting = pool.acquire().then((x) => (third = x));
    await new Promise((r) => setTimeout(r, 20));
    expect(third).toBeUndefined();
    pool.release(a);
    await waiting;
    expect(third).toBe(a);
    pool.release(third!);
    await expect(pool.with(async () => { throw new Error('job failed'); })).rejects.toThrow('job failed');
    // b is still out, so only the set with() took can answer at once: it was given back despite the failure.
    const again = await Promise.race([pool.acquire(), new Promise((r) => setTimeout(() => r('still waiting'), 200))]);
    expect(again).toBe(a);
    pool.release(b);
    expect(() => new SamplingBufferPool(0)).toThrow(RangeError);
  });
});

it('the parallel test above ran against a built worker script', () => {
  expect(built, 'build libs/orbitals first: npx tsc -p tsconfig.build.json').toBe(true);
});
