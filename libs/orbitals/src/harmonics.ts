import { binomial, factorial, logFactorial } from './factorial';

const { PI, SQRT2, abs, cos, exp, pow, sin, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export interface Complex {
  re: number;
  im: number;
}

/**
 * Associated Legendre function P_l^m(x), m >= 0, WITH the Condon–Shortley phase (-1)^m
 * (DLMF 14.7.10 / Arfken), by the standard upward recurrence in l (Numerical Recipes 3rd ed. §6.7):
 *   P_m^m = (-1)^m (2m-1)!! (1-x^2)^{m/2},  P_{m+1}^m = x (2m+1) P_m^m,
 *   (l-m) P_l^m = x (2l-1) P_{l-1}^m - (l+m-1) P_{l-2}^m.
 */
export function assocLegendre(l: number, m: number, x: number): number {
  if (m < 0 || m > l) throw new RangeError(`assocLegendre needs 0 <= m <= l, got l=${l}, m=${m}`);
  let pmm = 1;
  if (m > 0) {
    const s = sqrt((1 - x) * (1 + x));
    let fact = 1;
    for (let i = 1; i <= m; i++) {
      pmm *= -fact * s;
      fact += 2;
    }
  }
  if (l === m) return pmm;
  let pmmp1 = x * (2 * m + 1) * pmm;
  if (l === m + 1) return pmmp1;
  let pll = 0;
  for (let ll = m + 2; ll <= l; ll++) {
    pll = (x * (2 * ll - 1) * pmmp1 - (ll + m - 1) * pmm) / (ll - m);
    pmm = pmmp1;
    pmmp1 = pll;
  }
  return pll;
}

function harmonicNorm(l: number, absM: number): number {
  return sqrt(((2 * l + 1) / (4 * PI)) * exp(logFactorial(l - absM) - logFactorial(l + absM)));
}

/**
 * Complex spherical harmonic with the Condon–Shortley phase (the convention of SciPy's sph_harm,
 * Griffiths eq. 4.32 and Arfken):  Y_lm(theta, phi) = K_lm P_l^m(cos theta) e^{i m phi},
 * Y_{l,-m} = (-1)^m conj(Y_lm).  theta is the polar angle from +z, phi the azimuth from +x.
 */
export function sphericalY(l: number, m: number, theta: number, phi: number): Complex {
  const am = abs(m);
  const v = harmonicNorm(l, am) * assocLegendre(l, am, cos(theta));
  let re = v * cos(am * phi);
  let im = v * sin(am * phi);
  if (m < 0) {
    const s = am % 2 === 0 ? 1 : -1;
    re = s * re;
    im = -s * im;
  }
  return { re, im };
}

/**
 * Real spherical harmonics (chemists' real forms), for m > 0 the cos type, m < 0 the sin type:
 *   Y^c_{l|m|} = (Y_{l,-|m|} + (-1)^m Y_{l|m|}) / sqrt2       = sqrt2 (-1)^m Re Y_{l|m|}   (m > 0)
 *   Y^s_{l|m|} = i (Y_{l,-|m|} - (-1)^m Y_{l|m|}) / sqrt2     = sqrt2 (-1)^m Im Y_{l|m|}   (m < 0)
 *   m = 0: Y_l0.
 * With the Condon–Shortley phase this gives p_x ∝ +x, p_y ∝ +y, d_xy ∝ +xy, d_x²−y² ∝ +(x²−y²)
 * (common practice; checked in the tests).
 */
export function realY(l: number, m: number, theta: number, phi: number): number {
  if (m === 0) return sphericalY(l, 0, theta, phi).re;
  const am = abs(m);
  const y = sphericalY(l, am, theta, phi);
  const s = am % 2 === 0 ? SQRT2 : -SQRT2;
  return m > 0 ? s * y.re : s * y.im;
}

/** A homogeneous polynomial in x, y, z with complex coefficients: monomial x^a y^b z^c. */
export interface Monomial {
  a: number;
  b: number;
  c: number;
  re: number;
  im: number;
}

const key = (a: number, b: number, c: number): number => (a << 10) | (b << 5) | c;

class PolyBuilder {
  readonly map = new Map<number, Monomial>();
  add(a: number, b: number, c: number, re: number, im: number): void {
    const k = key(a, b, c);
    const t = this.map.get(k);
    if (t) {
      t.re += re;
      t.im += im;
    } else this.map.set(k, { a, b, c, re, im });
  }
  list(): Monomial[] {
    const out = [...this.map.values()].filter((t) => t.re !== 0 || t.im !== 0);
    out.sort((p, q) => key(q.a, q.b, q.c) - key(p.a, p.b, p.c));
    return out;
  }
}

const solidCache = new Map<number, Monomial[]>();

/**
 * Regular solid harmonic r^l Y_lm as a polynomial in x, y, z (complex coefficients, CS phase).
 * From P_l^m(t) = (-1)^m (1-t^2)^{m/2} d^m P_l/dt^m and r sin(theta) e^{i phi} = x + iy:
 *   r^l Y_lm = K_lm (-1)^m (x+iy)^m  sum_j d_j z^j (x^2+y^2+z^2)^{(l-m-j)/2},
 * where d_j are the coefficients of d^m P_l / dt^m and P_l(t) = 2^-l sum_k (-1)^k C(l,k) C(2l-2k,l) t^{l-2k}
 * (Rodrigues' formula expanded; Abramowitz & Stegun 22.3.8).
 */
export function solidHarmonic(l: number, m: number): Monomial[] {
  const ck = l * 64 + (m + 32);
  const hit = solidCache.get(ck);
  if (hit) return hit;
  const am = abs(m);
  const K = harmonicNorm(l, am) * (am % 2 === 0 ? 1 : -1);
  const pb = new PolyBuilder();
  // (x + i y)^am = sum_s C(am,s) x^{am-s} i^s y^s
  for (let s = 0; s <= am; s++) {
    const bc = binomial(am, s);
    const iRe = [1, 0, -1, 0][s % 4];
    const iIm = [0, 1, 0, -1][s % 4];
    for (let k = 0; 2 * k <= l; k++) {
      const p = l - 2 * k;
      if (p < am) continue;
      const legCoef = (pow(2, -l) * (k % 2 === 0 ? 1 : -1) * binomial(l, k) * binomial(2 * l - 2 * k, l) * factorial(p)) / factorial(p - am);
      const j = p - am; // power of z
      const q = k; // power of r^2 = (l - am - j) / 2
      // (x^2+y^2+z^2)^q = sum q!/(u! v! w!) x^{2u} y^{2v} z^{2w}
      for (let u = 0; u <= q; u++) {
        for (let v = 0; u + v <= q; v++) {
          const w = q - u - v;
          const multi = factorial(q) / (factorial(u) * factorial(v) * factorial(w));
          const c = K * bc * legCoef * multi;
          pb.add(am - s + 2 * u, s + 2 * v, j + 2 * w, c * iRe, c * iIm);
        }
      }
    }
  }
  let list = pb.list();
  if (m < 0) {
    // Y_{l,-m} = (-1)^m conj(Y_lm); the polynomial's variables are real, so conjugate the coefficients.
    const s = am % 2 === 0 ? 1 : -1;
    list = list.map((t) => ({ ...t, re: s * t.re, im: -s * t.im }));
  }
  solidCache.set(ck, list);
  return list;
}

/** Real solid harmonic r^l Y^{c/s}_{lm} as a real polynomial (same conventions as realY). */
export function realSolidHarmonic(l: number, m: number): Monomial[] {
  if (m === 0) return solidHarmonic(l, 0).map((t) => ({ ...t, im: 0 }));
  const am = abs(m);
  const s = am % 2 === 0 ? SQRT2 : -SQRT2;
  return solidHarmonic(l, am)
    .map((t) => ({ a: t.a, b: t.b, c: t.c, re: s * (m > 0 ? t.re : t.im), im: 0 }))
    .filter((t) => abs(t.re) > 1e-14);
}

/** Evaluates a monomial list at (x, y, z). */
export function evalPoly(poly: readonly Monomial[], x: number, y: number, z: number): Complex {
  let re = 0;
  let im = 0;
  for (const t of poly) {
    const v = pow(x, t.a) * pow(y, t.b) * pow(z, t.c);
    re += t.re * v;
    im += t.im * v;
  }
  return { re, im };
}
