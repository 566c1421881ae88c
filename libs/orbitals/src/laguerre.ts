const { PI, abs, cos, floor } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/**
 * Generalised (associated) Laguerre polynomials L_k^alpha(x) in the modern convention
 * (Abramowitz & Stegun 22.2.12 / DLMF 18.5.12: L_k^alpha(0) = C(k+alpha, k)), the one SciPy's
 * eval_genlaguerre and Griffiths' Introduction to QM (2nd ed., eq. 4.88) use.
 */

/**
 * Three-term recurrence (DLMF 18.9.13):
 *   (k+1) L_{k+1} = (2k+1+alpha-x) L_k - (k+alpha) L_{k-1},  L_0 = 1, L_1 = 1+alpha-x.
 * Stable in the forward direction for the small k (<= 11) used here.
 */
export function genLaguerre(k: number, alpha: number, x: number): number {
  if (!Number.isInteger(k) || k < 0) throw new RangeError(`genLaguerre: k must be a non-negative integer, got ${k}`);
  if (k === 0) return 1;
  let prev = 1;
  let cur = 1 + alpha - x;
  for (let j = 1; j < k; j++) {
    const next = ((2 * j + 1 + alpha - x) * cur - (j + alpha) * prev) / (j + 1);
    prev = cur;
    cur = next;
  }
  return cur;
}

/** d/dx L_k^alpha(x) = -L_{k-1}^{alpha+1}(x) (DLMF 18.9.23). */
export function genLaguerreDerivative(k: number, alpha: number, x: number): number {
  return k === 0 ? 0 : -genLaguerre(k - 1, alpha + 1, x);
}

export interface QuadratureRule {
  readonly nodes: Float64Array;
  readonly weights: Float64Array;
}

const laguerreRules = new Map<number, QuadratureRule>();

/**
 * Gauss–Laguerre rule (weight e^{-x} on [0, inf)), exact for polynomials of degree <= 2m-1.
 * Nodes by Newton's method from the asymptotic starting guesses of Numerical Recipes (Press et al.,
 * 3rd ed., §4.6, routine gaulag); weights w_i = -1 / (m L_m'(x_i) L_{m-1}(x_i)).
 */
export function gaussLaguerreRule(m: number): QuadratureRule {
  const cached = laguerreRules.get(m);
  if (cached) return cached;
  const x = new Float64Array(m);
  const w = new Float64Array(m);
  let z = 0;
  for (let i = 0; i < m; i++) {
    if (i === 0) z = 3 / (1 + 2.4 * m);
    else if (i === 1) z += 15 / (1 + 2.5 * m);
    else {
      const ai = i - 1;
      z += ((1 + 2.55 * ai) / (1.9 * ai)) * (z - x[i - 2]);
    }
    let p1: number;
    let p2 = 0;
    let pp = 0;
    for (let iter = 0; iter < 200; iter++) {
      p1 = 1;
      p2 = 0;
      for (let j = 1; j <= m; j++) {
        const p3 = p2;
        p2 = p1;
        p1 = ((2 * j - 1 - z) * p2 - (j - 1) * p3) / j;
      }
      pp = (m * p1 - m * p2) / z;
      const z1 = z;
      z = z1 - p1 / pp;
      if (abs(z - z1) <= 1e-15 * abs(z)) break;
    }
    x[i] = z;
    w[i] = -1 / (pp * m * p2);
  }
  const rule = { nodes: x, weights: w };
  laguerreRules.set(m, rule);
  return rule;
}

const legendreRules = new Map<number, QuadratureRule>();

/** Gauss–Legendre rule on [-1, 1] by Newton's method (Numerical Recipes 3rd ed., §4.6, gauleg). */
export function gaussLegendreRule(m: number): QuadratureRule {
  const cached = legendreRules.get(m);
  if (cached) return cached;
  const x = new Float64Array(m);
  const w = new Float64Array(m);
  const half = floor((m + 1) / 2);
  for (let i = 0; i < half; i++) {
    let z = cos((PI * (i + 0.75)) / (m + 0.5));
    let pp = 0;
    for (let iter = 0; iter < 100; iter++) {
      let p1 = 1;
      let p2 = 0;
      for (let j = 1; j <= m; j++) {
        const p3 = p2;
        p2 = p1;
        p1 = ((2 * j - 1) * z * p2 - (j - 1) * p3) / j;
      }
      pp = (m * (z * p1 - p2)) / (z * z - 1);
      const z1 = z;
      z = z1 - p1 / pp;
      if (abs(z - z1) <= 1e-16) break;
    }
    x[i] = -z;
    x[m - 1 - i] = z;
    w[i] = 2 / ((1 - z * z) * pp * pp);
    w[m - 1 - i] = w[i];
  }
  const rule = { nodes: x, weights: w };
  legendreRules.set(m, rule);
  return rule;
}
