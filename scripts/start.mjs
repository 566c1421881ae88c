// `npm start`: set up everything on this machine and serve Psiform on http://127.0.0.1:3000 (PORT overrides).
import path from 'node:path';
import { ensureDebianPackages } from './lib/system.mjs';
import { buildAll, ensureNodeModules } from './lib/npm.mjs';
import { ROOT, layout, startServices } from './lib/services.mjs';
import { DEMO_ACCOUNTS, DEMO_PASSWORD, migrateAndSeed, startApps } from './lib/apps.mjs';
import { fail, log, ok } from './lib/log.mjs';

let stopping = false;
const cleanups = [];
async function shutdown(code) {
  if (stopping) return;
  stopping = true;
  log('stopping…');
  for (const c of cleanups.reverse()) {
    try { await c(); } catch (e) { fail(e.message); }
  }
  log('stopped');
  process.exit(code);
}
process.on('SIGINT', () => shutdown(0));
process.on('SIGTERM', () => shutdown(0));

try {
  ensureDebianPackages();
  ensureNodeModules(ROOT);
  if (!process.env.PSIFORM_SKIP_BUILD) buildAll(ROOT);
  const lay = layout('start', path.join(ROOT, '.data'));
  const svc = await startServices(lay, { external: true });
  cleanups.push(svc.stopAll);
  if (stopping) process.exit(0);
  migrateAndSeed(svc.env);
  // Supervised: a crashed API, worker or fake is logged and restarted with back-off while the rest serves.
  const apps = await startApps(svc.env, { port: lay.ports.app, logDir: svc.logDir, echo: true, workers: 1, supervised: true });
  cleanups.push(apps.stopApps);
  ok(`Psiform is up: ${apps.url}`);
  log(`health: ${JSON.stringify(apps.health)}`);
  log(`demo accounts (password "${DEMO_PASSWORD}", demo only):`);
  for (const [email, role] of DEMO_ACCOUNTS) log(`  ${email.padEnd(32)} ${role}`);
  log(`logs in ${svc.logDir}; Ctrl-C stops everything`);
} catch (e) {
  fail(e.message);
  await shutdown(1);
}
