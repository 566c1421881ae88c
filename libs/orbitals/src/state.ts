import { assertZ, validateQuantumNumbers, validateZ } from './quantum';

const { SQRT1_2, abs, hypot, max, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/**
 * One term c * R_nl * Y of a superposition. basis 'complex': Y = Y_lm (Condon–Shortley);
 * basis 'real': Y = real form (m > 0 cos type, m < 0 sin type, m = 0 Y_l0; see realY).
 * The coefficient c = re + i im may be complex in either basis.
 */
export interface Term {
  n: number;
  l: number;
  m: number;
  basis: 'complex' | 'real';
  re: number;
  im: number;
}

export interface OrbitalState {
  Z: number;
  terms: Term[];
}

const INV_SQRT2 = SQRT1_2;

/** Returns a readable error naming the bad field, or null. */
export function validateState(state: OrbitalState): string | null {
  if (!state || typeof state !== 'object') return 'state must be an object with Z and terms';
  const ze = validateZ(state.Z);
  if (ze) return ze;
  if (!Array.isArray(state.terms) || state.terms.length === 0) return 'terms must be a non-empty array';
  for (let i = 0; i < state.terms.length; i++) {
    const t = state.terms[i];
    const qe = validateQuantumNumbers(t.n, t.l, t.m);
    if (qe) return `terms[${i}]: ${qe}`;
    if (t.basis !== 'complex' && t.basis !== 'real') return `terms[${i}]: basis must be 'complex' or 'real', got ${String(t.basis)}`;
    if (!Number.isFinite(t.re) || !Number.isFinite(t.im)) return `terms[${i}]: coefficient (re, im) must be finite numbers`;
  }
  return null;
}

export function assertState(state: OrbitalState): void {
  const e = validateState(state);
  if (e) throw new RangeError(e);
}

/** A single-term state; complex: Y_lm basis, otherwise the real form with the same m. */
export function stateFromNlm(n: number, l: number, m: number, opts: { complex?: boolean; Z?: number } = {}): OrbitalState {
  const err = validateQuantumNumbers(n, l, m);
  if (err) throw new RangeError(err);
  const Z = opts.Z ?? 1;
  assertZ(Z);
  return { Z, terms: [{ n, l, m, basis: opts.complex ? 'complex' : 'real', re: 1, im: 0 }] };
}

function termKey(n: number, l: number, m: number): number {
  return (n * 32 + l) * 64 + (m + 32);
}

/**
 * Rewrites every term in the complex Y_lm basis and merges equal (n, l, m); the result is a list over
 * orthonormal functions. Real forms (see realY):
 *   m > 0: Y^c = (-1)^m/sqrt2 Y_m + 1/sqrt2 Y_-m;   m < 0 (mu = |m|): Y^s = -i(-1)^mu/sqrt2 Y_mu + i/sqrt2 Y_-mu.
 * Coefficients whose modulus falls below 1e-15 of the largest are dropped (round-off from cancellation).
 */
export function toComplexBasis(state: OrbitalState): OrbitalState {
  assertState(state);
  const acc = new Map<number, Term>();
  const add = (n: number, l: number, m: number, re: number, im: number) => {
    const k = termKey(n, l, m);
    const t = acc.get(k);
    if (t) {
      t.re += re;
      t.im += im;
    } else acc.set(k, { n, l, m, basis: 'complex', re, im });
  };
  for (const t of state.terms) {
    if (t.basis === 'complex' || t.m === 0) add(t.n, t.l, t.m, t.re, t.im);
    else if (t.m > 0) {
      const s = t.m % 2 === 0 ? 1 : -1;
      add(t.n, t.l, t.m, s * t.re * INV_SQRT2, s * t.im * INV_SQRT2);
      add(t.n, t.l, -t.m, t.re * INV_SQRT2, t.im * INV_SQRT2);
    } else {
      const mu = -t.m;
      const s = mu % 2 === 0 ? 1 : -1;
      // c * (-i s / sqrt2) for +mu, c * (i / sqrt2) for -mu; i (re + i im) = -im + i re
      add(t.n, t.l, mu, s * t.im * INV_SQRT2, -s * t.re * INV_SQRT2);
      add(t.n, t.l, -mu, -t.im * INV_SQRT2, t.re * INV_SQRT2);
    }
  }
  const terms = [...acc.values()];
  let maxAbs = 0;
  for (const t of terms) maxAbs = max(maxAbs, hypot(t.re, t.im));
  const kept = terms.filter((t) => hypot(t.re, t.im) > 1e-15 * maxAbs);
  kept.sort((p, q) => termKey(p.n, p.l, p.m) - termKey(q.n, q.l, q.m));
  return { Z: state.Z, terms: kept };
}

/**
 * Rewrites a state in the real basis (inverse of the map in toComplexBasis):
 *   c^c_mu = (c_-mu + (-1)^mu c_mu)/sqrt2,  c^s_mu = -i (c_-mu - (-1)^mu c_mu)/sqrt2.
 */
export function toRealBasis(state: OrbitalState): OrbitalState {
  const cx = toComplexBasis(state);
  const get = (n: number, l: number, m: number) => cx.terms.find((t) => t.n === n && t.l === l && t.m === m);
  const out: Term[] = [];
  const seen = new Set<number>();
  for (const t of cx.terms) {
    const mu = abs(t.m);
    const k = termKey(t.n, t.l, mu);
    if (seen.has(k)) continue;
    seen.add(k);
    if (mu === 0) {
      out.push({ ...t, basis: 'real' });
      continue;
    }
    const p = get(t.n, t.l, mu) ?? { re: 0, im: 0 };
    const q = get(t.n, t.l, -mu) ?? { re: 0, im: 0 };
    const s = mu % 2 === 0 ? 1 : -1;
    const cre = (q.re + s * p.re) * INV_SQRT2;
    const cim = (q.im + s * p.im) * INV_SQRT2;
    const dre = q.re - s * p.re;
    const dim = q.im - s * p.im;
    // -i (dre + i dim) = dim - i dre
    const sre = dim * INV_SQRT2;
    const sim = -dre * INV_SQRT2;
    if (cre !== 0 || cim !== 0) out.push({ n: t.n, l: t.l, m: mu, basis: 'real', re: cre, im: cim });
    if (sre !== 0 || sim !== 0) out.push({ n: t.n, l: t.l, m: -mu, basis: 'real', re: sre, im: sim });
  }
  return { Z: cx.Z, terms: out };
}

/** Sum of |c|^2 over the orthonormal (complex-basis) expansion. */
export function stateNormSquared(state: OrbitalState): number {
  let s = 0;
  for (const t of toComplexBasis(state).terms) s += t.re * t.re + t.im * t.im;
  return s;
}

/** Scales every coefficient so that the state has unit norm; the terms keep their basis and order. */
export function normaliseState(state: OrbitalState): OrbitalState {
  const n2 = stateNormSquared(state);
  if (!(n2 > 0) || !Number.isFinite(n2)) throw new RangeError('state has zero norm: all coefficients cancel or are zero');
  const f = 1 / sqrt(n2);
  return { Z: state.Z, terms: state.terms.map((t) => ({ ...t, re: t.re * f, im: t.im * f })) };
}

/**
 * psi is real-valued everywhere iff, in the complex basis, c_{n,l,-m} = (-1)^m conj(c_{n,l,m})
 * for every (n, l, m) (follows from Y_{l,-m} = (-1)^m conj Y_lm). Tolerance is relative to the largest |c|.
 */
export function isRealState(state: OrbitalState, tol = 1e-12): boolean {
  const cx = toComplexBasis(state);
  let maxAbs = 0;
  const map = new Map<number, Term>();
  for (const t of cx.terms) {
    maxAbs = max(maxAbs, hypot(t.re, t.im));
    map.set(termKey(t.n, t.l, t.m), t);
  }
  const eps = tol * maxAbs;
  for (const t of cx.terms) {
    const o = map.get(termKey(t.n, t.l, -t.m));
    const ore = o ? o.re : 0;
    const oim = o ? o.im : 0;
    const s = abs(t.m) % 2 === 0 ? 1 : -1;
    if (abs(ore - s * t.re) > eps || abs(oim + s * t.im) > eps) return false;
  }
  return true;
}
