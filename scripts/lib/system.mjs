import { spawnSync } from 'node:child_process';
import { existsSync, readdirSync } from 'node:fs';
import { commandExists, run } from './proc.mjs';
import { log } from './log.mjs';

/** Debian packages Psiform needs on its machine, with a probe telling whether each is present. */
const PACKAGES = [
  { name: 'postgresql', present: () => postgresBinDir() !== null },
  { name: 'redis-server', present: () => commandExists('redis-server') },
  { name: 'chromium', present: () => existsSync('/usr/bin/chromium') },
  // SciPy on Debian's own python: the independent reference the engine's tests compare with.
  { name: 'python3-scipy', present: () => pythonHas('scipy'), purpose: 'test' },
  // Readers no one here wrote, which the tests use to read our print files back (`npm test` installs them).
  { name: 'libtiff-tools', present: () => commandExists('tiffinfo'), purpose: 'test' },
  { name: 'poppler-utils', present: () => commandExists('pdffonts') && commandExists('pdfinfo'), purpose: 'test' },
  { name: 'qpdf', present: () => commandExists('qpdf'), purpose: 'test' },
  { name: 'liblcms2-utils', present: () => commandExists('transicc'), purpose: 'test' },
  // Build tools for `npm run icc:rebuild` only (argyll is AGPL: used to build assets/icc, never shipped).
  { name: 'argyll', present: () => commandExists('colprof'), purpose: 'build' },
  { name: 'icc-profiles-free', present: () => existsSync('/usr/share/color/icc/FOGRA39L.ti3'), purpose: 'build' },
  // scikit-image: the bench's peer for marching cubes (`npm run bench` installs it).
  { name: 'python3-skimage', present: () => pythonHas('skimage'), purpose: 'bench' },
];

/** Names of the packages `npm start` needs (`run`) and those `npm test` needs on top (`test`). */
export const RUN_PACKAGES = PACKAGES.filter((p) => !p.purpose).map((p) => p.name);
export const TEST_PACKAGES = [...RUN_PACKAGES, ...PACKAGES.filter((p) => p.purpose === 'test').map((p) => p.name)];

/** Whether Debian's /usr/bin/python3 can import a module (the pyenv python first on PATH may lack it). */
function pythonHas(module) {
  if (!existsSync('/usr/bin/python3')) return false;
  return spawnSync('/usr/bin/python3', ['-c', `import ${module}`], { stdio: 'ignore' }).status === 0;
}

/** Newest installed PostgreSQL bin folder (no hard-coded major version). */
export function postgresBinDir() {
  const root = '/usr/lib/postgresql';
  if (!existsSync(root)) return null;
  const versions = readdirSync(root)
    .filter((v) => existsSync(`${root}/${v}/bin/initdb`))
    .sort((a, b) => Number(a) - Number(b));
  return versions.length ? `${root}/${versions.at(-1)}/bin` : null;
}

/** Installs the missing Debian packages (apt-get update first). `needed` limits which are checked. */
export function ensureDebianPackages(needed = RUN_PACKAGES) {
  const missing = PACKAGES.filter((p) => needed.includes(p.name) && !p.present()).map((p) => p.name);
  if (missing.length === 0) return;
  if (process.getuid && process.getuid() !== 0) {
    throw new Error(`missing Debian packages: ${missing.join(', ')}; install them as root (apt-get install ${missing.join(' ')})`);
  }
  log(`installing Debian packages: ${missing.join(', ')}`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  run('apt-get', ['update', '-qq'], { env });
  run('apt-get', ['install', '-y', '-qq', '--no-install-recommends', ...missing], { env });
}
