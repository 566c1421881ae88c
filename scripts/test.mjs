// `npm test`: the same set-up as `npm start` on its own ports and a throwaway data folder, then every suite.
// Prints each runner's counts and a closing "N passed, N failed" line; exits non-zero when anything fails.
import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { TEST_PACKAGES, ensureDebianPackages } from './lib/system.mjs';
import { buildAll, ensureNodeModules } from './lib/npm.mjs';
import { ROOT, layout, startServices } from './lib/services.mjs';
import { migrateAndSeed, startApps } from './lib/apps.mjs';
import { runCapture, stopRunners } from './lib/proc.mjs';
import { parseCounts } from './lib/counts.mjs';
import { fail, log, ok } from './lib/log.mjs';

// Optional: suite names to run, e.g. `npm test -- api web`; `suite=pattern` runs only that suite's test files whose
// path matches the pattern (vitest/jest filter, node --test file name), e.g. `npm test -- api=rerender`.
const picks = process.argv.slice(2).map((a) => a.split('='));
const only = picks.map(([name]) => name);
const patternOf = (name) => picks.find(([n]) => n === name)?.[1];
const results = [];
const cleanups = [];
let dataDir;

async function cleanup() {
  stopRunners();
  for (const c of cleanups.reverse()) {
    try { await c(); } catch (e) { fail(`clean-up: ${e.message}`); }
  }
  cleanups.length = 0;
  if (dataDir && !process.env.PSIFORM_KEEP_TEST_DATA) rmSync(dataDir, { recursive: true, force: true });
}
process.on('SIGINT', async () => { await cleanup(); process.exit(130); });
process.on('SIGTERM', async () => { await cleanup(); process.exit(143); });

// Each suite has a time limit, so one hung runner fails its suite with a clear line instead of stalling the run.
// Generous: about three times what the suite takes on a quiet two-core machine (PSIFORM_SUITE_MINUTES overrides).
const SUITE_MINUTES = { e2e: 45, api: 30, worker: 20, web: 15, meshing: 15, cli: 15 };
async function suite(name, runner, cmd, args, opts = {}) {
  if (only.length && !only.includes(name)) return;
  log(`── suite ${name} (${runner}) ──`);
  const t0 = Date.now();
  const minutes = Number(process.env.PSIFORM_SUITE_MINUTES) || SUITE_MINUTES[name] || 10;
  const pattern = patternOf(name);
  if (pattern) args = runner === 'node' ? args.flatMap((a) => (a.endsWith('/') ? readdirSync(path.join(ROOT, a)).filter((f) => f.endsWith('.test.mjs') && f.includes(pattern)).map((f) => a + f) : [a])) : [...args, pattern];
  const { code, out } = await runCapture(cmd, args, { cwd: ROOT, ...opts, env: { ...process.env, ...opts.env }, timeoutMs: minutes * 60_000 });
  const counts = parseCounts(runner, out);
  const bad = code !== 0 || counts.failed > 0 || counts.passed === 0; // a suite that ran no test is a failure
  results.push({ name, runner, ...counts, code, seconds: (Date.now() - t0) / 1000, bad });
}

let exitCode;
try {
  const t0 = Date.now();
  ensureDebianPackages(TEST_PACKAGES);
  ensureNodeModules(ROOT);
  if (!process.env.PSIFORM_SKIP_BUILD) buildAll(ROOT);
  dataDir = mkdtempSync(path.join(os.tmpdir(), 'psiform-test-'));
  const lay = layout('test', dataDir);
  const svc = await startServices(lay, { external: false });
  cleanups.push(svc.stopAll);
  migrateAndSeed(svc.env);
  const env = { ...svc.env, PSIFORM_TEST_DATA: dataDir, NODE_ENV: 'test' };

  // Lint first: it needs no services and fails fast on a broken import rule (libs stay pure).
  await suite('lint', 'eslint', process.execPath, [path.join(ROOT, 'scripts/lint.mjs')], { env });
  const vitest = path.join(ROOT, 'node_modules/.bin/vitest');
  const jest = path.join(ROOT, 'node_modules/.bin/jest');
  for (const [name, dir] of [['contracts', 'libs/contracts'], ['colour', 'libs/colour'], ['orbitals', 'libs/orbitals'], ['meshing', 'libs/meshing'], ['print', 'libs/print'], ['cli', 'apps/cli'], ['web', 'apps/web']]) {
    await suite(name, 'vitest', vitest, ['run'], { cwd: path.join(ROOT, dir), env });
  }
  // --forceExit: a spec that leaves a handle open (a child process, a socket) must not keep the runner alive.
  await suite('server', 'jest', jest, ['--runInBand', '--ci', '--forceExit'], { cwd: path.join(ROOT, 'libs/server'), env });
  await suite('api', 'jest', jest, ['--runInBand', '--ci', '--forceExit'], { cwd: path.join(ROOT, 'apps/api'), env });
  await suite('worker', 'jest', jest, ['--runInBand', '--ci', '--forceExit'], { cwd: path.join(ROOT, 'apps/worker'), env });

  if (!only.length || only.includes('e2e')) {
    const apps = await startApps(svc.env, { port: lay.ports.app, logDir: svc.logDir, workers: 1 });
    cleanups.push(apps.stopApps);
    await suite('e2e', 'node', process.execPath, ['--test', '--test-concurrency=1', '--test-timeout=600000', 'test/e2e/'], {
      env: { ...env, PSIFORM_URL: apps.url, PSIFORM_LOG_DIR: svc.logDir },
    });
  }

  log('── summary ──');
  let passed = 0, failedN = 0, skipped = 0;
  for (const r of results) {
    const mark = r.bad ? 'FAIL' : 'ok  ';
    console.log(`${mark} ${r.name.padEnd(10)} ${r.runner.padEnd(7)} ${String(r.passed).padStart(4)} passed ${String(r.failed).padStart(3)} failed ${String(r.skipped).padStart(3)} skipped  (exit ${r.code}, ${r.seconds.toFixed(1)} s)`);
    passed += r.passed; failedN += r.failed; skipped += r.skipped;
  }
  const anyFailed = results.some((r) => r.bad);
  if (anyFailed && failedN === 0) failedN = results.filter((r) => r.bad).length; // a suite that crashed counts as a failure
  log(`total time ${((Date.now() - t0) / 1000).toFixed(0)} s`);
  console.log(`${passed} passed, ${failedN} failed, ${skipped} skipped`);
  exitCode = anyFailed ? 1 : 0;
  if (anyFailed) fail('some suites failed'); else ok('all suites passed');
} catch (e) {
  fail(e.stack ?? e.message);
  exitCode = 1;
} finally {
  await cleanup();
}
process.exit(exitCode);
