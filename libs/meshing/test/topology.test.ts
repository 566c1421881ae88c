import { spawnSync } from 'node:child_process';
import * as path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyseSurface, compileState, levelSolver, parseOrbitalLabel, stateFromNlm, type OrbitalState } from '@psiform/orbitals';
import { recipeToSurfaces } from '../src/pipeline';

// At the defaults (grid 'auto', box 'auto', 90 % over all space) every surface must have the parts and Euler
// characteristics of the true surface. The truth comes from SciPy (topology_reference.py beside this file:
// roots of L_k^a and P_l^m, one maximum of |R| per radial lobe and of |P_l^m| per band; it shares no code with
// the engine) and is checked against both the engine's own analysis (analyseSurface) and the meshes.

type Count = Partial<Record<'+' | '-' | 'complex', [number, number]>>;

interface Case {
  name: string;
  state: OrbitalState;
  /** The real form whose topology this one has (cubic f forms are rotations of general-set ones). */
  like?: string;
  fraction?: number;
}

function reference(cases: { kind: 'real' | 'complex'; n: number; l: number; m: number; Z: number; t: number }[]): Count[] {
  const r = spawnSync('/usr/bin/python3', [path.join(__dirname, 'topology_reference.py')], { input: JSON.stringify(cases), encoding: 'utf8', timeout: 300000 });
  if (r.status !== 0) throw new Error(`topology_reference.py failed (Debian python3-scipy is needed): ${r.stderr}`);
  return JSON.parse(r.stdout) as Count[];
}

const nonEmpty = (c: Count) => Object.fromEntries(Object.entries(c).filter(([, v]) => v![0] > 0));

function check(cases: Case[]) {
  const refs = reference(
    cases.map((c) => {
      const src = c.like ? parseOrbitalLabel(c.like).state : c.state;
      const t = levelSolver(compileState(c.state)).solve(c.fraction ?? 0.9).density;
      const term = src.terms[0];
      return { kind: term.basis, n: term.n, l: term.l, m: term.m, Z: src.Z, t };
    }),
  );
  return cases.map((c, i) => ({ c, want: nonEmpty(refs[i]) }));
}


async function meshTopology(c: Case): Promise<{ found: Count; analysis: Count; warnings: string[] }> {
  const r = await recipeToSurfaces({ content: c.state, grid: { n: 'auto', extent: 'auto' }, surface: { rule: 'enclosed', fraction: c.fraction ?? 0.9 } });
  const found: Count = {};
  for (const s of r.surfaces) if (s.stats && s.stats.components > 0) found[s.phase] = [s.stats.components, s.stats.euler];
  const a = analyseSurface(compileState(c.state), r.density);
  const analysis: Count = {};
  if (a) for (const [p, v] of Object.entries(a.topology)) if (v && v.components > 0) analysis[p as '+'] = [v.components, v.euler];
  return { found, analysis, warnings: r.warnings.map((w) => w.code) };
}

const real = (label: string, like?: string): Case => ({ name: label, state: parseOrbitalLabel(label).state, like });
const complex = (n: number, l: number, m: number, fraction?: number): Case => ({ name: `${n},${l},${m} complex`, state: stateFromNlm(n, l, m, { complex: true }), fraction });

describe('true topology at the defaults (SciPy reference, independent of the mesher)', () => {
  const sShells = Array.from({ length: 12 }, (_, i) => real(`${i + 1}s`));
  it('ns for n = 1..12: every radial shell is drawn (1 + 2 (n - 1) surfaces when all lobes rise above the level)', async () => {
    for (const { c, want } of check(sShells)) {
      const got = await meshTopology(c);
      expect(got.analysis, c.name).toEqual(want);
      expect(got.found, c.name).toEqual(want);
      expect(got.warnings, c.name).toEqual([]);
    }
  }, 600000);

  it('complex m = ±1, ±2, ±3 are rings (Euler 0 each), one per band of |P_l^m| and radial lobe', async () => {
    // 6p and 7p (m = ±1): n − l − 1 = 4 and 5 radial nodes, so 5 and 6 radial lobes, and P_1^1 = −sin θ has no
    // zero inside (0, π), so one band per lobe: 5 and 6 rings (SciPy agrees below). Their innermost ring's hole is
    // 0.055 and 0.045 a0 across, far below any affordable grid step: the odd, centred grid holds it open by the z
    // axis, where psi = 0 exactly (pipeline.ts ringHoleHeld); a 224-point even grid closed it (Euler 2).
    const rings = [
      complex(2, 1, 1),
      complex(2, 1, -1),
      complex(3, 2, 1),
      complex(3, 2, -2),
      complex(4, 3, 2),
      complex(4, 2, -1),
      complex(5, 1, 1),
      complex(3, 1, -1, 0.6),
      complex(6, 1, 1),
      complex(7, 1, -1),
      complex(4, 3, 3),
      complex(6, 3, -3),
    ];
    for (const { c, want } of check(rings)) {
      const got = await meshTopology(c);
      expect(want.complex![1], c.name).toBe(0);
      if (c.state.terms[0].l === 1) expect(want.complex![0], c.name).toBe(c.state.terms[0].n - 1);
      expect(got.analysis, c.name).toEqual(want);
      expect(got.found, c.name).toEqual(want);
      expect(got.warnings, c.name).toEqual([]);
    }
  }, 600000);

  const named = (n: number): Case[] => {
    const out: Case[] = [];
    const forms: [number, string][] = [[0, 's'], [1, 'px'], [1, 'py'], [1, 'pz'], [2, 'dxy'], [2, 'dyz'], [2, 'dz2'], [2, 'dxz'], [2, 'dx2-y2'], [3, 'fz3'], [3, 'fxz2'], [3, 'fyz2'], [3, 'fxyz'], [3, 'fz(x2-y2)'], [3, 'fx(x2-3y2)'], [3, 'fy(3x2-y2)']];
    for (const [l, f] of forms) if (l < n) out.push(real(`${n}${f}`));
    if (n >= 4) {
      // The cubic set: f_x³, f_y³ are f_z³ turned to x, y; f_x(y²−z²), f_y(z²−x²) are f_z(x²−y²) turned likewise.
      out.push(real(`${n}fx3`, `${n}fz3`), real(`${n}fy3`, `${n}fz3`), real(`${n}fx(y2-z2)`, `${n}fz(x2-y2)`), real(`${n}fy(z2-x2)`, `${n}fz(x2-y2)`));
    }
    return out;
  };

  // Unit tests keep one shell of named forms (n = 3: s, p, d); every named form up to n = 7, complex rings up to
  // n = 7 and ns up to 12 are the bench's topology table (scripts/bench/exact.mjs, the same SciPy truth).
  for (const n of [3]) {
    it(`every named real form with n = ${n}`, async () => {
      for (const { c, want } of check(named(n))) {
        const got = await meshTopology(c);
        expect(got.analysis, c.name).toEqual(want);
        expect(got.found, c.name).toEqual(want);
      }
    }, 900000);
  }

  // Hybrids are symmetric about their lobe direction: SciPy's meridian-section count (meridian_reference.py) is
  // their truth. Terms in the hybrid's own frame: textbook coefficients times (-1)^(n-l-1) (labels.ts' rule).
  const S2 = Math.SQRT1_2;
  const HYB: Record<string, [number, number][]> = {
    sp: [[0, S2], [1, S2]],
    sp2: [[0, 1 / Math.sqrt(3)], [1, Math.sqrt(2 / 3)]],
    sp3: [[0, 0.5], [1, Math.sqrt(3) / 2]],
    sp3d: [[0, 1 / Math.sqrt(3)], [1, Math.sqrt(2 / 3)]],
    sp3d2: [[0, 1 / Math.sqrt(6)], [1, S2], [2, 1 / Math.sqrt(3)]],
  };
  it('hybrids (n = 2): the mesh has the true parts, or the figure says it could not confirm them', async () => {
    const cases: { label: string; state: OrbitalState; ref: object }[] = [];
    const input: object[] = [];
    for (const n of [2]) {
      for (const [set, terms] of Object.entries(HYB)) {
        if (set.includes('d') && n < 3) continue;
        const label = `${n}${set}#1`;
        const state = parseOrbitalLabel(label).state;
        const solver = levelSolver(compileState(state));
        const t = solver.solve(0.9).density;
        input.push({ n, Z: 1, t, rmax: 1.8 * solver.halfWidth(t), terms: terms.map(([l, a]) => [l, (n - l - 1) % 2 === 0 ? a : -a]) });
        cases.push({ label, state, ref: {} });
      }
    }
    const r = spawnSync('/usr/bin/python3', [path.join(__dirname, 'meridian_reference.py')], { input: JSON.stringify(input), encoding: 'utf8', timeout: 600000 });
    if (r.status !== 0) throw new Error(`meridian_reference.py failed: ${r.stderr}`);
    const refs = JSON.parse(r.stdout) as Count[];
    let matched = 0;
    for (let i = 0; i < cases.length; i++) {
      const got = await meshTopology({ name: cases[i].label, state: cases[i].state });
      const want = nonEmpty(refs[i]);
      if (JSON.stringify(got.found) === JSON.stringify(want)) matched++;
      else expect(got.warnings, `${cases[i].label}: found ${JSON.stringify(got.found)}, true ${JSON.stringify(want)}`).toContain('topology-unverified');
    }
    // Measured: every one matches but 7sp³ (its finest inner details need more than the 256-point ceiling).
    expect(matched).toBeGreaterThanOrEqual(cases.length - 1);
  }, 900000);
});
