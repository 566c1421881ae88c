#!/usr/bin/env node
// Psiform benchmark: `npm run bench` at the repo root. Runs against the BUILT libs (libs/*/dist;
// run `npm run build` first). Prints tables and PASS/MISS beside the targets; never asserts and
// always exits 0. Sections are one function each (see SECTIONS at the bottom) so more can be added.
//
// Options: --quick (N = 64, 128 only; for a smoke run)   --no-isosurface   --no-skimage   --only=render,apijob,...
// Internal: --child-main256 (the N = 256 3d_z² measurement in its own process, for its peak RSS);
//   --child-workermem=pooled|fresh (five consecutive worker mesh jobs in one process, RSS after each);
//   --child-sparse512 (3d_z² at 512³ effective, coarse-to-fine, for its peak RSS); --child-sparse-time (one timed side of the cost pair). --all-rows: every topology row.

import { spawnSync } from 'node:child_process';
import * as fs from 'node:fs';
import { createRequire } from 'node:module';
import * as os from 'node:os';
import * as path from 'node:path';
import { fileURLToPath } from 'node:url';
import { exactSections } from './bench/exact.mjs';
import { ensureDebianPackages } from './lib/system.mjs';

const require = createRequire(import.meta.url);
const HERE = path.dirname(fileURLToPath(import.meta.url));
const ARGS = new Set(process.argv.slice(2));

function loadLibs() {
  try {
    return {
      orbitals: require('@psiform/orbitals'),
      orbitalsNode: require('@psiform/orbitals/node'),
      meshing: require('@psiform/meshing'),
    };
  } catch (err) {
    console.log(`bench: cannot load the built libs (${err.message.split('\n')[0]}); run \`npm run build\` first.`);
    process.exit(0);
  }
}
const { orbitals, orbitalsNode, meshing } = loadLibs();

// ---------------------------------------------------------------------------------------------
// Targets (printed beside the figures)
const TARGETS = {
  skimageRatio: 0.5, // extraction time ours / skimage at N=256, 3d_z², both phases (stretch 0.25)
  skimageStretch: 0.25,
  isosurfaceSpeedup: 10, // isosurface package time / ours
  sampleMvoxPerS: 60, // sampleGridParallel on 2 cores
  peakRssMB: 200,
  livePreviewMs: 60, // mean re-extraction per fraction change at 128³
};
const SIZES = ARGS.has('--quick') ? [64, 128] : [64, 128, 192, 256];
const FRACTION = 0.9;
const results = {}; // filled by sections, read by the summary

// ---------------------------------------------------------------------------------------------
// Helpers
const now = () => globalThis.performance.now();
const mb = (kb) => kb / 1024;

/**
 * Peak RSS of this process in kB. On Linux, getrusage's ru_maxrss survives execve (man 2 getrusage,
 * NOTES), so a child spawned from a big parent reports the parent's size; VmHWM in /proc/self/status
 * belongs to the new address space and does not. Elsewhere fall back to process.resourceUsage().maxRSS.
 */
function peakRssKb() {
  try {
    const m = /VmHWM:\s+(\d+)\s*kB/.exec(fs.readFileSync('/proc/self/status', 'utf8'));
    if (m) return Number(m[1]);
  } catch {
    /* not Linux */
  }
  return process.resourceUsage().maxRSS;
}
const fmt = (x, d = 1) => (x === null || x === undefined || Number.isNaN(x) ? '-' : x.toFixed(d));
const verdict = (ok) => (ok ? 'PASS' : 'MISS');

function table(headers, rows) {
  const cells = [headers, ...rows.map((r) => r.map((c) => String(c)))];
  const w = headers.map((_, i) => Math.max(...cells.map((r) => r[i].length)));
  const line = (r) => '  ' + r.map((c, i) => (i === 0 ? c.padEnd(w[i]) : c.padStart(w[i]))).join('  ');
  console.log(line(headers));
  console.log('  ' + w.map((x) => '-'.repeat(x)).join('  '));
  for (const r of cells.slice(1)) console.log(line(r));
}

/** The figures are only as good as the machine is idle: say so when other work shares the cores. */
function loadNote() {
  const [one] = os.loadavg();
  const cores = os.cpus().length;
  return `${one.toFixed(2)} on ${cores} cores${one > cores * 0.75 ? ' (BUSY: other processes share the cores; timings are pessimistic and noisy)' : ''}`;
}

function heading(title) {
  console.log(`\n== ${title}`);
}

const STATES = {
  '3d_z2': () => orbitals.parseOrbitalLabel('3dz2').state,
  '1s': () => orbitals.parseOrbitalLabel('1s').state,
};

/** Every benchmark state at every grid size, in the one order all tables use: the state, its compiled form and the grid. */
function* statesAndGrids() {
  for (const name of Object.keys(STATES)) {
    const state = STATES[name]();
    const compiled = orbitals.compileState(state);
    for (const n of SIZES) yield { name, state, compiled, n, grid: gridFor(state, n) };
  }
}

function gridFor(state, n) {
  return { n, extent: orbitals.autoExtent(state) };
}

function density(re) {
  const d = new Float32Array(re.length);
  for (let i = 0; i < re.length; i++) d[i] = re[i] * re[i];
  return d;
}

/** Isovalue c of psi for the surface enclosing `fraction` of the sampled probability. */
function isovalueFor(re, fraction) {
  return Math.sqrt(orbitals.enclosedThreshold(density(re), fraction));
}

function best(times, fn) {
  let b = Infinity;
  let out;
  for (let i = 0; i < times; i++) {
    const t0 = now();
    out = fn();
    b = Math.min(b, now() - t0);
  }
  return { ms: b, out };
}

async function bestAsync(times, fn) {
  let b = Infinity;
  let out;
  for (let i = 0; i < times; i++) {
    const t0 = now();
    out = await fn();
    b = Math.min(b, now() - t0);
  }
  return { ms: b, out };
}

/** Our extraction as the product runs it: both phases (or one for complex), analytic normals. */
function extractOurs(compiled, field, grid, c) {
  // Real states: the extraction field is psi itself (the pipeline's extractionField returns it unchanged).
  const surfaces = meshing.extractOrbitalSurfaces(compiled, field.re, grid, c);
  let triangles = 0;
  let vertices = 0;
  for (const s of surfaces) {
    triangles += s.mesh.indices.length / 3;
    vertices += s.mesh.positions.length / 3;
  }
  return { surfaces, triangles, vertices };
}

/** The bare kernel per phase (field normals by central differences, as skimage computes them). */
function extractKernel(field, grid, c) {
  const { dims, origin, spacing } = meshing.cubeGeometry(grid);
  const geom = { origin, spacing };
  const a = meshing.extractIsosurface(field, dims, geom, c, { inside: 'above', closeAtBoundary: false });
  const b = meshing.extractIsosurface(field, dims, geom, -c, { inside: 'below', closeAtBoundary: false });
  return a.indices.length / 3 + b.indices.length / 3;
}

/** The `isosurface` package (level fixed at 0, callback per corner): ψ scaled ×1e3 and shifted by the level. */
function extractIsosurfacePkg(field, n, c) {
  const { marchingCubes } = require('isosurface');
  const dims = [n, n, n];
  const bounds = [
    [0, 0, 0],
    [n, n, n],
  ];
  const nn = n * n;
  const plus = marchingCubes(dims, (x, y, z) => (field[x + n * y + nn * z] - c) * 1e3, bounds);
  const minus = marchingCubes(dims, (x, y, z) => (-c - field[x + n * y + nn * z]) * 1e3, bounds);
  return plus.cells.length + minus.cells.length;
}

let skimageState = null; // null: untested, false: unavailable (with note), true: available
function skimageAvailable() {
  if (skimageState !== null) return skimageState;
  if (ARGS.has('--no-skimage')) {
    skimageState = false;
    results.skimageNote = 'skipped (--no-skimage)';
    return false;
  }
  const py = '/usr/bin/python3';
  try {
    // The peer comes from Debian (python3-skimage), installed here when missing (needs root, as npm start).
    ensureDebianPackages(['python3-skimage']);
  } catch (err) {
    console.log(`  (could not install python3-skimage: ${err.message.split('\n')[0]})`);
  }
  const r = spawnSync(py, ['-c', 'import skimage, numpy; print(skimage.__version__)'], { encoding: 'utf8' });
  skimageState = r.status === 0;
  results.skimageNote = skimageState ? `scikit-image ${r.stdout.trim()} (Debian python3-skimage, /usr/bin/python3)` : `skipped: /usr/bin/python3 has no skimage (${(r.stderr || '').trim().split('\n').pop()})`;
  return skimageState;
}

/** Times skimage.measure.marching_cubes (Lewiner) at +c and -c on the same float32 grid. */
function extractSkimage(field, n, c, repeats) {
  // Only the phases that exist on this grid (1s has no psi < -c; skimage refuses a level outside the data).
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < field.length; i++) {
    const v = field[i];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  const levels = [c, -c].filter((l) => l > lo && l < hi);
  const file = path.join(os.tmpdir(), `psiform-bench-${process.pid}-${n}.f32`);
  fs.writeFileSync(file, Buffer.from(field.buffer, field.byteOffset, field.byteLength));
  try {
    const r = spawnSync('/usr/bin/python3', [path.join(HERE, 'bench', 'skimage_mc.py'), file, String(n), String(repeats), ...levels.map(String)], {
      encoding: 'utf8',
      maxBuffer: 1 << 20,
    });
    if (r.status !== 0) return { error: (r.stderr || '').trim().split('\n').pop() };
    const j = JSON.parse(r.stdout);
    return { ms: j.levels.reduce((s, l) => s + l.best_ms, 0), triangles: j.levels.reduce((s, l) => s + l.triangles, 0) };
  } finally {
    fs.rmSync(file, { force: true });
  }
}

// ---------------------------------------------------------------------------------------------
// Section: sampling throughput
async function sectionSampling() {
  heading('Sampling psi on the grid (Mvoxels/s; 1 thread = compileState().sampleGrid, 2 threads = sampleGridParallel)');
  const rows = [];
  results.sampling = {};
  for (const { name, state, compiled, n, grid } of statesAndGrids()) {
    const count = n * n * n;
    const out = new Float32Array(count);
    const reps = n <= 128 ? 3 : 2;
    compiled.sampleGrid({ n: 32, extent: grid.extent }, new Float32Array(32 ** 3), null); // warm-up
    const one = best(reps, () => compiled.sampleGrid(grid, out, null));
    await orbitalsNode.sampleGridParallel(state, { n: 32, extent: grid.extent }, { threads: 2 }); // spawn workers
    const two = await bestAsync(reps, () => orbitalsNode.sampleGridParallel(state, grid, { threads: 2 }));
    const m1 = count / one.ms / 1e3;
    const m2 = count / two.ms / 1e3;
    results.sampling[`${name}/${n}`] = { m1, m2 };
    rows.push([name, `${n}³`, fmt(grid.extent, 2), fmt(one.ms), fmt(m1), fmt(two.ms), fmt(m2), fmt(two.ms ? one.ms / two.ms : 0, 2)]);
  }
  table(['state', 'N', 'extent a0', '1 thr ms', 'Mvox/s', '2 thr ms', 'Mvox/s', 'speed-up'], rows);
}

// ---------------------------------------------------------------------------------------------
// Section: extraction against the isosurface package and scikit-image
async function sectionExtraction() {
  heading(`Extraction at the ${FRACTION * 100}%-enclosing isovalue (ms; ours = extractOrbitalSurfaces, both phases, analytic normals)`);
  const withSk = skimageAvailable();
  const withIso = !ARGS.has('--no-isosurface');
  console.log(`  skimage: ${results.skimageNote}`);
  console.log(`  isosurface package: ${withIso ? 'require("isosurface").marchingCubes, up to N=192, and N=256 for 3d_z² once' : 'skipped (--no-isosurface)'}`);
  const rows = [];
  results.extraction = {};
  for (const { name, state, compiled, n, grid } of statesAndGrids()) {
    const field = await orbitalsNode.sampleGridParallel(state, grid, { threads: 2 });
    const tt0 = now();
    const c = isovalueFor(field.re, FRACTION);
    const thresholdMs = now() - tt0;
    const reps = 3;
    extractOurs(compiled, field, grid, c); // warm-up (JIT)
    const ours = best(reps, () => extractOurs(compiled, field, grid, c));
    const kernel = best(reps, () => extractKernel(field.re, grid, c));
    let iso = null;
    if (withIso && (n <= 192 || (n === 256 && name === '3d_z2'))) {
      iso = best(1, () => extractIsosurfacePkg(field.re, n, c));
    }
    let sk = null;
    if (withSk) sk = extractSkimage(field.re, n, c, 3);
    const rec = { ours: ours.ms, kernel: kernel.ms, iso: iso?.ms ?? null, sk: sk && !sk.error ? sk.ms : null, tris: ours.out.triangles, skTris: sk?.triangles ?? null, isoTris: iso?.out ?? null };
    results.extraction[`${name}/${n}`] = rec;
    rows.push([
      name,
      `${n}³`,
      fmt(thresholdMs),
      fmt(ours.ms),
      fmt(kernel.ms),
      String(ours.out.triangles),
      sk ? (sk.error ? `error: ${sk.error}` : fmt(sk.ms)) : '-',
      sk && !sk.error ? String(sk.triangles) : '-',
      rec.sk ? fmt(ours.ms / rec.sk, 2) : '-',
      iso ? fmt(iso.ms) : '-',
      iso ? fmt(iso.ms / ours.ms, 1) + '×' : '-',
    ]);
    // Let the sampled grid go before the next size (keeps the bench's own RSS honest).
    field.re = null;
  }
  table(['state', 'N', 'thresh ms', 'ours ms', 'kernel ms', 'triangles', 'skimage ms', 'sk tris', 'ours/sk', 'isosurf ms', 'iso/ours'], rows);
  console.log('  (kernel = bare extractIsosurface per phase with central-difference normals, the like-for-like with skimage;');
  console.log('   both leave surfaces open where they reach the box, so triangle counts agree closely)');
}

// ---------------------------------------------------------------------------------------------
// Section: the main N = 256 3d_z² measurement in a child process (its own peak RSS)
async function childMain256() {
  // The product path, as `psiform mesh --orbital 3dz2 --grid 256` runs it: parallel sampling into a
  // shared buffer, threshold in place, both phases, mesh statistics.
  const state = STATES['3d_z2']();
  const grid = gridFor(state, 256);
  const t0 = now();
  const field = await orbitalsNode.sampleGridParallel(state, grid, { threads: 2 });
  const t1 = now();
  // recipeToSurfaces with the grid fixed at 256 (its 'threshold' is the all-space level solve, timed as 'plan').
  const r = await meshing.recipeToSurfaces({ content: state, grid: { n: 256, extent: Number(grid.extent) }, surface: { rule: 'enclosed', fraction: FRACTION } }, { sample: () => field });
  const triangles = r.surfaces.reduce((s, x) => s + x.mesh.indices.length / 3, 0);
  console.log(
    JSON.stringify({
      sample_ms: t1 - t0,
      threshold_ms: r.timings_ms.plan + r.timings_ms.threshold,
      extract_ms: r.timings_ms.extracting,
      stats_ms: r.timings_ms.statistics,
      triangles,
      maxRSS_kb: peakRssKb(),
    }),
  );
}

async function sectionMemory() {
  heading('Peak memory (RSS): the product path (sampleGridParallel + recipeToSurfaces) in a fresh process');
  const r = spawnSync(process.execPath, [fileURLToPath(import.meta.url), '--child-main256'], { encoding: 'utf8' });
  let child = null;
  try {
    child = JSON.parse(r.stdout.trim().split('\n').pop());
  } catch {
    console.log(`  child failed: ${(r.stderr || '').trim().split('\n').pop()}`);
  }
  if (child) {
    results.childRssMB = mb(child.maxRSS_kb);
    table(
      ['run', 'sample ms', 'Mvox/s', 'thresh ms', 'extract ms', 'stats ms', 'triangles', 'peak RSS MB', `≤ ${TARGETS.peakRssMB} MB`],
      [['child: 256³ 3d_z², 2 threads, both phases', fmt(child.sample_ms), fmt(256 ** 3 / child.sample_ms / 1e3), fmt(child.threshold_ms), fmt(child.extract_ms), fmt(child.stats_ms), String(child.triangles), fmt(results.childRssMB), verdict(results.childRssMB <= TARGETS.peakRssMB)]],
    );
  }
  results.benchRssMB = mb(peakRssKb());
  console.log(`  this bench process so far: peak RSS ${fmt(results.benchRssMB)} MB (includes the isosurface package's nested arrays)`);
}

// ---------------------------------------------------------------------------------------------
// Section: worker memory across consecutive jobs (issue "Stays up and stays scoped": RSS after five consecutive
// 320³ jobs at most 1.5 × RSS after the first). Each run is a fresh process doing five mesh builds in a row:
// "worker path" is the worker's own buildMesh (apps/worker/dist: pooled sampling buffers; stored objects are kept in
// memory only, so storage is not measured); its peer in the same run is the same stages with a fresh buffer per job.
const WORKER_MEM = { n: 320, jobs: 5, fractions: [0.9, 0.85, 0.8, 0.75, 0.7], targetRatio: 1.5 };

async function childWorkerMemory(mode) {
  const dist = path.join(HERE, '..', 'apps', 'worker', 'dist', 'mesh');
  const { buildMesh, encode } = require(path.join(dist, 'mesh-assets.js'));
  const { parseRecipe } = require('@psiform/contracts');
  const { createHash } = require('node:crypto');
  const assets = {
    // Only what buildMesh calls: the bytes are hashed and dropped (a real worker hands them to S3 and drops them too).
    storeObject: async (key, bytes) => ({ key, bytes: bytes.length, sha256: createHash('sha256').update(bytes).digest('hex') }),
  };
  const rss = [];
  for (let i = 0; i < WORKER_MEM.jobs; i++) {
    const { recipe } = parseRecipe({ version: 1, label: '3dz2', content: { Z: 1, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1 }] }, grid: { n: WORKER_MEM.n }, surface: { rule: 'enclosed', fraction: WORKER_MEM.fractions[i] } });
    const t0 = now();
    if (mode === 'pooled') {
      await buildMesh({ assets, storage: {}, engineVersion: 'bench' }, { recipe, version: { id: `v${i}`, recipeHash: `bench${i}` }, publicationId: 'bench' }, async () => undefined);
    } else {
      // The same one pipeline (recipeToSurfaces) and encoders, sampling into fresh buffers every time.
      const r = await meshing.recipeToSurfaces(recipe, { sample: (state, grid) => orbitalsNode.sampleGridParallel(state, { n: grid.n, extent: grid.extent }) });
      const surfaces = r.surfaces.filter((x) => x.mesh.indices.length > 0).map((x) => ({ phase: x.phase, mesh: x.mesh }));
      const files = await encode(surfaces, recipe, {}, 'bench', r.nodal ?? null);
      for (const k of ['glb', 'stl']) await assets.storeObject(k, files[k]);
    }
    await new Promise((r) => setTimeout(r, 50)); // let the job's garbage go as an idle worker would between jobs
    rss.push({ ms: now() - t0, rssMB: process.memoryUsage().rss / 1048576 });
  }
  orbitalsNode.closeParallelSampler?.();
  console.log(JSON.stringify({ rss, peakMB: mb(peakRssKb()) }));
}

async function sectionWorkerMemory() {
  heading(`Worker memory: ${WORKER_MEM.jobs} consecutive ${WORKER_MEM.n}³ mesh jobs (3d_z², fractions ${WORKER_MEM.fractions.join(', ')}) in a fresh process each`);
  const runs = {};
  for (const mode of ['pooled', 'fresh']) {
    const r = spawnSync(process.execPath, [fileURLToPath(import.meta.url), `--child-workermem=${mode}`], { encoding: 'utf8' });
    try {
      runs[mode] = JSON.parse(r.stdout.trim().split('\n').pop());
    } catch {
      console.log(`  ${mode} run failed: ${(r.stderr || r.stdout || '').trim().split('\n').pop()}`);
    }
  }
  const rows = [];
  for (const [mode, label] of [['pooled', 'worker path (buildMesh, pooled buffers)'], ['fresh', 'peer: fresh buffers per job']]) {
    const run = runs[mode];
    if (!run) continue;
    const ratio = run.rss[run.rss.length - 1].rssMB / run.rss[0].rssMB;
    rows.push([label, ...run.rss.map((x) => fmt(x.rssMB, 0)), fmt(ratio, 2), fmt(run.peakMB, 0), mode === 'pooled' ? verdict(ratio <= WORKER_MEM.targetRatio) : '']);
    if (mode === 'pooled') results.workerMemRatio = ratio;
    else results.workerMemPeerRatio = ratio;
  }
  table(['run', ...Array.from({ length: WORKER_MEM.jobs }, (_, i) => `RSS MB after #${i + 1}`), 'last / first', 'peak MB', `≤ ${WORKER_MEM.targetRatio}`], rows);
}

// ---------------------------------------------------------------------------------------------
// Section: live preview (re-extraction at 10 fractions on an already sampled 128³ grid)
async function sectionLivePreview() {
  heading('Live preview: 128³ 3d_z² already sampled; per fraction change = recipeToSurfaces on the kept grid (all-space level, box check, both phases)');
  const state = STATES['3d_z2']();
  const grid = gridFor(state, 128);
  const field = await orbitalsNode.sampleGridParallel(state, grid, { threads: 2 });
  // The preview worker's sampler hands the kept grid back (a copy: the pipeline may write into it).
  const sample = () => ({ re: field.re.slice(), im: null });
  const recipeAt = (f) => ({ content: state, grid: { n: 128, extent: Number(grid.extent) }, surface: { rule: 'enclosed', fraction: f } });
  const fractions = [0.5, 0.55, 0.6, 0.65, 0.7, 0.75, 0.8, 0.85, 0.9, 0.95];
  await meshing.recipeToSurfaces(recipeAt(0.9), { sample, stats: false }); // warm-up
  const rows = [];
  let total = 0;
  for (const f of fractions) {
    const t0 = now();
    const r = await meshing.recipeToSurfaces(recipeAt(f), { sample, stats: false });
    const t = r.timings_ms;
    const dt = now() - t0;
    total += dt;
    const triangles = r.surfaces.reduce((n, s) => n + s.mesh.indices.length / 3, 0);
    rows.push([fmt(f, 2), r.isovalue.toExponential(3), fmt(t.plan + t.threshold), fmt(t.extracting), fmt(dt), String(triangles)]);
  }
  table(['fraction', 'isovalue', 'level ms', 'extract ms', 'update ms', 'triangles'], rows);
  results.liveMeanMs = total / fractions.length;
  console.log(`  mean ${fmt(results.liveMeanMs)} ms per update (target < ${TARGETS.livePreviewMs} ms): ${verdict(results.liveMeanMs < TARGETS.livePreviewMs)}`);
}

// ---------------------------------------------------------------------------------------------
// Section: POST …/meshes to a completed job at 192³ (and a print PNG export), through the running API
async function sectionApiJob() {
  heading('API: POST …/meshes to a completed job at 192³');
  const base = process.env.PSIFORM_URL?.replace(/\/+$/, '');
  if (!base) {
    console.log('  skipped: PSIFORM_URL is not set (start the API and worker, then PSIFORM_URL=http://127.0.0.1:PORT npm run bench)');
    return;
  }
  const call = async (method, path, token, body) => {
    const res = await fetch(`${base}${path}`, {
      method,
      headers: { 'content-type': 'application/json', ...(token ? { authorization: `Bearer ${token}` } : {}) },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const json = await res.json().catch(() => null);
    if (!res.ok) throw new Error(`${method} ${path} answered ${res.status}: ${JSON.stringify(json)}`);
    return json;
  };
  // The demo illustrator (seeded demo data; the password is the documented demo one).
  const { accessToken: token } = await call('POST', '/api/auth/login', null, { email: 'illustrator@demo.psiform.test', password: 'psiform-demo' });
  const pubs = await call('GET', '/api/publications', token);
  if (!pubs.length) throw new Error('the demo illustrator has no publication (seed the demo scenario)');
  const waitJob = async (jobId) => {
    for (;;) {
      const j = await call('GET', `/api/jobs/${jobId}`, token);
      if (j.state === 'completed' || j.state === 'failed') return j;
      await new Promise((r) => setTimeout(r, 25));
    }
  };
  const rows = [];
  const stamp = new Date().toISOString().replace(/[:.]/g, '-');
  for (let i = 0; i < 3; i++) {
    const recipe = { version: 1, label: '3dz2', content: { Z: 1, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1 }] }, grid: { n: 192 }, surface: { rule: 'enclosed', fraction: 0.85 + 0.02 * i } };
    const fig = await call('POST', '/api/figures', token, { publicationId: pubs[0].id, title: `Bench 192³ ${stamp} #${i + 1}`, recipe });
    const t0 = now();
    const { jobId } = await call('POST', `/api/figures/${fig.id}/meshes`, token);
    const job = await waitJob(jobId);
    const wall = now() - t0;
    rows.push([`#${i + 1}`, job.state, fmt(wall, 0), fmt(job.timings?.total, 0), fmt(job.timings?.sample, 0), fmt(job.timings?.extract, 0)]);
    results.apiMeshMs = Math.min(results.apiMeshMs ?? Infinity, wall);
    if (i === 2) {
      const t1 = now();
      const exp = await call('POST', `/api/figures/${fig.id}/exports`, token, { format: 'png', widthMm: 89, heightMm: 60, dpi: 300 });
      const pj = await waitJob(exp.jobId);
      results.apiPngMs = now() - t1;
      console.log(`  then POST …/exports png 89 × 60 mm at 300 dpi (1051 × 709 px) -> ${pj.state} in ${fmt(results.apiPngMs, 0)} ms wall (worker render ${fmt(pj.timings?.render_total, 0)} ms)`);
    }
  }
  table(['run', 'state', 'wall ms', 'worker total ms', 'sample ms', 'extract ms'], rows);
  console.log(`  best ${fmt(results.apiMeshMs, 0)} ms (target < 2000 ms): ${verdict(results.apiMeshMs < 2000)}; the figures stay in the demo publication (titles "Bench 192³ ${stamp} #n")`);
}

// ---------------------------------------------------------------------------------------------
// Section: headless render of a print PNG, 180 × 120 mm at 600 dpi = 4252 × 2835 px, through the worker's own
// render code (apps/worker/dist/render: one Chromium, the static site with apps/web/dist, render.html, finishPng + checks).
async function sectionRender() {
  heading('Render: PNG 180 × 120 mm at 600 dpi (4252 × 2835 px) through the worker render path');
  const dist = path.join(HERE, '..', 'apps', 'worker', 'dist');
  let mods;
  try {
    mods = {
      site: require(path.join(dist, 'render', 'static-site.js')),
      browser: require(path.join(dist, 'render', 'headless-browser.js')),
      renderer: require(path.join(dist, 'render', 'figure-renderer.js')),
      mesh: require(path.join(dist, 'mesh', 'mesh-assets.js')),
      config: require(path.join(dist, 'config', 'config.js')),
      contracts: require('@psiform/contracts'),
      print: require('@psiform/print'),
    };
  } catch (err) {
    console.log(`  skipped: the worker is not built (${err.message.split('\n')[0]}); run \`npm run build\``);
    return;
  }
  const webDist = process.env.WEB_DIST || mods.config.DEFAULT_WEB_DIST;
  const site = new mods.site.StaticSite(webDist);
  try {
    site.checkBuilt();
  } catch (err) {
    console.log(`  skipped: ${err.message}`);
    return;
  }
  const parsed = mods.contracts.parseRecipe({ version: 1, label: '3dz2', content: { Z: 1, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1 }] }, grid: { n: 128 }, surface: { rule: 'enclosed', fraction: 0.9 } });
  const recipe = parsed.recipe;
  const r = await meshing.recipeToSurfaces(recipe, { sample: (state, grid) => orbitalsNode.sampleGridParallel(state, { n: grid.n, extent: grid.extent }) });
  const surfaces = r.surfaces.filter((x) => x.mesh.indices.length > 0);
  const { glb } = await mods.mesh.encode(surfaces, recipe, {}, 'bench');
  const browser = new mods.browser.HeadlessBrowser(process.env.CHROMIUM_PATH || '/usr/bin/chromium');
  const renderer = new mods.renderer.FigureRenderer(browser, site, 600000);
  const { width, height } = mods.print.exportPixelSize({ widthMm: 180, heightMm: 120, dpi: 600 });
  const rows = [];
  try {
    for (const run of ['cold (launch + page load)', 'warm', 'warm']) {
      const t0 = now();
      const out = await renderer.render({ recipe, glb, widthPx: width, heightPx: height, dpi: 600 });
      const wall = now() - t0;
      const info = mods.print.readPngInfo(out.png);
      rows.push([run, `${info.width}×${info.height}`, String(out.tiles), fmt(out.ms.page, 0), fmt(out.ms.render, 0), fmt(out.ms.encode, 0), fmt(out.ms.finish, 0), fmt(wall, 0), fmt(out.png.length / 1e6, 1)]);
      if (run === 'warm') results.renderWarmMs = Math.min(results.renderWarmMs ?? Infinity, wall);
      else results.renderColdMs = wall;
    }
  } finally {
    await browser.close();
    await site.close();
  }
  table(['run', 'px', 'tiles', 'page ms', 'render ms', 'page encode ms', 'finish ms', 'wall ms', 'MB'], rows);
  console.log(`  ${surfaces.reduce((n, s) => n + s.mesh.indices.length / 3, 0)} triangles (3d_z², 128³); best warm ${fmt(results.renderWarmMs, 0)} ms (target < 5000 ms): ${verdict(results.renderWarmMs < 5000)}; cold ${fmt(results.renderColdMs, 0)} ms`);
  orbitalsNode.closeParallelSampler?.();
}

// ---------------------------------------------------------------------------------------------
function summary() {
  heading('Targets');
  const rows = [];
  const e = results.extraction?.['3d_z2/256'];
  if (e?.sk) {
    const ratio = e.ours / e.sk;
    rows.push(['extraction 256³ 3d_z², ours / skimage', fmt(ratio, 2), `≤ ${TARGETS.skimageRatio} (stretch ${TARGETS.skimageStretch})`, ratio <= TARGETS.skimageStretch ? 'PASS (stretch)' : verdict(ratio <= TARGETS.skimageRatio)]);
  } else rows.push(['extraction 256³ 3d_z², ours / skimage', '-', `≤ ${TARGETS.skimageRatio}`, e ? 'not measured (skimage unavailable)' : 'not measured (N=256 not run)']);
  if (e?.iso) {
    const speed = e.iso / e.ours;
    rows.push(['extraction 256³ 3d_z², isosurface / ours', fmt(speed, 1) + '×', `≥ ${TARGETS.isosurfaceSpeedup}×`, verdict(speed >= TARGETS.isosurfaceSpeedup)]);
  } else rows.push(['extraction 256³ 3d_z², isosurface / ours', '-', `≥ ${TARGETS.isosurfaceSpeedup}×`, 'not measured']);
  const s = results.sampling?.['3d_z2/256'] ?? results.sampling?.[`3d_z2/${SIZES[SIZES.length - 1]}`];
  if (s) rows.push([`sampling 3d_z², 2 threads (${SIZES[SIZES.length - 1]}³)`, fmt(s.m2) + ' Mvox/s', `≥ ${TARGETS.sampleMvoxPerS}`, verdict(s.m2 >= TARGETS.sampleMvoxPerS)]);
  if (results.childRssMB !== undefined) rows.push(['peak RSS, 256³ 3d_z² child', fmt(results.childRssMB) + ' MB', `≤ ${TARGETS.peakRssMB} MB`, verdict(results.childRssMB <= TARGETS.peakRssMB)]);
  if (results.workerMemRatio !== undefined) rows.push([`worker RSS after ${WORKER_MEM.jobs} × ${WORKER_MEM.n}³ jobs / after the first`, fmt(results.workerMemRatio, 2) + (results.workerMemPeerRatio !== undefined ? ` (peer with fresh buffers ${fmt(results.workerMemPeerRatio, 2)})` : ''), `≤ ${WORKER_MEM.targetRatio}`, verdict(results.workerMemRatio <= WORKER_MEM.targetRatio)]);
  if (results.liveMeanMs !== undefined) rows.push(['live preview 128³, mean per update', fmt(results.liveMeanMs) + ' ms', `< ${TARGETS.livePreviewMs} ms`, verdict(results.liveMeanMs < TARGETS.livePreviewMs)]);
  if (results.apiMeshMs !== undefined) rows.push(['API POST …/meshes -> completed, 192³', fmt(results.apiMeshMs, 0) + ' ms', '< 2000 ms', verdict(results.apiMeshMs < 2000)]);
  if (results.renderWarmMs !== undefined) rows.push(['render + encode 4252 × 2835 (warm browser)', fmt(results.renderWarmMs, 0) + ' ms', '< 5000 ms', verdict(results.renderWarmMs < 5000)]);
  rows.push(...EXACT.summaryRows(verdict));
  table(['target', 'measured', 'target', 'verdict'], rows);
  console.log(`\n  machine: ${os.cpus()[0]?.model ?? 'cpu'} × ${os.cpus().length}, Node ${process.version}; bench process peak RSS ${fmt(mb(peakRssKb()))} MB (VmHWM; process.resourceUsage().maxRSS says ${fmt(mb(process.resourceUsage().maxRSS))} MB)`);
}

// Exact surfaces (scripts/bench/exact.mjs): geometric error, coarse-to-fine cost and memory, topology.
const EXACT = exactSections({ orbitals, meshing, table, heading, fmt, results, ARGS, HERE, extractSkimage, skimageAvailable, peakRssKb, now });
const { sectionExact, sectionSparse, sectionTopology } = EXACT;

// Order matters only for readability; each section is independent.
const SECTIONS = [sectionSampling, sectionExtraction, sectionMemory, sectionWorkerMemory, sectionLivePreview, sectionApiJob, sectionRender, sectionExact, sectionSparse, sectionTopology];

async function main() {
  if (ARGS.has('--child-main256')) {
    await childMain256();
    return;
  }
  if (ARGS.has('--child-sparse-time')) {
    await EXACT.childSparseTime();
    return;
  }
  if (ARGS.has('--child-sparse512')) {
    await EXACT.childSparse512();
    return;
  }
  const workerMem = process.argv.find((a) => a.startsWith('--child-workermem='));
  if (workerMem) {
    await childWorkerMemory(workerMem.slice('--child-workermem='.length));
    return;
  }
  const t0 = now();
  console.log(`Psiform bench (sizes ${SIZES.join(', ')}; enclosed fraction ${FRACTION}; libs from dist)`);
  console.log(`  load average at start: ${loadNote()}`);
  // --only=render,api runs just those sections (names: sampling, extraction, memory, workermemory, livepreview, apijob,
  // render, exact, sparse, topology).
  const only = process.argv.find((a) => a.startsWith('--only='))?.slice(7).toLowerCase().split(',');
  for (const section of SECTIONS) {
    if (only && !only.some((o) => section.name.toLowerCase() === `section${o}`)) continue;
    try {
      await section();
    } catch (err) {
      console.log(`  section ${section.name} failed: ${err?.stack ?? err}`);
    }
  }
  summary();
  console.log(`  load average at end: ${loadNote()}`);
  console.log(`  total bench time ${fmt((now() - t0) / 1000)} s`);
}

main()
  .catch((err) => console.log(`bench failed: ${err?.stack ?? err}`))
  .finally(() => {
    process.exitCode = 0;
  });
