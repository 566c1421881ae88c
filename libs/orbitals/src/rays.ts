// Enclosed probability over ALL space by a spherical quadrature that does not stop at any box.
//
// The enclosed-probability rule asks for the level t of |psi|² whose superlevel set {|psi|² > t} holds the
// fraction f of the probability. On a grid inside a box that integral stops at the box, so a box that cuts the
// surface makes every claimed fraction false. Here it is written in spherical coordinates,
//     P(t) = ∫ dΩ ∫_0^∞ |psi(r u)|² [|psi|² > t] r² dr,
// with the radial integral taken out to a radius rMax beyond which at most `tail` of the probability lies
// (computed analytically, probability.ts), so the part left out is bounded, not guessed.
// Angles: Gauss–Legendre in cos θ and the trapezoid rule in φ (spectral for smooth periodic integrands);
// radial: trapezoid in u with r = rMax u² (fine near the nucleus, where inner shells are thin). The indicator is
// handled by interpolating |psi|² to the crossing inside each radial cell, so the rule stays second order where the
// surface cuts a ray. The error estimate is the difference from an independent rule with half the nodes in every
// direction (Gauss–Legendre Nθ/2, every other φ and radial node), a safe over-estimate for a second-order rule,
// plus the analytic tail.
// psi(r u) = sum_b R_b(r) H_b(u) (compile.ts), so the quadrature stores one radial and one angular table per
// (n, l) block instead of a 3D array: memory is O(blocks × (directions + radii)).

import type { CompiledState } from './compile';
import { gaussLegendreRule } from './laguerre';
import { stateProbabilityInside } from './probability';
import { peakDensity } from './peak';
import { solveDecreasingLevel } from './roots';
import { Bohr } from './units';

const { PI, abs, cos, floor, max, min, round, sin, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)


/** Directions whose best node is climbed to a local maximum of |psi|² (peak.ts). */
const CLIMB_STARTS = 8;

export interface RayQuadratureOptions {
  /** Gauss–Legendre nodes in cos θ (even); default from the largest l. */
  nTheta?: number;
  /** φ nodes (even); default 2 nTheta. */
  nPhi?: number;
  /** Radial intervals (even); default from the largest n. */
  nRadial?: number;
  /** Probability allowed beyond rMax (default 1e-9). */
  tail?: number;
}

/** One product rule: directions with weights, radii shared with the fine rule (every `step`-th node). */
interface RaySet {
  readonly D: number;
  readonly dirs: Float64Array;
  readonly w: Float64Array;
  /** Angular tables per block: re, im at each direction (b * D + i). */
  readonly angRe: Float64Array;
  readonly angIm: Float64Array;
  readonly step: number;
}

export interface RayQuadrature {
  readonly nTheta: number;
  readonly nPhi: number;
  readonly nRadial: number;
  /** Radius of the ball the radial integral covers; P(r > rMax) = tail. */
  readonly rMax: Bohr;
  readonly tail: number;
  /** Radii r_j = rMax (j / nRadial)², j = 0..nRadial. */
  readonly radii: Float64Array;
  /** Largest |psi|² over all space: the fine rule's best nodes, each climbed to its local maximum (peak.ts). */
  readonly maxDensity: number;
  readonly blocks: number;
  /** R_b(r_j) at b * (nRadial + 1) + j. */
  readonly rad: Float64Array;
  readonly fine: RaySet;
  readonly coarse: RaySet;
}

/** What the level solve reports: the level, the fraction it encloses over all space and the error bound. */
export interface EnclosedLevel {
  /** |psi|² level t, a0⁻³. */
  density: number;
  /** |psi| level sqrt(t), a0^-3/2. */
  isovalue: number;
  /** Probability inside {|psi|² > t} over all space (fine rule). */
  fraction: number;
  /** Estimated absolute error of `fraction` (difference from the half rule + analytic tail). */
  error: number;
}

function even(n: number, name: string): number {
  if (!Number.isInteger(n) || n < 4 || n % 2 !== 0) throw new RangeError(`${name} must be an even integer >= 4, got ${String(n)}`);
  return n;
}

/**
 * The product rule on the sphere both level methods use: Gauss–Legendre in cos θ (nTheta nodes) × trapezoid in φ
 * (nPhi nodes); directions as unit vectors (x, y, z per direction) and their weights (sum 4π).
 */
export function sphereProductRule(nTheta: number, nPhi: number): { D: number; dirs: Float64Array; w: Float64Array } {
  const g = gaussLegendreRule(nTheta);
  const D = nTheta * nPhi;
  const dirs = new Float64Array(3 * D);
  const w = new Float64Array(D);
  for (let it = 0; it < nTheta; it++) {
    const ct = g.nodes[it];
    const st = sqrt(max(0, 1 - ct * ct));
    for (let ip = 0; ip < nPhi; ip++) {
      const ph = (2 * PI * ip) / nPhi;
      const i = it * nPhi + ip;
      dirs[3 * i] = st * cos(ph);
      dirs[3 * i + 1] = st * sin(ph);
      dirs[3 * i + 2] = ct;
      w[i] = (g.weights[it] * 2 * PI) / nPhi;
    }
  }
  return { D, dirs, w };
}

function raySet(compiled: CompiledState, nTheta: number, nPhi: number, step: number): RaySet {
  const { D, dirs, w } = sphereProductRule(nTheta, nPhi);
  const B = compiled.blocks.length;
  const angRe = new Float64Array(B * D);
  const angIm = new Float64Array(B * D);
  for (let b = 0; b < B; b++) compiled.angularInto(b, dirs, angRe.subarray(b * D, (b + 1) * D), angIm.subarray(b * D, (b + 1) * D));
  return { D, dirs, w, angRe, angIm, step };
}

/**
 * Builds the quadrature for a compiled (normalised) state. rMax: the smallest radius (grown by 5 % steps from
 * the slowest term's scale) with P(r > rMax) <= tail, from the analytic radial integrals.
 */
export function rayQuadrature(compiled: CompiledState, opts: RayQuadratureOptions = {}): RayQuadrature {
  const blocks = compiled.blocks;
  let lMax = 0;
  let nMax = 1;
  for (const b of blocks) {
    lMax = max(lMax, b.l);
    nMax = max(nMax, b.n);
  }
  const nTheta = even(opts.nTheta ?? 2 * round(24 + 2 * lMax), 'nTheta');
  const nPhi = even(opts.nPhi ?? 2 * nTheta, 'nPhi');
  const nRadial = even(opts.nRadial ?? 2 * round(128 + 8 * nMax), 'nRadial');
  const tail = opts.tail ?? 1e-9;
  if (!(tail > 0 && tail < 1e-3)) throw new RangeError(`tail must be in (0, 1e-3), got ${String(tail)}`);

  const Z = compiled.state.Z;
  let rMax = (nMax * nMax) / Z;
  for (let i = 0; i < 400 && 1 - stateProbabilityInside(compiled.state, rMax) > tail; i++) rMax *= 1.05;
  const tailActual = max(0, 1 - stateProbabilityInside(compiled.state, rMax));

  const M = nRadial + 1;
  const radii = new Float64Array(M);
  for (let j = 0; j < M; j++) {
    const u = j / nRadial;
    radii[j] = rMax * u * u;
  }
  const B = blocks.length;
  const rad = new Float64Array(B * M);
  for (let b = 0; b < B; b++) for (let j = 0; j < M; j++) rad[b * M + j] = compiled.radial(b, radii[j]);
  const fine = raySet(compiled, nTheta, nPhi, 1);
  const coarse = raySet(compiled, nTheta / 2, nPhi / 2, 2);
  const q: RayQuadrature = { nTheta, nPhi, nRadial, rMax: rMax as Bohr, tail: tailActual, radii, maxDensity: 0, blocks: B, rad, fine, coarse };
  const prof = new Float64Array(M);
  let maxDensity = 0;
  // The best node of each of the CLIMB_STARTS best directions, climbed to its local maximum (peak.ts): the nodes'
  // own maximum is only a lower bound.
  const top = new Float64Array(CLIMB_STARTS).fill(-1);
  const topAt = new Int32Array(2 * CLIMB_STARTS);
  for (let i = 0; i < fine.D; i++) {
    profile(q, fine, i, prof);
    let bj = 0;
    for (let j = 0; j < M; j++) if (prof[j] > prof[bj]) bj = j;
    if (prof[bj] > maxDensity) maxDensity = prof[bj];
    let k = CLIMB_STARTS - 1;
    if (!(prof[bj] > top[k])) continue;
    for (; k > 0 && top[k - 1] < prof[bj]; k--) {
      top[k] = top[k - 1];
      topAt[2 * k] = topAt[2 * k - 2];
      topAt[2 * k + 1] = topAt[2 * k - 1];
    }
    top[k] = prof[bj];
    topAt[2 * k] = i;
    topAt[2 * k + 1] = bj;
  }
  const starts: number[] = [];
  const steps: number[] = [];
  for (let k = 0; k < CLIMB_STARTS && top[k] > 0; k++) {
    const i = topAt[2 * k], j = topAt[2 * k + 1];
    for (let a = 0; a < 3; a++) starts.push(radii[j] * fine.dirs[3 * i + a]);
    steps.push(max(radii[min(j + 1, M - 1)] - radii[j], rMax / (nRadial * nRadial)));
  }
  return { ...q, maxDensity: peakDensity(compiled, starts, steps, maxDensity) };
}

/** |psi|² along ray i of set s at every radial node, into out (length nRadial + 1). */
function profile(q: RayQuadrature, s: RaySet, i: number, out: Float64Array): void {
  const M = q.nRadial + 1;
  const B = q.blocks;
  const rad = q.rad;
  if (B === 1) {
    const a = s.angRe[i] * s.angRe[i] + s.angIm[i] * s.angIm[i];
    for (let j = 0; j < M; j++) out[j] = rad[j] * rad[j] * a;
    return;
  }
  out.fill(0);
  for (let j = 0; j < M; j++) {
    let re = 0;
    let im = 0;
    for (let b = 0; b < B; b++) {
      const r = rad[b * M + j];
      re += r * s.angRe[b * s.D + i];
      im += r * s.angIm[b * s.D + i];
    }
    out[j] = re * re + im * im;
  }
}

/**
 * ∫ over one ray of |psi|² r² [|psi|² > t] dr for u in [uStart, 1], on every `step`-th radial node of the
 * profile. Crossings and the start point are placed by linear interpolation inside their cell.
 */
function rayIntegral(q: RayQuadrature, prof: Float64Array, t: number, step: number, uStart: number): number {
  const N = q.nRadial;
  const rMax = q.rMax as number;
  const c = 2 * rMax * rMax * rMax;
  // g(u) = rho r² dr/du = rho (rMax u²)² 2 rMax u
  const g = (rho: number, u: number) => {
    const u2 = u * u;
    return c * rho * u2 * u2 * u;
  };
  let sum = 0;
  const j0 = uStart > 0 ? min(N, floor((uStart * N) / step) * step) : 0;
  for (let j = j0; j + step <= N; j += step) {
    let uA = j / N;
    const uB = (j + step) / N;
    let ra = prof[j];
    const rb = prof[j + step];
    if (uStart > uA) {
      if (uStart >= uB) continue;
      ra = ra + ((uStart - uA) / (uB - uA)) * (rb - ra);
      uA = uStart;
    }
    const w = uB - uA;
    const inA = ra > t;
    const inB = rb > t;
    if (inA && inB) sum += 0.5 * w * (g(ra, uA) + g(rb, uB));
    else if (inA) {
      const f = (ra - t) / (ra - rb);
      sum += 0.5 * f * w * (g(ra, uA) + g(t, uA + f * w));
    } else if (inB) {
      const f = (rb - t) / (rb - ra);
      sum += 0.5 * f * w * (g(rb, uB) + g(t, uB - f * w));
    }
  }
  return sum;
}

/** Box exit radius of direction i of set s for the cube [-E, E]³. */
function boxExit(s: RaySet, i: number, E: number): number {
  const m = max(abs(s.dirs[3 * i]), abs(s.dirs[3 * i + 1]), abs(s.dirs[3 * i + 2]));
  return E / m;
}

/**
 * Probability inside {|psi|² > t}: over all space, or (outsideBox = E) only the part outside the cube
 * [-E, E]³. `coarse` uses the half rule.
 */
export function enclosedProbability(q: RayQuadrature, t: number, opts: { coarse?: boolean; outsideBox?: number } = {}): number {
  if (!(t >= 0) || !Number.isFinite(t)) throw new RangeError(`density level must be a finite number >= 0, got ${String(t)}`);
  const s = opts.coarse === true ? q.coarse : q.fine;
  const prof = new Float64Array(q.nRadial + 1);
  const rMax = q.rMax as number;
  let sum = 0;
  for (let i = 0; i < s.D; i++) {
    let uStart = 0;
    if (opts.outsideBox !== undefined) {
      const rb = boxExit(s, i, opts.outsideBox);
      if (rb >= rMax) continue;
      uStart = sqrt(rb / rMax);
    }
    profile(q, s, i, prof);
    sum += s.w[i] * rayIntegral(q, prof, t, s.step, uStart);
  }
  return sum;
}
/** The all-space fraction enclosed by |psi|² > t, with its error estimate. */
export function fractionAtDensity(q: RayQuadrature, t: number): { fraction: number; error: number } {
  const fine = enclosedProbability(q, t);
  const coarse = enclosedProbability(q, t, { coarse: true });
  return { fraction: fine, error: abs(fine - coarse) + q.tail };
}

/** Solves P(t) = fraction over all space (see roots.ts), with the error estimate at the solution. */
export function solveEnclosedLevel(q: RayQuadrature, fraction: number): EnclosedLevel {
  if (!(fraction > 0 && fraction < 1)) throw new RangeError(`fraction must be between 0 and 1 (exclusive), got ${String(fraction)}`);
  if (!(q.maxDensity > 0)) throw new RangeError('the state is zero everywhere on the quadrature');
  const t = solveDecreasingLevel((x) => enclosedProbability(q, x), q.maxDensity, fraction);
  const r = fractionAtDensity(q, t);
  return { density: t, isovalue: sqrt(t), fraction: r.fraction, error: r.error };
}

/**
 * Half-width of the smallest cube centred on the nucleus that holds {|psi|² >= t}, from the outermost crossing
 * on every ray of the fine rule (interpolated in its cell). Directions are discrete, so the true value can exceed
 * this by about (1 - cos(angular step / 2)) of it; callers add a margin.
 */
export function superlevelHalfWidth(q: RayQuadrature, t: number): Bohr {
  const N = q.nRadial;
  const s = q.fine;
  const prof = new Float64Array(N + 1);
  let best = 0;
  for (let i = 0; i < s.D; i++) {
    profile(q, s, i, prof);
    let j = N;
    while (j >= 0 && prof[j] < t) j--;
    if (j < 0) continue;
    let r = q.radii[j];
    if (j < N) {
      const f = (prof[j] - t) / (prof[j] - prof[j + 1]);
      const u = (j + f) / N;
      r = (q.rMax as number) * u * u;
    }
    const m = max(abs(s.dirs[3 * i]), abs(s.dirs[3 * i + 1]), abs(s.dirs[3 * i + 2]));
    best = max(best, r * m);
  }
  return best as Bohr;
}
