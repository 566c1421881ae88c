// The enclosed-probability level of a state over ALL space, the fraction a level encloses, and the part of it a
// cube leaves out. One entry point (levelSolver) picks the most accurate method the state allows:
//
// - one (n, l) block (every named real form, the cubic f set, every complex eigenstate): psi = R_nl(r) H(Ω), so
//   |psi|² = R² A with A = |H|², and
//       P(t) = ∫ dΩ A(Ω) G(t / A(Ω)),   G(s) = ∫ R² r² [R² > s] dr,
//   G exact from the radial lobe tables (radial-lobes.ts). When A does not depend on φ (a single m in the complex
//   basis) the angular integral is 1D in μ = cos θ, split at the rim points A(μ) = t / peak_k² where the integrand
//   has square-root corners and integrated with Gauss–Legendre after the substitution μ = a + (b - a)(3v² - 2v³),
//   which removes them (near-exact). Otherwise a Gauss–Legendre(μ) × trapezoid(φ) product rule with many nodes.
// - several blocks (hybrids, superpositions): the ray quadrature of rays.ts.
// Every result carries an error estimate: the difference from the same method at half resolution plus the
// probability beyond the radius the tables reach.

import type { CompiledState } from './compile';
import { peakDensity } from './peak';
import { gaussLegendreRule } from './laguerre';
import { solveDecreasingLevel } from './roots';
import { lobeInterval, lobePin, radialLobes, radialProbabilityAbove, type RadialLobes } from './radial-lobes';
import { enclosedProbability, rayQuadrature, solveEnclosedLevel, sphereProductRule, superlevelHalfWidth, type EnclosedLevel, type RayQuadrature } from './rays';
import { Bohr } from './units';

const { PI, abs, max, round, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export interface FractionEstimate {
  /** Probability, 0..1. */
  fraction: number;
  /** Estimated absolute error. */
  error: number;
}

export interface LevelSolver {
  /** 'axial': 1D angular rule (A independent of φ); 'separable': 2D angular rule on R² A; 'rays': general. */
  readonly method: 'axial' | 'separable' | 'rays';
  /** Largest |psi|² (a0⁻³) the method found; levels at or above it enclose nothing. */
  readonly maxDensity: number;
  /** Probability inside {|psi|² > t} over all space. */
  fractionAt(t: number): FractionEstimate;
  /** The level t whose superlevel set holds `fraction` over all space. */
  solve(fraction: number): EnclosedLevel;
  /** Probability of {|psi|² > t} that lies outside the cube [-E, E]³ (0 when the cube holds the whole set). */
  outsideBox(t: number, E: number): FractionEstimate;
  /** Half-width of the smallest cube centred on the nucleus that holds {|psi|² >= t}. */
  halfWidth(t: number): Bohr;
}

/** Angular product rule: directions and the weight of each, with A = |H|² there. */
interface AngularRule {
  D: number;
  dirs: Float64Array;
  w: Float64Array;
  A: Float64Array;
}

function angularRule(compiled: CompiledState, nTheta: number, nPhi: number): AngularRule {
  const { D, dirs, w } = sphereProductRule(nTheta, nPhi);
  const A = new Float64Array(D);
  const im = new Float64Array(D);
  compiled.angularInto(0, dirs, A, im);
  for (let i = 0; i < D; i++) A[i] = A[i] * A[i] + im[i] * im[i];
  return { D, dirs, w, A };
}

/** G(s) on a merged table of every lobe side's s nodes (linear between them), for fast look-ups. */
interface GTable {
  s: Float64Array; // increasing
  G: Float64Array;
  top: number;
}

function gTable(lobes: RadialLobes): GTable {
  const all: number[] = [];
  for (const lobe of lobes.lobes) {
    for (const sd of [lobe.rising, lobe.falling]) if (sd) for (let i = 0; i < sd.s.length; i++) all.push(sd.s[i]);
  }
  all.sort((a, b) => a - b);
  const uniq: number[] = [];
  for (const v of all) if (uniq.length === 0 || v > uniq[uniq.length - 1]) uniq.push(v);
  let top = 0;
  for (const lobe of lobes.lobes) top = max(top, lobe.peak * lobe.peak);
  const s = Float64Array.from(uniq);
  const G = new Float64Array(s.length);
  for (let i = 0; i < s.length; i++) {
    let sum = 0;
    for (const lobe of lobes.lobes) {
      const iv = lobeInterval(lobe, s[i]);
      if (iv) sum += iv.pinB - iv.pinA;
    }
    G[i] = sum;
  }
  return { s, G, top };
}

function gLookup(tab: GTable, x: number): number {
  const s = tab.s;
  const n = s.length;
  if (x >= tab.top) return 0;
  if (x <= s[0]) return tab.G[0];
  if (x >= s[n - 1]) {
    // between the last node and the top peak: interpolate to 0 at the top
    const f = (x - s[n - 1]) / (tab.top - s[n - 1]);
    return tab.G[n - 1] * (1 - f);
  }
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const m = (lo + hi) >> 1;
    if (s[m] <= x) lo = m;
    else hi = m;
  }
  const f = (x - s[lo]) / (s[hi] - s[lo]);
  return tab.G[lo] + f * (tab.G[hi] - tab.G[lo]);
}

function checkFraction(fraction: number): void {
  if (!(fraction > 0 && fraction < 1)) throw new RangeError(`fraction must be between 0 and 1 (exclusive), got ${String(fraction)}`);
}

function checkLevel(t: number): void {
  if (!(t >= 0) || !Number.isFinite(t)) throw new RangeError(`density level must be a finite number >= 0, got ${String(t)}`);
}

/** True when |H|² does not depend on φ: one m in the complex basis. */
function isAxial(compiled: CompiledState): boolean {
  const ms = new Set(compiled.state.terms.map((t) => t.m));
  return compiled.blocks.length === 1 && ms.size === 1;
}

function separableSolver(compiled: CompiledState): LevelSolver {
  const { n, l } = compiled.blocks[0];
  const lobes = radialLobes(n, l, compiled.state.Z);
  const axial = isAxial(compiled);
  const peak2 = lobes.lobes.map((lb) => lb.peak * lb.peak);
  const nT = 2 * round(64 + 8 * l);
  let rules: { fine: AngularRule; half: AngularRule; tab: GTable } | null = null;
  // The 2D rules and the merged G table are built on first use (the axial method needs them only for the box).
  const get2d = () => (rules ??= { fine: angularRule(compiled, nT, 2 * nT), half: angularRule(compiled, nT / 2, nT), tab: gTable(lobes) });
  let aMax = 0;

  // --- axial: 1D in μ with breakpoints at the rim points
  const one = new Float64Array(3);
  const oneRe = new Float64Array(1);
  const oneIm = new Float64Array(1);
  const Amu = (mu: number): number => {
    one[0] = sqrt(max(0, 1 - mu * mu));
    one[2] = mu;
    compiled.angularInto(0, one, oneRe, oneIm);
    return oneRe[0] * oneRe[0] + oneIm[0] * oneIm[0];
  };
  const MU_SAMPLES = 4000;
  const muGrid = new Float64Array(MU_SAMPLES + 1);
  const aGrid = new Float64Array(MU_SAMPLES + 1);
  // The best direction met (a unit vector) and the angular step there, for the climb to the maximum below.
  const best = new Float64Array(3);
  let angularStep: number;
  if (axial) {
    for (let i = 0; i <= MU_SAMPLES; i++) {
      muGrid[i] = -1 + (2 * i) / MU_SAMPLES;
      aGrid[i] = Amu(muGrid[i]);
      if (aGrid[i] > aMax) {
        aMax = aGrid[i];
        best[0] = sqrt(max(0, 1 - muGrid[i] * muGrid[i]));
        best[2] = muGrid[i];
      }
    }
    angularStep = 2 / MU_SAMPLES;
  } else {
    const r = get2d();
    for (let i = 0; i < r.fine.D; i++) {
      if (r.fine.A[i] > aMax) {
        aMax = r.fine.A[i];
        best.set(r.fine.dirs.subarray(3 * i, 3 * i + 3));
      }
    }
    angularStep = PI / nT;
  }
  const axialP = (t: number, points: number): number => {
    const cuts = [-1, 1];
    for (const p2 of peak2) {
      const c = t / p2;
      for (let i = 0; i < MU_SAMPLES; i++) {
        const a0 = aGrid[i] - c;
        const a1 = aGrid[i + 1] - c;
        if (a0 === 0) cuts.push(muGrid[i]);
        else if (a0 < 0 !== a1 < 0) {
          let lo = muGrid[i];
          let hi = muGrid[i + 1];
          let flo = a0;
          for (let k = 0; k < 100 && hi - lo > 1e-15; k++) {
            const m = 0.5 * (lo + hi);
            const fm = Amu(m) - c;
            if (fm < 0 === flo < 0) {
              lo = m;
              flo = fm;
            } else hi = m;
          }
          cuts.push(0.5 * (lo + hi));
        }
      }
    }
    cuts.sort((a, b) => a - b);
    const g = gaussLegendreRule(points);
    let sum = 0;
    for (let k = 0; k + 1 < cuts.length; k++) {
      const a = cuts[k];
      const b = cuts[k + 1];
      if (!(b > a)) continue;
      for (let q = 0; q < points; q++) {
        const v = 0.5 * (1 + g.nodes[q]);
        const mu = a + (b - a) * v * v * (3 - 2 * v);
        const jac = (b - a) * 6 * v * (1 - v) * 0.5;
        const A = Amu(mu);
        if (A > 0) sum += g.weights[q] * jac * A * radialProbabilityAbove(lobes, t / A);
      }
    }
    return 2 * PI * sum;
  };

  const productP = (rule: AngularRule, t: number): number => {
    const tab = get2d().tab;
    let sum = 0;
    for (let i = 0; i < rule.D; i++) {
      const A = rule.A[i];
      if (A > 0) sum += rule.w[i] * A * gLookup(tab, t / A);
    }
    return sum;
  };

  const P = (t: number) => (axial ? axialP(t, 24) : productP(get2d().fine, t));
  const estimate = (t: number): FractionEstimate => {
    const f = P(t);
    const h = axial ? axialP(t, 12) : productP(get2d().half, t);
    return { fraction: f, error: abs(f - h) + lobes.tail + 1e-9 };
  };

  const outside = (rule: AngularRule, t: number, E: number): number => {
    let sum = 0;
    for (let i = 0; i < rule.D; i++) {
      const A = rule.A[i];
      if (!(A > 0)) continue;
      const m = max(abs(rule.dirs[3 * i]), abs(rule.dirs[3 * i + 1]), abs(rule.dirs[3 * i + 2]));
      const rb = E / m;
      let part = 0;
      for (const lobe of lobes.lobes) {
        if (lobe.rHi <= rb) continue;
        const iv = lobeInterval(lobe, t / A);
        if (!iv || iv.b <= rb) continue;
        part += iv.pinB - (iv.a >= rb ? iv.pinA : lobePin(lobe, rb));
      }
      sum += rule.w[i] * A * part;
    }
    return sum;
  };

  // The grids' best angle gives a lower bound of max |psi|² = max R² max |H|²: climbed from the largest radial peak
  // in that direction to the local maximum (peak.ts).
  const top = lobes.lobes.reduce((a, b) => (b.peak * b.peak > a.peak * a.peak ? b : a));
  const maxDensity = peakDensity(compiled, [top.rPeak * best[0], top.rPeak * best[1], top.rPeak * best[2]], [angularStep * max(top.rPeak, 1e-3)], aMax * max(...peak2));
  return {
    method: axial ? 'axial' : 'separable',
    maxDensity,
    fractionAt(t) {
      checkLevel(t);
      return estimate(t);
    },
    solve(fraction) {
      checkFraction(fraction);
      const t = solveDecreasingLevel(P, maxDensity, fraction);
      const e = estimate(t);
      return { density: t, isovalue: sqrt(t), fraction: e.fraction, error: e.error };
    },
    outsideBox(t, E) {
      checkLevel(t);
      if (!(E > 0)) throw new RangeError(`box half-width must be positive, got ${String(E)}`);
      const f = outside(get2d().fine, t, E);
      const h = outside(get2d().half, t, E);
      return { fraction: f, error: abs(f - h) };
    },
    halfWidth(t) {
      checkLevel(t);
      let best = 0;
      if (axial) {
        // A(μ) only: at polar angle θ the cube's norm of r u is r max(sin θ, |cos θ|) (φ = 0 gives sin θ).
        for (let i = 0; i <= MU_SAMPLES; i++) {
          const A = aGrid[i];
          if (!(A > 0)) continue;
          let bOut = 0;
          for (const lobe of lobes.lobes) {
            const iv = lobeInterval(lobe, t / A);
            if (iv) bOut = max(bOut, iv.b);
          }
          const mu = muGrid[i];
          best = max(best, bOut * max(sqrt(max(0, 1 - mu * mu)), abs(mu)));
        }
        return best as Bohr;
      }
      const fine = get2d().fine;
      for (let i = 0; i < fine.D; i++) {
        const A = fine.A[i];
        if (!(A > 0)) continue;
        let bOut = 0;
        for (const lobe of lobes.lobes) {
          const iv = lobeInterval(lobe, t / A);
          if (iv) bOut = max(bOut, iv.b);
        }
        if (bOut === 0) continue;
        const m = max(abs(fine.dirs[3 * i]), abs(fine.dirs[3 * i + 1]), abs(fine.dirs[3 * i + 2]));
        best = max(best, bOut * m);
      }
      return best as Bohr;
    },
  };
}

function raySolver(compiled: CompiledState): LevelSolver {
  let q: RayQuadrature | null = null;
  const get = () => (q ??= rayQuadrature(compiled));
  return {
    method: 'rays',
    get maxDensity() {
      return get().maxDensity;
    },
    fractionAt(t) {
      checkLevel(t);
      const f = enclosedProbability(get(), t);
      const c = enclosedProbability(get(), t, { coarse: true });
      return { fraction: f, error: abs(f - c) + get().tail };
    },
    solve(fraction) {
      checkFraction(fraction);
      return solveEnclosedLevel(get(), fraction);
    },
    outsideBox(t, E) {
      checkLevel(t);
      if (!(E > 0)) throw new RangeError(`box half-width must be positive, got ${String(E)}`);
      const f = enclosedProbability(get(), t, { outsideBox: E });
      const c = enclosedProbability(get(), t, { outsideBox: E, coarse: true });
      return { fraction: f, error: abs(f - c) };
    },
    halfWidth(t) {
      checkLevel(t);
      return superlevelHalfWidth(get(), t);
    },
  };
}

const solvers = new Map<string, LevelSolver>();

/**
 * The all-space level machinery for a compiled (normalised) state; see the file comment for the methods. Solvers
 * are kept per state (a few), so moving a fraction slider reuses the angular rules and radial tables.
 */
export function levelSolver(compiled: CompiledState): LevelSolver {
  const key = JSON.stringify(compiled.state);
  const hit = solvers.get(key);
  if (hit) return hit;
  const s = compiled.blocks.length === 1 ? separableSolver(compiled) : raySolver(compiled);
  if (solvers.size >= 8) solvers.delete(solvers.keys().next().value as string);
  solvers.set(key, s);
  return s;
}
