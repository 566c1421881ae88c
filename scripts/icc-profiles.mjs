// `npm run icc:rebuild [-- fogra39 gracol swop]`: rebuilds the CMYK press profiles in assets/icc/ from the measured
// characterisation data Debian ships in `icc-profiles-free` (Zlib licence), with Argyll's `colprof` as a BUILD tool.
// Argyll is AGPL: it runs here, on the developer's machine, and is never a dependency of anything Psiform ships;
// only its output (the .icc files, which are data derived from the Zlib-licensed measurements) is committed.
// One profile at a time: each takes about 2 minutes and ~0.6 GB (measured here, see stack notes).
import { copyFileSync, mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { createHash } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureDebianPackages } from './lib/system.mjs';
import { run } from './lib/proc.mjs';
import { log, ok } from './lib/log.mjs';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const OUT = path.join(ROOT, 'assets/icc');
const DATA = '/usr/share/color/icc';

/**
 * The press conditions we build. Total ink limits are the usual ones for each condition (from memory: ISO Coated v2
 * 330 %, GRACoL 2006 320 %, SWOP 2006 300 %); black generation is colprof's default ramp (-kr), stated explicitly.
 * Keep in step with PRESS_CONDITIONS in libs/contracts (ids, file names) and assets/icc/PROVENANCE.md.
 */
export const ICC_BUILDS = [
  { id: 'fogra39', ti3: 'FOGRA39L.ti3', file: 'psiform-fogra39.icc', tac: 330,
    description: 'Psiform FOGRA39 coated (ISO 12647-2 PT1/2), built from FOGRA39L data' },
  { id: 'gracol', ti3: 'TR006.ti3', file: 'psiform-gracol-tr006.icc', tac: 320,
    description: 'Psiform GRACoL coated #1 (CGATS TR 006), built from TR006 data' },
  { id: 'swop', ti3: 'TR003.ti3', file: 'psiform-swop-tr003.icc', tac: 300,
    description: 'Psiform SWOP coated #3 (CGATS TR 003), built from TR003 data' },
];

export function colprofArgs(b) {
  return ['-v', '-qm', '-kr', '-l', String(b.tac), '-nc', '-A', 'Psiform', '-D', b.description,
    '-C', `Zlib licence. Derived from ${b.ti3} (icc-profiles-free, Kai-Uwe Behrmann, Zlib) with Argyll colprof`,
    path.basename(b.ti3, '.ti3')];
}

function main() {
  const wanted = process.argv.slice(2);
  const builds = wanted.length ? ICC_BUILDS.filter((b) => wanted.includes(b.id)) : ICC_BUILDS;
  if (wanted.length && builds.length !== wanted.length) {
    throw new Error(`unknown profile id; choose from ${ICC_BUILDS.map((b) => b.id).join(', ')}`);
  }
  ensureDebianPackages(['argyll', 'icc-profiles-free']);
  for (const b of builds) {
    const dir = mkdtempSync(path.join(os.tmpdir(), 'psiform-icc-'));
    try {
      copyFileSync(path.join(DATA, b.ti3), path.join(dir, b.ti3));
      log(`colprof ${colprofArgs(b).join(' ')}   (${b.id}, about 2 min)`);
      const t0 = Date.now();
      run('colprof', colprofArgs(b), { cwd: dir, quiet: true });
      const built = path.join(dir, path.basename(b.ti3, '.ti3') + '.icc');
      // profcheck: how well the profile's A2B table reproduces the measurements (reported in PROVENANCE.md).
      const check = run('profcheck', ['-k', b.ti3, path.basename(built)], { cwd: dir, quiet: true, allowFail: true });
      const summary = `${check.stdout ?? ''}`.split('\n').filter((l) => /Profile check complete/.test(l)).join(' ');
      copyFileSync(built, path.join(OUT, b.file));
      const sha = createHash('sha256').update(readFileSync(path.join(OUT, b.file))).digest('hex');
      ok(`${b.file} in ${((Date.now() - t0) / 1000).toFixed(0)} s, sha256 ${sha}; profcheck: ${summary || 'n/a'}`);
      writeFileSync(path.join(dir, 'done'), '');
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }
  if (!existsSync(path.join(OUT, 'PROVENANCE.md'))) log('write assets/icc/PROVENANCE.md by hand (see the existing one)');
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) main();
