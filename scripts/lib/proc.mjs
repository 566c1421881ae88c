import { spawn, spawnSync } from 'node:child_process';
import net from 'node:net';
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

/** Runs a command and resolves with its exit code and captured output (also echoed live). */
export function runCapture(cmd, args, opts = {}) {
  return new Promise((resolve) => {
    const child = spawn(cmd, args, { stdio: ['ignore', 'pipe', 'pipe'], ...opts });
    let out = '';
    child.stdout.on('data', (d) => { out += d; process.stdout.write(d); });
    child.stderr.on('data', (d) => { out += d; process.stderr.write(d); });
    child.on('close', (code, signal) => resolve({ code: code ?? (signal ? 1 : 0), out }));
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
