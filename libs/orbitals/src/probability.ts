import { logFactorial } from './factorial';
import { gaussLaguerreRule, gaussLegendreRule, genLaguerre } from './laguerre';
import { assertQuantumNumbers, assertZ } from './quantum';
import { radialNorm } from './radial';
import { OrbitalState, toComplexBasis } from './state';
import { Bohr } from './units';

const { PI, abs, ceil, exp, max, min, pow, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

// 20-point Gauss–Laguerre is exact for polynomial degree <= 39; every radial product used below is
// (polynomial of degree n1 + n2 <= 24 or 2n + 1 <= 25) x exponential, so these integrals are exact up to round-off.
const GL_POINTS = 20;

function checkNl(n: number, l: number, Z: number): void {
  assertQuantumNumbers(n, l, 0);
  assertZ(Z);
}

function checkRadius(R: number, name = 'R'): void {
  if (typeof R !== 'number' || Number.isNaN(R) || R < 0) throw new RangeError(`${name} must be a non-negative number of Bohr radii, got ${String(R)}`);
}

/**
 * ∫_R^∞ R_{n1 l}(r) R_{n2 l}(r) r² dr. With beta = Z(1/n1 + 1/n2) and u = beta r the integrand is
 * g(u) e^{-u} / beta, g a polynomial; shifting u = beta R + t gives e^{-beta R} ∫_0^∞ g(beta R + t) e^{-t} dt,
 * done by Gauss–Laguerre quadrature (exact for this degree). Each node's value is formed in logs so that
 * a very large R underflows cleanly to 0.
 */
export function radialOverlapOutside(n1: number, n2: number, l: number, Z: number, R: number): number {
  checkNl(n1, l, Z);
  checkNl(n2, l, Z);
  checkRadius(R);
  if (R === Infinity) return 0;
  const beta = Z * (1 / n1 + 1 / n2);
  const u0 = beta * R;
  const { nodes, weights } = gaussLaguerreRule(GL_POINTS);
  const lnN = Math.log(radialNorm(n1, l, Z)) + Math.log(radialNorm(n2, l, Z));
  const k1 = n1 - l - 1;
  const k2 = n2 - l - 1;
  const a = 2 * l + 1;
  let sum = 0;
  for (let i = 0; i < nodes.length; i++) {
    const r = (u0 + nodes[i]) / beta;
    const rho1 = (2 * Z * r) / n1;
    const rho2 = (2 * Z * r) / n2;
    const L = genLaguerre(k1, a, rho1) * genLaguerre(k2, a, rho2);
    if (L === 0) continue;
    const lnG = 2 * Math.log(r) + lnN + l * (Math.log(rho1) + Math.log(rho2)) + Math.log(abs(L));
    sum += weights[i] * Math.sign(L) * exp(lnG - u0);
  }
  return sum / beta;
}

/** P(r > R) for the state n, l (any m): ∫_R^∞ r² R_nl² dr. */
export function probabilityOutside(n: number, l: number, Z: number, R: number): number {
  return min(1, max(0, radialOverlapOutside(n, n, l, Z, R)));
}

/**
 * P(r < R) = ∫_0^R r² R_nl² dr. Where the inside is the smaller part it is integrated directly by
 * composite 16-point Gauss–Legendre (panels of width <= 1 in rho = 2Zr/n), otherwise 1 - P(r > R).
 * Accurate to ~1e-14 absolute (tests compare with closed forms).
 */
export function probabilityInside(n: number, l: number, Z: number, R: number): number {
  const out = probabilityOutside(n, l, Z, R);
  if (out < 0.5) return 1 - out;
  const x = (2 * Z * R) / n;
  const lnC = logFactorial(n - l - 1) - logFactorial(n + l) - Math.log(2 * n);
  const k = n - l - 1;
  const a = 2 * l + 1;
  const { nodes, weights } = gaussLegendreRule(16);
  const panels = max(1, ceil(x));
  const w = x / panels;
  let sum = 0;
  for (let p = 0; p < panels; p++) {
    const mid = (p + 0.5) * w;
    for (let i = 0; i < nodes.length; i++) {
      const rho = mid + 0.5 * w * nodes[i];
      const L = genLaguerre(k, a, rho);
      if (L === 0 || rho === 0) continue;
      sum += weights[i] * 0.5 * w * exp(lnC + (2 * l + 2) * Math.log(rho) + 2 * Math.log(abs(L)) - rho);
    }
  }
  return min(1, max(0, sum));
}

/**
 * P(|r| < R) for a superposition: sum over (l, m) of sum_{n,n'} conj(c_nlm) c_n'lm ∫_0^R R_nl R_n'l r² dr
 * (angular parts orthonormal). Off-diagonal radial integrals over [0, ∞) vanish, so ∫_0^R = -∫_R^∞ there.
 * Divided by the state's norm.
 */
export function stateProbabilityInside(state: OrbitalState, R: number): number {
  checkRadius(R);
  const cx = toComplexBasis(state);
  let total = 0;
  let norm = 0;
  for (const a of cx.terms) {
    norm += a.re * a.re + a.im * a.im;
    for (const b of cx.terms) {
      if (a.l !== b.l || a.m !== b.m) continue;
      const cc = a.re * b.re + a.im * b.im; // Re(conj(a) b)
      if (cc === 0) continue;
      const I = a.n === b.n ? probabilityInside(a.n, a.l, cx.Z, R) : -radialOverlapOutside(a.n, b.n, a.l, cx.Z, R);
      total += cc * I;
    }
  }
  return min(1, max(0, total / norm));
}

/** Radius R with P(r < R) = fraction for the state n, l (bisection to ~1e-13 relative). */
export function radiusForProbability(n: number, l: number, Z: number, fraction: number): Bohr {
  checkNl(n, l, Z);
  if (!(fraction > 0 && fraction < 1)) throw new RangeError(`fraction must be between 0 and 1 (exclusive), got ${String(fraction)}`);
  let lo = 0;
  let hi = (n * n) / Z;
  while (probabilityInside(n, l, Z, hi) < fraction) {
    lo = hi;
    hi *= 2;
  }
  for (let i = 0; i < 200 && hi - lo > 1e-13 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (probabilityInside(n, l, Z, mid) < fraction) lo = mid;
    else hi = mid;
  }
  return hi as Bohr;
}

/** Bisection for a sign change of f on [a, b] down to the resolution of doubles. */
function bisect(f: (x: number) => number, a: number, b: number): number {
  let fa = f(a);
  for (let i = 0; i < 200; i++) {
    const m = 0.5 * (a + b);
    if (m <= a || m >= b) break;
    const fm = f(m);
    if (fm === 0) return m;
    if (fa < 0 === fm < 0) {
      a = m;
      fa = fm;
    } else b = m;
  }
  return 0.5 * (a + b);
}

/**
 * Radial nodes of R_nl (r > 0): the n-l-1 zeros of L_{n-l-1}^{2l+1}(2Zr/n). All zeros lie below
 * 4k + 2 alpha + 4 (a loose bound, from memory; the count of zeros found is checked, so a wrong bound fails
 * loudly); sign changes are bracketed on a fine grid then refined by bisection to double precision (<< 1e-9).
 */
export function radialNodes(n: number, l: number, Z: number): Bohr[] {
  checkNl(n, l, Z);
  const k = n - l - 1;
  if (k === 0) return [];
  const a = 2 * l + 1;
  const f = (rho: number) => genLaguerre(k, a, rho);
  const rhoMax = 4 * k + 2 * a + 4;
  for (let samples = 400 * (k + 1); samples <= 400 * (k + 1) * 64; samples *= 4) {
    const roots: number[] = [];
    const step = rhoMax / samples;
    let prev = f(0);
    for (let i = 1; i <= samples; i++) {
      const x = i * step;
      const v = f(x);
      if (v === 0) roots.push(x);
      else if (prev !== 0 && prev < 0 !== v < 0) roots.push(bisect(f, x - step, x));
      prev = v;
    }
    if (roots.length === k) return roots.map((rho) => ((rho * n) / (2 * Z)) as Bohr);
  }
  throw new Error(`radialNodes: could not isolate ${k} zeros for n=${n}, l=${l}`);
}

/**
 * Most probable radius: global maximum of P(r) = r² R_nl². With F = rho^{l+1} e^{-rho/2} L(rho), extrema of F²
 * are zeros of F'/(rho^l e^{-rho/2}) = (l+1-rho/2) L + rho L' (L' = -L_{k-1}^{alpha+1}); the largest sampled
 * lobe is bracketed and refined by bisection. For l = n-1 this gives n²/Z.
 */
export function mostProbableRadius(n: number, l: number, Z: number): Bohr {
  checkNl(n, l, Z);
  const k = n - l - 1;
  const a = 2 * l + 1;
  const u = (rho: number) => {
    const L = genLaguerre(k, a, rho);
    return pow(rho, 2 * l + 2) * L * L * exp(-rho);
  };
  const h = (rho: number) => (l + 1 - rho / 2) * genLaguerre(k, a, rho) - (k > 0 ? rho * genLaguerre(k - 1, a + 1, rho) : 0);
  const rhoMax = 4 * k + 2 * a + 20;
  const samples = 4000;
  const step = rhoMax / samples;
  let best = 1;
  let bestV = -1;
  for (let i = 1; i < samples; i++) {
    const v = u(i * step);
    if (v > bestV) {
      bestV = v;
      best = i;
    }
  }
  const rho = bisect(h, (best - 1) * step, (best + 1) * step);
  return ((rho * n) / (2 * Z)) as Bohr;
}

/** <r> = (a0 / 2Z) [3n² − l(l+1)] (Bethe & Salpeter, Quantum Mechanics of One- and Two-Electron Atoms, §3, eq. 3.26; equation number from memory). */
export function meanRadius(n: number, l: number, Z: number): Bohr {
  checkNl(n, l, Z);
  return ((3 * n * n - l * (l + 1)) / (2 * Z)) as Bohr;
}

/** <r> by Gauss–Laguerre quadrature of r · r² R_nl² (independent of the closed form; exact for this degree). */
export function meanRadiusNumeric(n: number, l: number, Z: number): Bohr {
  checkNl(n, l, Z);
  const { nodes, weights } = gaussLaguerreRule(GL_POINTS);
  const lnC = logFactorial(n - l - 1) - logFactorial(n + l) - Math.log(2 * n);
  const k = n - l - 1;
  const a = 2 * l + 1;
  let s = 0;
  for (let i = 0; i < nodes.length; i++) {
    const rho = nodes[i];
    const L = genLaguerre(k, a, rho);
    s += weights[i] * exp(lnC + (2 * l + 3) * Math.log(rho)) * L * L;
  }
  return ((s * n) / (2 * Z)) as Bohr;
}

/**
 * Outer classical turning point: root of E_n = -Z²/(2n²) = -Z/r + l(l+1)/(2r²), i.e.
 * r = (n²/Z) (1 + sqrt(1 - l(l+1)/n²)); for l = 0, r = 2n²/Z.
 */
export function classicalTurningPoint(n: number, l: number, Z: number): Bohr {
  checkNl(n, l, Z);
  return (((n * n) / Z) * (1 + sqrt(1 - (l * (l + 1)) / (n * n)))) as Bohr;
}

/** Inner classical turning point (0 for l = 0). */
export function innerTurningPoint(n: number, l: number, Z: number): Bohr {
  checkNl(n, l, Z);
  return (((n * n) / Z) * (1 - sqrt(1 - (l * (l + 1)) / (n * n)))) as Bohr;
}

/**
 * 1s enclosing sphere: P(r < rho/Z) = 1 - e^{-2 rho}(1 + 2 rho + 2 rho²) (integral of 4 r² e^{-2r}; Z = 1,
 * radii scale as 1/Z). Solved by bisection (the left side increases monotonically).
 */
export function oneSEnclosingRadius(fraction: number, Z = 1): Bohr {
  assertZ(Z);
  if (!(fraction > 0 && fraction < 1)) throw new RangeError(`fraction must be between 0 and 1 (exclusive), got ${String(fraction)}`);
  const g = (p: number) => 1 - exp(-2 * p) * (1 + 2 * p + 2 * p * p) - fraction;
  let hi = 1;
  while (g(hi) < 0) hi *= 2;
  return (bisect(g, 0, hi) / Z) as Bohr;
}

/** psi on the 1s enclosing sphere: R_10(rho)/sqrt(4 pi) = 2 Z^{3/2} e^{-Z r} / sqrt(4 pi). */
export function oneSEnclosingIsovalue(fraction: number, Z = 1): number {
  const r = oneSEnclosingRadius(fraction, Z);
  return (2 * pow(Z, 1.5) * exp(-Z * r)) / sqrt(4 * PI);
}

// ---------------------------------------------------------------------------------------------
// Enclosed-probability threshold on a sampled density

let littleEndian: boolean | null = null;
function isLittleEndian(): boolean {
  if (littleEndian === null) littleEndian = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;
  return littleEndian;
}

function badValue(density: Float32Array | Float64Array, i: number): never {
  throw new RangeError(`density[${i}] = ${density[i]} is negative or not finite; pass |psi|² (non-negative, finite) values`);
}

/**
 * Threshold t with sum_{rho >= t} rho / sum rho ≈ fraction, i.e. the isovalue of |psi|² whose surface
 * encloses that probability. Exact on the data: t is the value v_k (values sorted descending) where the
 * running sum first reaches fraction * total.
 * Sort-free O(N) radix selection: non-negative IEEE floats order like their bit patterns, so
 * pass 1 builds a histogram of value sums over the top 16 bits (sign, exponent, 7 mantissa bits for Float32),
 * finds the bucket where the running sum from the top crosses the target, and pass 2 histograms that bucket
 * over the remaining 16 bits, which identifies the exact value (Float64 input: four 16-bit levels).
 * voxelVolume multiplies numerator and denominator alike, so it does not change t; it is accepted for
 * call-site clarity and validated only.
 */
export function enclosedThreshold(density: Float32Array | Float64Array, fraction: number, voxelVolume = 1): number {
  if (!(fraction > 0 && fraction <= 1)) throw new RangeError(`fraction must be in (0, 1], got ${String(fraction)}`);
  if (!(voxelVolume > 0) || !Number.isFinite(voxelVolume)) throw new RangeError(`voxelVolume must be a positive number, got ${String(voxelVolume)}`);
  if (density.length === 0) throw new RangeError('density is empty');
  return density instanceof Float32Array ? threshold32(density, fraction) : threshold64(density, fraction);
}

function threshold32(density: Float32Array, fraction: number): number {
  const bits = new Uint32Array(density.buffer, density.byteOffset, density.length);
  const N = density.length;
  const hist = new Float64Array(1 << 15);
  let total = 0;
  let minPos = Infinity;
  for (let i = 0; i < N; i++) {
    const b = bits[i];
    if (b >= 0x7f800000) {
      if (b === 0x80000000) continue; // -0
      badValue(density, i);
    }
    const v = density[i];
    total += v;
    hist[b >>> 16] += v;
    if (v > 0 && v < minPos) minPos = v;
  }
  if (!(total > 0)) throw new RangeError('density is zero everywhere; no enclosed-probability threshold exists');
  const target = fraction * total;
  if (fraction === 1) return minPos;
  let acc = 0;
  let bucket = -1;
  let reached = false;
  for (let j = hist.length - 1; j >= 0; j--) {
    if (hist[j] === 0) continue;
    bucket = j;
    if (acc + hist[j] >= target) {
      reached = true;
      break;
    }
    acc += hist[j];
  }
  if (bucket < 0) return minPos;
  // Round-off (bucket sums vs total summed in another order) can leave the target unreached: use the lowest bucket.
  if (!reached) acc -= hist[bucket];
  const sub = new Float64Array(1 << 16);
  for (let i = 0; i < N; i++) {
    const b = bits[i];
    if (b >>> 16 === bucket) sub[b & 0xffff] += density[i];
  }
  const scratch = new Uint32Array(1);
  const asFloat = new Float32Array(scratch.buffer);
  let lastNonEmpty = -1;
  for (let j = sub.length - 1; j >= 0; j--) {
    if (sub[j] === 0) continue;
    lastNonEmpty = j;
    acc += sub[j];
    if (acc >= target) break;
  }
  if (lastNonEmpty < 0) return minPos;
  scratch[0] = ((bucket << 16) | lastNonEmpty) >>> 0;
  return asFloat[0];
}

function threshold64(density: Float64Array, fraction: number): number {
  const words = new Uint32Array(density.buffer, density.byteOffset, density.length * 2);
  const hiOff = isLittleEndian() ? 1 : 0;
  const N = density.length;
  let total = 0;
  let minPos = Infinity;
  for (let i = 0; i < N; i++) {
    const v = density[i];
    if (!(v >= 0) || v === Infinity) badValue(density, i);
    total += v;
    if (v > 0 && v < minPos) minPos = v;
  }
  if (!(total > 0)) throw new RangeError('density is zero everywhere; no enclosed-probability threshold exists');
  if (fraction === 1) return minPos;
  const target = fraction * total;
  // digit d of the 64-bit pattern, d = 0 (top 16 bits) .. 3
  const digit = (i: number, d: number): number => {
    const w = words[2 * i + (d < 2 ? hiOff : 1 - hiOff)];
    return d % 2 === 0 ? w >>> 16 : w & 0xffff;
  };
  const prefix: number[] = [];
  let acc = 0;
  const hist = new Float64Array(1 << 16);
  for (let d = 0; d < 4; d++) {
    hist.fill(0);
    for (let i = 0; i < N; i++) {
      let match = true;
      for (let q = 0; q < d; q++) {
        if (digit(i, q) !== prefix[q]) {
          match = false;
          break;
        }
      }
      if (match) hist[digit(i, d)] += density[i];
    }
    let chosen = -1;
    let reached = false;
    for (let j = hist.length - 1; j >= 0; j--) {
      if (hist[j] === 0) continue;
      chosen = j;
      if (acc + hist[j] >= target) {
        reached = true;
        break;
      }
      acc += hist[j];
    }
    if (chosen < 0) return minPos;
    if (!reached) acc -= hist[chosen];
    prefix.push(chosen);
  }
  const out = new Uint32Array(2);
  out[hiOff] = ((prefix[0] << 16) | prefix[1]) >>> 0;
  out[1 - hiOff] = ((prefix[2] << 16) | prefix[3]) >>> 0;
  return new Float64Array(out.buffer)[0];
}

/** Fraction of the total carried by values >= t: sum_{rho >= t} rho / sum rho. */
export function enclosedFractionAt(density: Float32Array | Float64Array, t: number): number {
  let total = 0;
  let above = 0;
  for (let i = 0; i < density.length; i++) {
    const v = density[i];
    if (!(v >= 0) || v === Infinity) badValue(density, i);
    total += v;
    if (v >= t) above += v;
  }
  if (!(total > 0)) throw new RangeError('density is zero everywhere');
  return above / total;
}
