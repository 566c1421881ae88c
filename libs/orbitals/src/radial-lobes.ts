// The radial lobes of R_nl: the intervals between consecutive radial nodes, each with one maximum of |R|.
//
// Why one maximum per lobe: R satisfies R'' + (2/r) R' = q(r) R with q = l(l+1)/r² - 2Z/r - 2E. At an extremum
// (R' = 0) R'' = q R, so a maximum of |R| needs q < 0 (classically allowed) and an interior minimum needs q > 0
// (forbidden). r² q = l(l+1) - 2Zr + 2|E| r² is an upward parabola, so the allowed region is one interval and no
// lobe can hold max-min-max. The tests also check unimodality numerically on every lobe up to n = 12.
// Each lobe keeps tables of s = R(r)² and of the cumulative probability Pin(r) = ∫_0^r R² r'² dr' on both sides of
// its peak, so the radial interval {r in lobe: R² > s} = [a(s), b(s)] and its probability Pin(b) - Pin(a) are
// table look-ups. Pin is integrated cell by cell with 8-point Gauss–Legendre from the exact value at the lobe's
// inner node (probability.ts), so the tables carry no drift.

import { gaussLegendreRule } from './laguerre';
import { probabilityInside, probabilityOutside, radialNodes } from './probability';
import { radialConstants, radialNorm, radialValueAndSlope } from './radial';

const { PI, abs, cos, max, min, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/** One side of a lobe: r increasing; s monotone (increasing on the rising side, decreasing on the falling side). */
export interface LobeSide {
  readonly r: Float64Array;
  readonly s: Float64Array;
  /** ds/dr = 2 R R' at the nodes (for cubic Hermite look-ups). */
  readonly ds: Float64Array;
  readonly pin: Float64Array;
}

export interface RadialLobe {
  /** 1-based lobe number counted from the nucleus. */
  readonly index: number;
  /** Inner and outer node radius (0 for the first lobe; rMax for the last one, where the table ends). */
  readonly rLo: number;
  readonly rHi: number;
  /** Radius of the largest |R| in the lobe and that value. */
  readonly rPeak: number;
  readonly peak: number;
  /** Sign of R in the lobe: +1 for the first lobe (R > 0 near the nucleus), alternating outwards. */
  readonly sign: 1 | -1;
  readonly rising: LobeSide | null;
  readonly falling: LobeSide;
}

export interface RadialLobes {
  readonly n: number;
  readonly l: number;
  readonly Z: number;
  readonly nodes: number[];
  readonly lobes: RadialLobe[];
  /** Where the last lobe's table ends; P(r > rMax) = tail. */
  readonly rMax: number;
  readonly tail: number;
}

const SIDE_NODES = 1024;

/** Largest |R| on [lo, hi]: dense sampling, then golden-section refinement around the best sample. */
function lobePeak(R: (r: number) => number, lo: number, hi: number): number {
  const S = 400;
  let best = lo;
  let bestV = -1;
  for (let i = 0; i <= S; i++) {
    const r = lo + ((hi - lo) * i) / S;
    const v = abs(R(r));
    if (v > bestV) {
      bestV = v;
      best = r;
    }
  }
  let a = max(lo, best - (hi - lo) / S);
  let b = min(hi, best + (hi - lo) / S);
  const g = (sqrt(5) - 1) / 2;
  let c = b - g * (b - a);
  let d = a + g * (b - a);
  for (let i = 0; i < 200 && b - a > 1e-14 * max(1, b); i++) {
    if (abs(R(c)) > abs(R(d))) b = d;
    else a = c;
    c = b - g * (b - a);
    d = a + g * (b - a);
  }
  const r = 0.5 * (a + b);
  return abs(R(lo)) >= abs(R(r)) ? lo : r;
}

function side(n: number, l: number, Z: number, lo: number, hi: number, pinLo: number): LobeSide {
  const T = SIDE_NODES;
  const c = radialConstants(n, l, Z);
  const norm = radialNorm(n, l, Z);
  const R = (x: number) => radialValueAndSlope(c, norm, x).R;
  const r = new Float64Array(T + 1);
  const s = new Float64Array(T + 1);
  const ds = new Float64Array(T + 1);
  const pin = new Float64Array(T + 1);
  // Cosine spacing: dense at both ends (the node and the peak).
  for (let i = 0; i <= T; i++) r[i] = lo + (hi - lo) * 0.5 * (1 - cos((PI * i) / T));
  r[0] = lo;
  r[T] = hi;
  const g = gaussLegendreRule(8);
  pin[0] = pinLo;
  for (let i = 0; i <= T; i++) {
    const v = radialValueAndSlope(c, norm, r[i]);
    s[i] = v.R * v.R;
    ds[i] = 2 * v.R * v.dR;
    if (i > 0) {
      const a = r[i - 1];
      const b = r[i];
      let acc = 0;
      for (let q = 0; q < g.nodes.length; q++) {
        const x = 0.5 * (a + b) + 0.5 * (b - a) * g.nodes[q];
        const w = R(x);
        acc += g.weights[q] * w * w * x * x;
      }
      pin[i] = pin[i - 1] + 0.5 * (b - a) * acc;
    }
  }
  return { r, s, ds, pin };
}

const cache = new Map<string, RadialLobes>();

/**
 * The lobes of R_nl for nuclear charge Z. The last lobe's table ends at rMax with P(r > rMax) <= tail (default
 * 1e-12). Cached per (n, l, Z, tail): the tables are pure functions of them.
 */
export function radialLobes(n: number, l: number, Z: number, tail = 1e-12): RadialLobes {
  const key = `${n}/${l}/${Z}/${tail}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const nodes = radialNodes(n, l, Z).map(Number);
  let rMax = max((2 * n * n) / Z, nodes.length ? 1.5 * nodes[nodes.length - 1] : 0);
  while (probabilityOutside(n, l, Z, rMax) > tail) rMax *= 1.1;
  const rc = radialConstants(n, l, Z);
  const rn = radialNorm(n, l, Z);
  const R = (r: number) => radialValueAndSlope(rc, rn, r).R;
  const bounds = [0, ...nodes, rMax];
  const lobes: RadialLobe[] = [];
  for (let k = 0; k + 1 < bounds.length; k++) {
    const lo = bounds[k];
    const hi = bounds[k + 1];
    const rPeak = lobePeak(R, lo, hi);
    const peak = abs(R(rPeak));
    const pinLo = lo === 0 ? 0 : probabilityInside(n, l, Z, lo);
    const rising = rPeak > lo ? side(n, l, Z, lo, rPeak, pinLo) : null;
    const falling = side(n, l, Z, rPeak, hi, rising ? rising.pin[rising.pin.length - 1] : pinLo);
    lobes.push({ index: k + 1, rLo: lo, rHi: hi, rPeak, peak, sign: k % 2 === 0 ? 1 : -1, rising, falling });
  }
  const out: RadialLobes = { n, l, Z, nodes, lobes, rMax, tail: probabilityOutside(n, l, Z, rMax) };
  if (cache.size > 256) cache.clear();
  cache.set(key, out);
  return out;
}

/**
 * Index i of the cell holding x in a monotone table: key[i] <= x < key[i + 1] for increasing keys, key[i] >= x >
 * key[i + 1] for decreasing ones (clamped to 0..len-2).
 */
function search(key: Float64Array, x: number, increasing = true): number {
  let lo = 0;
  let hi = key.length - 1;
  while (hi - lo > 1) {
    const m = (lo + hi) >> 1;
    if (increasing ? key[m] <= x : key[m] >= x) lo = m;
    else hi = m;
  }
  return lo;
}

/**
 * r and Pin where s crosses the value x on one side: the cell by binary search, then r from the cubic Hermite
 * interpolant of s(r) (slopes ds/dr at both ends) by safeguarded Newton, and Pin from the cubic Hermite
 * interpolant with the exact slope dPin/dr = s r². Fourth order in the cell width.
 */
function crossing(sd: LobeSide, x: number, up: boolean): { r: number; pin: number } {
  const i = search(sd.s, x, up);
  const r0 = sd.r[i];
  const r1 = sd.r[i + 1];
  const h = r1 - r0;
  const s0 = sd.s[i];
  const s1 = sd.s[i + 1];
  if (h === 0 || s1 === s0) return { r: r0, pin: sd.pin[i] };
  const m0 = sd.ds[i] * h;
  const m1 = sd.ds[i + 1] * h;
  const sAt = (u: number) => {
    const u2 = u * u;
    const u3 = u2 * u;
    return (2 * u3 - 3 * u2 + 1) * s0 + (u3 - 2 * u2 + u) * m0 + (-2 * u3 + 3 * u2) * s1 + (u3 - u2) * m1;
  };
  const dsAt = (u: number) => {
    const u2 = u * u;
    return (6 * u2 - 6 * u) * s0 + (3 * u2 - 4 * u + 1) * m0 + (-6 * u2 + 6 * u) * s1 + (3 * u2 - 2 * u) * m1;
  };
  let lo = 0;
  let hi = 1;
  let u = min(1, max(0, (x - s0) / (s1 - s0)));
  const rising = s1 > s0;
  for (let k = 0; k < 60; k++) {
    const f = sAt(u) - x;
    if (abs(f) <= 1e-15 * max(abs(s0), abs(s1))) break;
    if (f < 0 === rising) lo = u;
    else hi = u;
    const d = dsAt(u);
    let next = d !== 0 ? u - f / d : 0.5 * (lo + hi);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (abs(next - u) < 1e-16) {
      u = next;
      break;
    }
    u = next;
  }
  const p0 = sd.pin[i];
  const p1 = sd.pin[i + 1];
  const q0 = s0 * r0 * r0 * h;
  const q1 = s1 * r1 * r1 * h;
  const u2 = u * u;
  const u3 = u2 * u;
  const pin = (2 * u3 - 3 * u2 + 1) * p0 + (u3 - 2 * u2 + u) * q0 + (-2 * u3 + 3 * u2) * p1 + (u3 - u2) * q1;
  return { r: r0 + u * h, pin };
}

/**
 * The radial interval of the lobe where R² > s, or null when s >= peak². Its inner end is the lobe's inner node
 * (or 0) when R² > s already there (only the first lobe of an s state), and its outer end is capped at rMax.
 */
export function lobeInterval(lobe: RadialLobe, s: number): { a: number; b: number; pinA: number; pinB: number } | null {
  if (!(s < lobe.peak * lobe.peak)) return null;
  let a: { r: number; pin: number };
  if (!lobe.rising || s <= lobe.rising.s[0]) a = { r: lobe.rLo, pin: lobe.rising ? lobe.rising.pin[0] : lobe.falling.pin[0] };
  else a = crossing(lobe.rising, s, true);
  const f = lobe.falling;
  const last = f.s.length - 1;
  const b = s <= f.s[last] ? { r: f.r[last], pin: f.pin[last] } : crossing(f, s, false);
  return { a: a.r, b: b.r, pinA: a.pin, pinB: b.pin };
}

/** Pin(r) inside the lobe's tables (r clamped to [rLo, rHi]). */
export function lobePin(lobe: RadialLobe, r: number): number {
  const sd = lobe.rising && r <= lobe.rPeak ? lobe.rising : lobe.falling;
  const x = min(sd.r[sd.r.length - 1], max(sd.r[0], r));
  const i = search(sd.r, x);
  const f = sd.r[i + 1] === sd.r[i] ? 0 : (x - sd.r[i]) / (sd.r[i + 1] - sd.r[i]);
  return sd.pin[i] + f * (sd.pin[i + 1] - sd.pin[i]);
}

/** G(s) = ∫ R² r² [R² > s] dr over all lobes: the radial probability above the level s of R². */
export function radialProbabilityAbove(lobes: RadialLobes, s: number): number {
  let sum = 0;
  for (const lobe of lobes.lobes) {
    const iv = lobeInterval(lobe, s);
    if (iv) sum += iv.pinB - iv.pinA;
  }
  return sum;
}
