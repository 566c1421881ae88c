import * as fs from 'node:fs';
import * as path from 'node:path';
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { BIN, psiform, tempDir } from './helpers';

/**
 * Every bad argument: exit code 2, exactly one line on stderr starting "psiform: ", nothing on
 * stdout, and no output file (nor any temporary file) left in the output folder.
 */
function expectRejected(args: string[], message: RegExp, env?: Record<string, string>) {
  const dir = tempDir();
  const withOut = args.map((a) => a.replace('OUT', dir));
  const r = env ? runWithEnv(withOut, dir, env) : psiform(withOut, { cwd: dir });
  expect(r.code, `exit code for: ${args.join(' ')} / stderr ${r.stderr}`).toBe(2);
  expect(r.stdout).toBe('');
  const lines = r.stderr.split('\n').filter((l) => l.length > 0);
  expect(lines, r.stderr).toHaveLength(1);
  expect(lines[0]).toMatch(/^psiform: /);
  expect(lines[0]).toMatch(message);
  expect(fs.readdirSync(dir)).toEqual([]);
}

function runWithEnv(args: string[], cwd: string, env: Record<string, string>) {
  const r = spawnSync(process.execPath, [BIN, ...args], { cwd, encoding: 'utf8', env: { ...process.env, ...env } });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('bad arguments exit 2 with one stderr line and write nothing', () => {
  const cases: Array<[string, string[], RegExp]> = [
    ['l >= n', ['mesh', '--nlm', '2,2,0', '--out', 'OUT/a.glb'], /^psiform: l must be less than n \(got n=2, l=2\)$/],
    ['|m| > l', ['mesh', '--nlm', '3,1,2', '--out', 'OUT/a.stl'], /\|m\| must not exceed l \(got l=1, m=2\)/],
    ['n = 13', ['mesh', '--nlm', '13,0,0', '--out', 'OUT/a.glb'], /n must be between 1 and 12 \(got n=13\)/],
    ['n = 0', ['sample', '--nlm', '0,0,0', '--out', 'OUT/a.nrrd'], /n must be between 1 and 12/],
    ['malformed --nlm', ['mesh', '--nlm', '2,1', '--out', 'OUT/a.glb'], /--nlm must be three integers/],
    ['unknown label', ['mesh', '--orbital', '2pq', '--out', 'OUT/a.glb'], /orbital label "2pq" is not recognised/],
    ['label with l >= n', ['mesh', '--orbital', '2dxy', '--out', 'OUT/a.glb'], /2dxy/],
    ['grid over RECIPE_LIMITS.gridMax', ['mesh', '--orbital', '1s', '--grid', '999', '--out', 'OUT/a.glb'], /--grid must be at most 384 \(got 999\)/],
    ['grid under gridMin', ['mesh', '--orbital', '1s', '--grid', '4', '--out', 'OUT/a.glb'], /--grid must be at least 16/],
    ['non-integer grid', ['mesh', '--orbital', '1s', '--grid', '64.5'], /--grid must be an integer/],
    ['fraction 1', ['mesh', '--orbital', '1s', '--enclose', '1', '--out', 'OUT/a.glb'], /--enclose must be a fraction between 0 and 1/],
    ['fraction 0', ['mesh', '--orbital', '1s', '--enclose', '0', '--out', 'OUT/a.glb'], /--enclose must be a fraction between 0 and 1/],
    ['fraction 1.5', ['recipe', '--orbital', '1s', '--enclose', '1.5'], /--enclose must be a fraction/],
    ['fraction NaN', ['mesh', '--orbital', '1s', '--enclose', 'NaN', '--out', 'OUT/a.glb'], /--enclose must be a finite number/],
    ['fraction Infinity', ['mesh', '--orbital', '1s', '--enclose', 'Infinity'], /--enclose must be a finite number/],
    ['negative iso value', ['mesh', '--orbital', '1s', '--iso=-0.1', '--out', 'OUT/a.glb'], /--iso must be a positive/],
    ['both --enclose and --iso', ['mesh', '--orbital', '1s', '--enclose', '0.5', '--iso', '0.1'], /either --enclose or --iso/],
    ['Z = 0', ['mesh', '--orbital', '1s', '--Z', '0', '--out', 'OUT/a.glb'], /--Z must be at least 1/],
    ['Z = 1.5', ['radial', '--n', '1', '--l', '0', '--Z', '1.5'], /--Z must be an integer/],
    ['unknown option', ['mesh', '--orbital', '1s', '--colour', 'red', '--out', 'OUT/a.glb'], /unknown option '--colour'/],
    ['unknown top-level option', ['--frobnicate'], /unknown option '--frobnicate'/],
    ['unknown command', ['render', '--orbital', '1s'], /unknown command 'render'/],
    ['stray positional', ['mesh', '--orbital', '1s', 'extra'], /unexpected argument 'extra'/],
    ['option value missing', ['mesh', '--orbital'], /option --orbital needs a value/],
    ['no state given', ['mesh', '--grid', '32', '--out', 'OUT/a.glb'], /one of --orbital LABEL, --nlm n,l,m or --recipe FILE/],
    ['two states given', ['mesh', '--orbital', '1s', '--nlm', '1,0,0'], /only one of/],
    ['--complex without --nlm', ['mesh', '--orbital', '2pz', '--complex'], /--complex goes with --nlm/],
    ['unknown mesh extension', ['mesh', '--orbital', '1s', '--out', 'OUT/a.fbx'], /--out must end in .glb, .stl, .ply, .obj/],
    ['missing output folder', ['mesh', '--orbital', '1s', '--out', 'OUT/no/such/a.glb'], /folder .* does not exist/],
    ['sample without --out', ['sample', '--orbital', '1s'], /sample needs --out FILE.nrrd/],
    ['sample to a mesh extension', ['sample', '--orbital', '1s', '--out', 'OUT/a.glb'], /--out must end in .nrrd/],
    ['extent out of range', ['mesh', '--orbital', '1s', '--extent=-3'], /--extent must be in \(0, 2000\] a0/],
    ['negative value without =', ['mesh', '--orbital', '1s', '--iso', '-0.1'], /option --iso needs a value; write a value that starts with '-' as --iso=-VALUE/],
    ['radial l >= n', ['radial', '--n', '2', '--l', '2', '--json'], /^psiform: l must be less than n \(got n=2, l=2\)$/],
    ['radial without --l', ['radial', '--n', '2', '--json'], /radial needs --l L/],
    ['radial n = 13', ['radial', '--n', '13', '--l', '0', '--json'], /n must be between 1 and 12/],
    ['radial negative --outside', ['radial', '--n', '1', '--l', '0', '--outside=-1', '--json'], /--outside must be a radius >= 0/],
    ['recipe |m| > l', ['recipe', '--nlm', '2,1,-2'], /\|m\| must not exceed l/],
  ];
  for (const [name, args, msg] of cases) {
    it(name, () => expectRejected(args, msg));
  }

  it('a grid too large for the memory budget (budget lowered with PSIFORM_MEMORY_BUDGET_MB)', () => {
    // 256³ float32 = 67.1 MB (common practice: 4 bytes per voxel); a 50 MB budget cannot hold it.
    expectRejected(['mesh', '--orbital', '2pz', '--grid', '256', '--out', 'OUT/a.glb'], /grid 256³ needs 67\.1 MB, more than the 50\.0 MB budget/, { PSIFORM_MEMORY_BUDGET_MB: '50' });
    // A complex state needs two arrays: 192³ × 8 B = 56.6 MB.
    expectRejected(['sample', '--nlm', '3,1,1', '--complex', '--grid', '192', '--out', 'OUT/a.nrrd'], /grid 192³ \(complex\) needs 56\.6 MB/, { PSIFORM_MEMORY_BUDGET_MB: '50' });
  });

  describe('recipe files', () => {
    it('missing file', () => expectRejected(['mesh', '--recipe', 'OUT/none.json', '--out', 'OUT/a.glb'], /cannot read recipe '.*none\.json': no such file/));

    it('not JSON', () => {
      const dir = tempDir();
      const f = path.join(dir, 'bad.json');
      fs.writeFileSync(f, '{"version": 1, content');
      expectRejected(['mesh', '--recipe', f, '--out', 'OUT/a.glb'], /recipe '.*bad\.json' is not valid JSON/);
    });

    it('invalid content names the field path', () => {
      const dir = tempDir();
      const f = path.join(dir, 'r.json');
      fs.writeFileSync(f, JSON.stringify({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 2, m: 0, basis: 'real', re: 1 }] }, grid: { n: 32 }, surface: { rule: 'enclosed', fraction: 0.9 } }));
      expectRejected(['mesh', '--recipe', f, '--out', 'OUT/a.glb'], /recipe '.*r\.json': content\.terms\.0\.l: l must be less than n \(got n=2, l=2\)/);
    });

    it('missing version and a fraction of 1', () => {
      const dir = tempDir();
      const f = path.join(dir, 'r.json');
      fs.writeFileSync(f, JSON.stringify({ content: { Z: 1, terms: [{ n: 1, l: 0, m: 0, basis: 'real', re: 1 }] }, grid: { n: 32 }, surface: { rule: 'enclosed', fraction: 1 } }));
      expectRejected(['sample', '--recipe', f, '--out', 'OUT/a.nrrd'], /version: version must be 1; surface\.fraction: fraction must be a number between 0 and 1/);
    });

    it('a grid of 999 in the file', () => {
      const dir = tempDir();
      const f = path.join(dir, 'r.json');
      fs.writeFileSync(f, JSON.stringify({ version: 1, content: { Z: 1, terms: [{ n: 1, l: 0, m: 0, basis: 'real', re: 1 }] }, grid: { n: 999 }, surface: { rule: 'enclosed', fraction: 0.5 } }));
      expectRejected(['mesh', '--recipe', f], /grid\.n: grid\.n must be 'auto' or a whole number from 16 to 384 \(got 999\)/);
    });
  });
});

describe('help', () => {
  it('psiform --help lists the commands and exits 0', () => {
    const r = psiform(['--help']);
    expect(r.code).toBe(0);
    for (const c of ['mesh', 'radial', 'sample', 'recipe']) expect(r.stdout).toMatch(new RegExp(`^\\s+${c}\\s`, 'm'));
    expect(r.stderr).toBe('');
  });

  it('psiform <cmd> --help shows that command\'s options', () => {
    const expectations: Record<string, string[]> = {
      mesh: ['--orbital', '--nlm', '--recipe', '--enclose', '--iso', '--out', '--grid', '--json'],
      radial: ['--n', '--l', '--outside'],
      sample: ['--out FILE.nrrd'],
      recipe: ['--orbital', '--enclose'],
    };
    for (const [cmd, opts] of Object.entries(expectations)) {
      const r = psiform([cmd, '--help']);
      expect(r.code).toBe(0);
      expect(r.stdout).toMatch(new RegExp(`^Usage: psiform ${cmd}`));
      for (const o of opts) expect(r.stdout).toContain(o);
    }
  });
});
