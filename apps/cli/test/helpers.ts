import { spawnSync } from 'node:child_process';
import * as fs from 'node:fs';
import * as os from 'node:os';
import * as path from 'node:path';
import { afterAll } from 'vitest';

export const BIN = path.resolve(__dirname, '../bin/psiform.js');

export interface RunResult {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** Runs the built CLI the way a user would: `node apps/cli/bin/psiform.js ...`. */
export function psiform(args: string[], opts: { cwd?: string } = {}): RunResult {
  if (!fs.existsSync(path.resolve(__dirname, '../dist/main.js'))) {
    throw new Error('apps/cli/dist is missing: run `npm run build -w @psiform/cli` (npm test does it)');
  }
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd: opts.cwd ?? process.cwd(), encoding: 'utf8', timeout: 120000 });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** Runs and parses --json output, failing loudly with stderr when the command did not succeed. */
export function psiformJson<T = any>(args: string[], opts: { cwd?: string } = {}): T {
  const r = psiform([...args, '--json'], opts);
  if (r.code !== 0) throw new Error(`psiform ${args.join(' ')} exited ${r.code}: ${r.stderr}`);
  return JSON.parse(r.stdout) as T;
}

const made: string[] = [];
// Registered while each test file is collected, so it runs after that file's tests.
afterAll(() => {
  for (const d of made.splice(0)) fs.rmSync(d, { recursive: true, force: true });
});

export function tempDir(): string {
  const d = fs.mkdtempSync(path.join(os.tmpdir(), 'psiform-cli-test-'));
  made.push(d);
  return d;
}

/** SciPy from Debian's python (python3-scipy), the outside reference for radial quantities. */
export const DEBIAN_PYTHON = '/usr/bin/python3';

export function scipy(script: string): any {
  const r = spawnSync(DEBIAN_PYTHON, ['-c', script], { encoding: 'utf8', timeout: 120000 });
  if (r.status !== 0) throw new Error(`python failed: ${r.stderr}`);
  return JSON.parse(r.stdout);
}

export function hasScipy(): boolean {
  const r = spawnSync(DEBIAN_PYTHON, ['-c', 'import scipy.special, scipy.integrate'], { encoding: 'utf8' });
  return r.status === 0;
}

/** Bisection on a monotone function over [lo, hi]. */
export function bisect(f: (x: number) => number, lo: number, hi: number, tol = 1e-13): number {
  let flo = f(lo);
  for (let i = 0; i < 200 && hi - lo > tol; i++) {
    const mid = 0.5 * (lo + hi);
    const fm = f(mid);
    if (fm === 0) return mid;
    if (Math.sign(fm) === Math.sign(flo)) {
      lo = mid;
      flo = fm;
    } else hi = mid;
  }
  return 0.5 * (lo + hi);
}
