import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { analyseSurface, compileState, levelSolver, oneSEnclosingIsovalue, parseOrbitalLabel, radialLobes, radialR, stateFromNlm } from '../src';

/** SciPy from Debian's python (python3-scipy, installed by npm test's set-up): the independent reference. */
function scipy(script: string): any {
  const r = spawnSync('/usr/bin/python3', ['-c', script], { encoding: 'utf8', timeout: 300000 });
  if (r.status !== 0) throw new Error(`python failed (Debian python3-scipy is needed): ${r.stderr}`);
  return JSON.parse(r.stdout);
}

describe('enclosed probability over all space (levelSolver)', () => {
  it('1s: the level for 90 % is the closed form e^{-ρ}/√π with 1 − e^{-2ρ}(1 + 2ρ + 2ρ²) = 0.9, to 1e-10; Z scales it as Z^{3/2}', () => {
    for (const Z of [1, 3]) {
      const L = levelSolver(compileState(parseOrbitalLabel('1s', { Z }).state)).solve(0.9);
      expect(Math.abs(L.isovalue / oneSEnclosingIsovalue(0.9, Z) - 1)).toBeLessThan(1e-10);
      expect(L.error).toBeLessThan(1e-8);
    }
  });

  it('3d_xy (2D angular rule) and its part outside a cube: SciPy dblquad agrees within the reported error', () => {
    // R_32 = 4/(81 sqrt30) r² e^{-r/3} (Griffiths 2nd ed., Table 4.7), so ∫_0^R R² r² dr = P(7, 2R/3) (regularised
    // incomplete gamma, scipy.special.gammainc); Y_xy = sqrt(15/16pi) sin²θ sin 2φ (real form, common practice).
    const solver = levelSolver(compileState(parseOrbitalLabel('3dxy').state));
    const L = solver.solve(0.9);
    const E = 12;
    const out = solver.outsideBox(L.density, E);
    const ref = scipy(`
import json, math
from scipy import integrate, optimize, special
t = ${L.density}
R2 = lambda r: (4/(81*math.sqrt(30)))**2 * r**4 * math.exp(-2*r/3)
P = lambda r: special.gammainc(7, 2*r/3)
def ray(mu, ph, rb):
    A = 15/(16*math.pi) * (1-mu*mu)**2 * math.sin(2*ph)**2
    if A <= 0 or t/A >= R2(6.0): return 0.0
    a = optimize.brentq(lambda r: R2(r) - t/A, 1e-12, 6.0, xtol=1e-14)
    b = optimize.brentq(lambda r: R2(r) - t/A, 6.0, 400.0, xtol=1e-14)
    lo = max(a, rb)
    return A*(P(b) - P(lo)) if b > lo else 0.0
def rbox(mu, ph):
    s = math.sqrt(max(0.0, 1-mu*mu))
    return ${E}/max(abs(s*math.cos(ph)), abs(s*math.sin(ph)), abs(mu))
# symmetry: mu -> -mu and the 8 images of phi in [0, pi/4]
f = lambda ph, mu: ray(mu, ph, 0.0)
g = lambda ph, mu: ray(mu, ph, rbox(mu, ph))
allspace = 16*integrate.dblquad(f, 0, 1, 0, math.pi/4, epsabs=1e-10)[0]
outside = 16*integrate.dblquad(g, 0, 1, 0, math.pi/4, epsabs=1e-10)[0]
print(json.dumps({"allspace": allspace, "outside": outside}))
`);
    expect(Math.abs(ref.allspace - 0.9)).toBeLessThanOrEqual(L.error);
    expect(L.error).toBeLessThan(5e-4);
    expect(Math.abs(out.fraction - ref.outside)).toBeLessThanOrEqual(out.error + 1e-6);
    expect(out.fraction).toBeGreaterThan(0.01);
  });

  it('2sp³ (two blocks, ray quadrature): SciPy in the hybrid’s own frame agrees within the reported error', () => {
    // ψ = ½(−R_20 Y_00) + (√3/2) R_21 sqrt(3/4pi) cos α about the lobe axis (the textbook member times (−1)^(n−l−1));
    // the probability inside |ψ|² > t, one quad over cos α and root-bracketed quads along r.
    const L = levelSolver(compileState(parseOrbitalLabel('2sp3').state)).solve(0.9);
    const ref = scipy(`
import json, math
import numpy as np
from scipy import integrate, optimize
t = ${L.density}
R20 = lambda r: (1/math.sqrt(2))*(1 - r/2)*math.exp(-r/2)
R21 = lambda r: (1/math.sqrt(24))*r*math.exp(-r/2)
def psi(r, mu): return -0.5*R20(r)/math.sqrt(4*math.pi) + (math.sqrt(3)/2)*R21(r)*math.sqrt(3/(4*math.pi))*mu
def ray(mu):
    rs = np.linspace(0.0, 60.0, 6001)
    v = np.array([psi(r, mu)**2 - t for r in rs])
    edges = [0.0] + [optimize.brentq(lambda r: psi(r, mu)**2 - t, rs[i], rs[i+1], xtol=1e-14) for i in range(len(rs)-1) if v[i]*v[i+1] < 0] + [60.0]
    total = 0.0
    for a, b in zip(edges[:-1], edges[1:]):
        if psi(0.5*(a+b), mu)**2 > t:
            total += integrate.quad(lambda r: psi(r, mu)**2 * r*r, a, b, epsabs=1e-13)[0]
    return total
print(json.dumps({"allspace": 2*math.pi*integrate.quad(ray, -1, 1, limit=200, epsabs=1e-9)[0]}))
`);
    expect(Math.abs(ref.allspace - 0.9)).toBeLessThanOrEqual(L.error);
  });

  it('largest |ψ|² over all space: closed forms for 2p_z (axial) and 3d_xy (2D rule) to 1e-12, SciPy along the 2sp³ axis to 1e-10', () => {
    // 2p_z: ψ = r e^{-r/2} cos θ / (4 √(2π)), largest at r = 2 on the axis: (2 e^{-1} / (4 √(2π)))².
    expect(Math.abs(levelSolver(compileState(parseOrbitalLabel('2pz').state)).maxDensity / (2 * Math.exp(-1) / (4 * Math.sqrt(2 * Math.PI))) ** 2 - 1)).toBeLessThan(1e-12);
    // 3d_xy: R_32 = 4 / (81 √30) r² e^{-r/3} peaks at r = 6; Y_xy = √(15 / 16π) sin²θ sin 2φ peaks at θ = π/2, φ = π/4
    // (real form, common practice), a direction the angular grid does not contain.
    const r32 = (4 / (81 * Math.sqrt(30))) * 36 * Math.exp(-2);
    expect(Math.abs(levelSolver(compileState(parseOrbitalLabel('3dxy').state)).maxDensity / (r32 * r32 * (15 / (16 * Math.PI))) - 1)).toBeLessThan(1e-12);
    // 2sp³ (ray quadrature): |ψ| is linear in cos α at each r, so its largest value lies on the lobe axis (α = 0 or π).
    const solver = levelSolver(compileState(parseOrbitalLabel('2sp3').state));
    expect(solver.method).toBe('rays');
    const ref = scipy(`
import json, math
from scipy import optimize
R20 = lambda r: (1/math.sqrt(2))*(1 - r/2)*math.exp(-r/2)
R21 = lambda r: (1/math.sqrt(24))*r*math.exp(-r/2)
def psi(r, mu): return -0.5*R20(r)/math.sqrt(4*math.pi) + (math.sqrt(3)/2)*R21(r)*math.sqrt(3/(4*math.pi))*mu
best = psi(0.0, 1.0)**2
for mu in (1.0, -1.0):
    for a, b in ((0.0, 2.0), (2.0, 6.0), (6.0, 40.0)):
        res = optimize.minimize_scalar(lambda r: -psi(r, mu)**2, bounds=(a, b), method='bounded', options={'xatol': 1e-13})
        best = max(best, -res.fun)
print(json.dumps({"max": best}))
`);
    expect(Math.abs(solver.maxDensity / ref.max - 1)).toBeLessThan(1e-10);
  });

  it('complex 2p(m=+1) and Z = 2: fraction at a level equals the separable closed-form integral (1D rule, error < 1e-6)', () => {
    // |ψ|² = R_21² (3/8pi) sin²θ; at Z = 2, ∫_0^R R_21² r² dr = P(5, ZR) (incomplete gamma, checked here by quadrature).
    const c = compileState(stateFromNlm(2, 1, 1, { complex: true, Z: 2 }));
    const solver = levelSolver(c);
    expect(solver.method).toBe('axial');
    const t = 0.02;
    const f = solver.fractionAt(t);
    const ref = scipy(`
import json, math
from scipy import integrate, optimize, special
t = ${t}; Z = 2.0
R2 = lambda r: Z**3/24 * (Z*r)**2 * math.exp(-Z*r)
def g(mu):
    A = 3/(8*math.pi)*(1-mu*mu)
    if A <= 0 or t/A >= R2(2/Z): return 0.0
    a = optimize.brentq(lambda r: R2(r)-t/A, 1e-12, 2/Z, xtol=1e-15)
    b = optimize.brentq(lambda r: R2(r)-t/A, 2/Z, 100.0, xtol=1e-15)
    return A*(special.gammainc(5, Z*b) - special.gammainc(5, Z*a))
print(json.dumps({"f": 2*math.pi*integrate.quad(g, -1, 1, limit=400, epsabs=1e-13)[0]}))
`);
    expect(f.error).toBeLessThan(1e-6);
    expect(Math.abs(f.fraction - ref.f)).toBeLessThan(Math.max(f.error, 1e-9));
  });
});

describe('radial lobes and the surface analysis', () => {
  it('|R_nl| has one maximum between consecutive nodes for every n <= 12 (the claim the lobe tables rest on)', () => {
    for (let n = 1; n <= 12; n++) {
      for (let l = 0; l < n; l++) {
        for (const lobe of radialLobes(n, l, 1).lobes) {
          const hi = Math.min(lobe.rHi, 6 * n * n);
          let turns = 0;
          let prev = Math.abs(radialR(n, l, 1, lobe.rLo));
          let rising = true;
          for (let i = 1; i <= 2000; i++) {
            const v = Math.abs(radialR(n, l, 1, lobe.rLo + ((hi - lobe.rLo) * i) / 2000));
            if (rising && v < prev) rising = false;
            else if (!rising && v > prev * (1 + 1e-12)) turns++;
            prev = v;
          }
          expect(turns, `n=${n} l=${l} lobe ${lobe.index}`).toBe(0);
        }
      }
    }
  });

  it('names the features a grid must resolve: the ring of complex 2p(m=+1) and the shells of 4s', () => {
    const ring = compileState(stateFromNlm(2, 1, 1, { complex: true }));
    const a = analyseSurface(ring, levelSolver(ring).solve(0.9).density)!;
    expect(a.ring).toBe(true);
    expect(a.smallest!.kind).toBe('ring-hole');
    expect(a.topology).toEqual({ complex: { components: 1, euler: 0 } });
    const s4 = compileState(parseOrbitalLabel('4s').state);
    const b = analyseSurface(s4, levelSolver(s4).solve(0.9).density)!;
    expect(b.radialNodes).toHaveLength(3);
    expect(b.layers.map((x) => x.present)).toEqual([true, true, true, true]);
    expect(b.smallest!.kind).toBe('shell');
    expect(analyseSurface(compileState(parseOrbitalLabel('2sp3').state), 1e-4)).toBeNull(); // several (n, l): none
  });
});
