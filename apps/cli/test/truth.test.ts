import * as fs from 'node:fs';
import * as path from 'node:path';
import { describe, expect, it } from 'vitest';
import { bisect, psiform, psiformJson, scipy, tempDir } from './helpers';

// What the CLI claims about a figure, checked against sources outside the engine (named beside each check).

describe('the enclosed fraction holds over all space; a box that cuts the surface is said, not hidden', () => {
  it('2p_z with --extent 3: 90 % over all space (SciPy), the part inside the box (SciPy), warning on stderr and in JSON, open surfaces', () => {
    const r = psiform(['mesh', '--orbital', '2pz', '--extent', '3', '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(r.stderr).toMatch(/^psiform: warning: the box \(±3 a0\) cuts the surface/m);
    expect(j.warnings.map((w: { code: string }) => w.code)).toContain('box-cuts-surface');
    const w = j.warnings.find((x: { code: string }) => x.code === 'box-cuts-surface');
    expect(w.suggestedExtent).toBeGreaterThan(9);
    expect(j.enclosedOver).toBe('all space');
    expect(Math.abs(j.enclosed - 0.9)).toBeLessThanOrEqual(j.enclosedError);
    for (const s of j.surfaces) {
      expect(s.watertight).toBe(false); // open where the box cuts it, never capped
      expect(s.boundaryEdges).toBeGreaterThan(0);
    }
    // Independent quadrature (SciPy): psi_210 = R_21(r) sqrt(3/4pi) cos θ with R_21 = r e^{-r/2}/sqrt(24)
    // (Griffiths 2nd ed., Table 4.7), so ∫_0^R R_21² r² dr = P(5, R), the regularised lower incomplete gamma
    // function (scipy.special.gammainc). For |psi|² > t along a ray, R_21² > t/A with A = (3/4pi) cos²θ: the
    // interval [a, b] around the maximum of R_21 at r = 2 (brentq). Over all space, then inside the cube ±3.
    const ref = scipy(`
import json, math
from scipy import integrate, optimize, special
t = ${j.density}
R2 = lambda r: r*r*math.exp(-r)/24.0
def ends(s):
    if s >= R2(2.0): return None
    f = lambda r: R2(r) - s
    a = optimize.brentq(f, 0.0, 2.0, xtol=1e-15)
    b = optimize.brentq(f, 2.0, 200.0, xtol=1e-15)
    return a, b
P = lambda r: special.gammainc(5, r)
def ray(mu, rb):
    A = 3.0/(4*math.pi)*mu*mu
    if A <= 0: return 0.0
    e = ends(t/A)
    if e is None: return 0.0
    a, b = e
    hi = min(b, rb)
    return A*(P(hi) - P(a)) if hi > a else 0.0
allspace = 2*math.pi*integrate.quad(lambda mu: ray(mu, 1e9), -1, 1, limit=400, epsabs=1e-12)[0]
def rbox(mu, ph):
    s = math.sqrt(max(0.0, 1-mu*mu))
    m = max(abs(s*math.cos(ph)), abs(s*math.sin(ph)), abs(mu))
    return 3.0/m
# The cube and |psi_210|² share the symmetries mu -> -mu, phi -> -phi, phi -> pi/2 - phi: one sixteenth suffices.
inbox = 16*integrate.dblquad(lambda ph, mu: ray(mu, rbox(mu, ph)), 0, 1, 0, math.pi/4, epsabs=1e-8)[0]
print(json.dumps({"allspace": allspace, "inbox": inbox}))
`);
    expect(Math.abs(ref.allspace - 0.9)).toBeLessThan(Math.max(j.enclosedError, 1e-7));
    expect(Math.abs(j.enclosedInBox - ref.inbox)).toBeLessThan(2e-4);
    expect(j.enclosedInBox).toBeLessThan(0.5);
  });

  it('the readable summary says it too: both fractions and the warning', () => {
    const r = psiform(['mesh', '--orbital', '2pz', '--extent', '3']);
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/over all space/);
    expect(r.stdout).toMatch(/the box cuts the surface: the part drawn encloses \d+\.\d\d%/);
    expect(r.stdout).toMatch(/^WARNING: the box/m);
  });

  it('with the automatic box nothing is cut: no warnings, closed surfaces, stderr empty', () => {
    const r = psiform(['mesh', '--orbital', '3dz2', '--json']);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const j = JSON.parse(r.stdout);
    expect(j.warnings).toEqual([]);
    expect(j.enclosedInBox).toBe(j.enclosed);
    expect(j.surfaces.every((s: { watertight: boolean }) => s.watertight)).toBe(true);
    expect(j.grid.mode).toBe('auto');
  });
});

describe('one normalisation rule', () => {
  const pxpy = (c: number) => ({
    version: 1,
    content: { Z: 1, terms: [{ n: 2, l: 1, m: 1, basis: 'real', re: c }, { n: 2, l: 1, m: -1, basis: 'real', re: c }] },
    grid: { n: 48, extent: 24 },
    surface: { rule: 'enclosed', fraction: 0.9 },
  });
  it('coefficients (1, 1) give exactly the surface of (1/√2, 1/√2); the NRRD density integrates to 1 (trapezoid on 96³)', () => {
    const dir = tempDir();
    const a = path.join(dir, 'a.json');
    const b = path.join(dir, 'b.json');
    fs.writeFileSync(a, JSON.stringify(pxpy(1)));
    fs.writeFileSync(b, JSON.stringify(pxpy(Math.SQRT1_2)));
    const ja = psiformJson(['mesh', '--recipe', a]);
    const jb = psiformJson(['mesh', '--recipe', b]);
    expect(Math.abs(ja.isovalue / jb.isovalue - 1)).toBeLessThan(1e-12);
    expect(ja.surfaces.map((s: { vertices: number }) => s.vertices)).toEqual(jb.surfaces.map((s: { vertices: number }) => s.vertices));
    const out = path.join(dir, 'd.nrrd');
    const r = psiform(['sample', '--recipe', a, '--grid', '96', '--extent', '24', '--out', out, '--json']);
    expect(r.code).toBe(0);
    const buf = fs.readFileSync(out);
    const raw = buf.subarray(buf.indexOf('\n\n') + 2);
    const dv = new DataView(raw.buffer, raw.byteOffset, raw.byteLength);
    const h = 48 / 95;
    let sum = 0;
    for (let i = 0; i < raw.length / 4; i++) sum += dv.getFloat32(4 * i, true);
    // P(r > 24) for 2p is below 1e-6 (probabilityOutside), so the box sum should be 1 to the quadrature's accuracy.
    expect(Math.abs(sum * h ** 3 - 1)).toBeLessThan(2e-3);
  });
});

describe('labels, headings, units and conventions', () => {
  it('every cubic f form prints its own name (not a sum of two terms)', () => {
    const names: Record<string, string> = { 'fx(y2-z2)': '4f_x(y²−z²)', 'fy(z2-x2)': '4f_y(z²−x²)', fx3: '4f_x³', fy3: '4f_y³' };
    for (const [arg, want] of Object.entries(names)) {
      const doc = JSON.parse(psiform(['recipe', '--orbital', `4${arg}`]).stdout);
      expect(doc.label).toBe(want);
    }
  });

  it("radial headings read R_{n,l} (R_{10,5}, not R_105); every JSON output carries units", () => {
    const r = psiform(['radial', '--n', '10', '--l', '5']);
    expect(r.stdout.split('\n')[0]).toMatch(/^R_\{10,5\} for Z=1/);
    const rj = psiformJson(['radial', '--n', '10', '--l', '5']);
    expect(rj.units.length).toMatch(/a0/);
    const mj = psiformJson(['mesh', '--orbital', '1s', '--grid', '24']);
    expect(mj.units).toMatchObject({ length: expect.stringMatching(/a0/), isovalue: expect.stringMatching(/a0\^-3\/2/), area: 'a0^2', volume: 'a0^3' });
    const out = path.join(tempDir(), 's.nrrd');
    const sj = psiformJson(['sample', '--orbital', '1s', '--grid', '16', '--out', out]);
    expect(sj.units.data).toMatch(/a0\^-3/);
  });

  it('help and JSON state the sign conventions (Condon–Shortley, (-1)^m of real forms, hybrid signs, normalisation)', () => {
    for (const args of [['--help'], ['mesh', '--help'], ['recipe', '--help']]) {
      const t = psiform(args).stdout;
      // One text for help and outputs (@psiform/contracts ENGINE_CONVENTION_LINES): the help is the JSON's sentences.
      expect(t).toMatch(/Condon–Shortley/);
      expect(t).toMatch(/\(-1\)\^m Y_lm/);
      expect(t).toMatch(/Hybrids:? .*\(-1\)\^\(n-l-1\)/s);
      expect(t).toMatch(/sum \|c\|\^2 = 1/);
    }
    const conventions = psiformJson(['mesh', '--orbital', '1s', '--grid', '16']).conventions as string;
    expect(conventions).toMatch(/Condon–Shortley/);
    const help = psiform(['--help']).stdout.replace(/\s+/g, ' ');
    for (const sentence of conventions.split(/(?<=\.) (?=[A-Z])/)) expect(help).toContain(sentence);
  });
});

describe('the automatic box scales with Z (no rounding) and keeps heavy ions resolved', () => {
  it('1s at Z = 1, 2, 26: extent × Z is the same to 1e-9; at Z = 26 the 50 % ball has the closed-form volume within 1 %', () => {
    const ext = [1, 2, 26].map((Z) => psiformJson(['mesh', '--orbital', '1s', '--Z', String(Z), '--enclose', '0.5']));
    for (const j of ext) expect(Math.abs((j.grid.extent * j.Z) / (ext[0].grid.extent * 1) - 1)).toBeLessThan(1e-9);
    // P(r < R) for 1s = 1 - e^{-2ZR}(1 + 2ZR + 2Z²R²) (Griffiths 2nd ed., Problem 4.13 integral; from memory)
    const rho = bisect((x) => 1 - Math.exp(-2 * x) * (1 + 2 * x + 2 * x * x) - 0.5, 0, 10);
    const R = rho / 26;
    const v = ext[2].surfaces[0].volume;
    expect(Math.abs(v / ((4 / 3) * Math.PI * R ** 3) - 1)).toBeLessThan(0.01);
  });
});
