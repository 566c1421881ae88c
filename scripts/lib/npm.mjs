import { createHash } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { run } from './proc.mjs';
import { log } from './log.mjs';

/** Runs `npm ci` when node_modules is missing or was installed from a different package-lock.json. */
export function ensureNodeModules(root) {
  const lock = path.join(root, 'package-lock.json');
  const stamp = path.join(root, 'node_modules', '.psiform-lock-sha256');
  const want = createHash('sha256').update(readFileSync(lock)).digest('hex');
  const have = existsSync(stamp) ? readFileSync(stamp, 'utf8').trim() : '';
  if (have === want) return;
  log('npm ci (package-lock.json changed or node_modules missing)');
  run('npm', ['ci', '--no-audit', '--no-fund'], { cwd: root });
  writeFileSync(stamp, `${want}\n`);
}

/** Builds every workspace in dependency order (the order of "workspaces" in package.json). */
export function buildAll(root) {
  log('building libs, apps and the client');
  run('npm', ['run', 'build'], { cwd: root });
}
