import path from 'node:path';
import { ROOT, startChild } from './services.mjs';
import { run, waitForPort } from './proc.mjs';
import { log } from './log.mjs';
import { logSupervision, supervise } from './supervise.mjs';

export const DEMO_ACCOUNTS = [
  ['illustrator@demo.psiform.test', 'illustrator'],
  ['editor@demo.psiform.test', 'editor'],
  ['artdirector@demo.psiform.test', 'art director'],
  ['admin@demo.psiform.test', 'admin'],
];
export const DEMO_PASSWORD = 'psiform-demo';

export function migrateAndSeed(env) {
  log('migrations');
  run(process.execPath, [path.join(ROOT, 'apps/api/dist/db/migrate.js')], { env: { ...process.env, ...env } });
  log('demo scenario');
  run(process.execPath, [path.join(ROOT, 'apps/api/dist/seed/run.js')], { env: { ...process.env, ...env } });
}

/**
 * Starts the API (serving the built client) and `workers` worker processes; resolves once /api/health answers.
 * With `supervised`, a child that exits by itself is restarted with back-off (scripts/lib/supervise.mjs).
 */
export async function startApps(env, { port, logDir, echo = false, workers = 1, supervised = false }) {
  const appEnv = { ...env, PORT: String(port), HOST: '127.0.0.1', WEB_DIST: path.join(ROOT, 'apps/web/dist') };
  const procs = [];
  const child = (name, script) => {
    const start = () => startChild(name, script, [], { env: appEnv, logDir, echo });
    return supervised ? supervise(name, start, { onEvent: logSupervision }) : start();
  };
  const api = child('api', path.join(ROOT, 'apps/api/dist/main.js'));
  procs.push(api);
  for (let i = 0; i < workers; i++) {
    procs.push(child(workers === 1 ? 'worker' : `worker-${i + 1}`, path.join(ROOT, 'apps/worker/dist/main.js')));
  }
  const stopApps = async () => { for (const p of [...procs].reverse()) await p.stop(); };
  try {
    await Promise.race([
      waitForPort(port, { what: 'the API', timeoutMs: 60000 }),
      (api.exitPromise ?? api.firstExit).then(() => { throw new Error(`the API exited during start-up; see ${api.logFile}`); }),
    ]);
    const health = await fetch(`http://127.0.0.1:${port}/api/health`).then((r) => r.json());
    return { procs, stopApps, health, url: `http://127.0.0.1:${port}` };
  } catch (e) {
    await stopApps();
    throw e;
  }
}
