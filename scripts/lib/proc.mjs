import { spawn, spawnSync } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';

/** Runs a command to completion, inheriting stdio unless told otherwise; throws on a non-zero exit. */
export function run(cmd, args, opts = {}) {
  const res = spawnSync(cmd, args, { stdio: opts.quiet ? 'pipe' : 'inherit', encoding: 'utf8', ...opts });
  if (res.error) throw res.error;
  if (res.status !== 0 && !opts.allowFail) {
    const out = opts.quiet ? `\n${res.stdout ?? ''}${res.stderr ?? ''}` : '';
    throw new Error(`${cmd} ${args.join(' ')} exited with ${res.status}${out}`);
  }
  return res;
}

/**
 * Runs a command and resolves with its exit code and captured output (also echoed live). With `timeoutMs`, the
 * command and everything it started (its own process group) is stopped when time runs out, and the result says so:
 * a hung runner (a test waiting forever, a runner kept alive by an open handle) fails its suite instead of the
 * whole run.
 */
const grouped = new Set();
/** Stops every runner started with a time limit (they have their own process groups, so Ctrl-C does not reach them). */
export function stopRunners() {
  for (const pid of grouped) { try { process.kill(-pid, 'SIGTERM'); } catch { /* already gone */ } }
  grouped.clear();
}

export function runCapture(cmd, args, opts = {}) {
  const { timeoutMs, ...spawnOpts } = opts;
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { stdio: ['ignore', 'pipe', 'pipe'], detached: Boolean(timeoutMs), ...spawnOpts });
    if (timeoutMs) grouped.add(child.pid);
    let out = '';
    let timedOut = false;
    child.stdout.on('data', (d) => { out += d; process.stdout.write(d); });
    child.stderr.on('data', (d) => { out += d; process.stderr.write(d); });
    const timer = timeoutMs ? setTimeout(() => {
      timedOut = true;
      const line = `\n[psiform] ${path.basename(cmd)} stopped after ${Math.round(timeoutMs / 1000)} s (its time limit)\n`;
      out += line;
      process.stderr.write(line);
      try { process.kill(-child.pid, 'SIGTERM'); } catch { /* already gone */ }
      setTimeout(() => { try { process.kill(-child.pid, 'SIGKILL'); } catch { /* already gone */ } }, 10000).unref();
    }, timeoutMs) : null;
    child.on('close', (code, signal) => {
      if (timer) clearTimeout(timer);
      grouped.delete(child.pid);
      resolve({ code: timedOut ? 124 : code ?? (signal ? 1 : 0), out, timedOut });
    });
  });
}

export function commandExists(cmd) {
  return spawnSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' }).status === 0;
}

/** True when something accepts TCP connections on host:port. */
export function portOpen(port, host = '127.0.0.1') {
  return new Promise((resolve) => {
    const s = net.connect({ port, host });
    s.once('connect', () => { s.destroy(); resolve(true); });
    s.once('error', () => resolve(false));
    s.setTimeout(500, () => { s.destroy(); resolve(false); });
  });
}

export async function waitForPort(port, { host = '127.0.0.1', timeoutMs = 30000, what = `port ${port}` } = {}) {
  const end = Date.now() + timeoutMs;
  while (Date.now() < end) {
    if (await portOpen(port, host)) return;
    await sleep(100);
  }
  throw new Error(`timed out waiting for ${what} on ${host}:${port}`);
}

export async function waitForExit(pid, timeoutMs = 10000) {
  const end = Date.now() + timeoutMs;
  while (Date.now() < end) {
    try { process.kill(pid, 0); } catch { return true; }
    await sleep(100);
  }
  return false;
}
