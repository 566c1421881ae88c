import { logFactorial } from './factorial';
import { genLaguerre } from './laguerre';
import { assertQuantumNumbers, assertZ } from './quantum';

const { exp, pow, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/**
 * Hydrogen-like radial function in atomic units (Griffiths, Introduction to QM 2nd ed., eq. 4.89;
 * Bethe & Salpeter §3):
 *   R_nl(r) = N_nl rho^l e^{-rho/2} L_{n-l-1}^{2l+1}(rho),   rho = 2 Z r / n,
 *   N_nl = sqrt( (2Z/n)^3 (n-l-1)! / (2n (n+l)!) ).
 * Sign convention: R_nl > 0 near the nucleus.
 */
export function radialNorm(n: number, l: number, Z: number): number {
  const c = (2 * Z) / n;
  return sqrt(c * c * c / (2 * n)) * exp(0.5 * (logFactorial(n - l - 1) - logFactorial(n + l)));
}

export function radialR(n: number, l: number, Z: number, r: number): number {
  assertQuantumNumbers(n, l, 0);
  assertZ(Z);
  const rho = (2 * Z * r) / n;
  return radialNorm(n, l, Z) * pow(rho, l) * exp(-rho / 2) * genLaguerre(n - l - 1, 2 * l + 1, rho);
}

/** Radial distribution P(r) = r^2 R_nl(r)^2 (probability per unit radius). */
export function radialDistribution(n: number, l: number, Z: number, r: number): number {
  const R = radialR(n, l, Z, r);
  return r * r * R * R;
}

/**
 * Constants for the Cartesian route: R_nl(r) / r^l = scale * e^{-kappa r} * L_k^alpha(rhoFactor r)
 * with scale = N_nl (2Z/n)^l, kappa = Z/n, rhoFactor = 2Z/n, k = n-l-1, alpha = 2l+1.
 */
export interface RadialConstants {
  n: number;
  l: number;
  k: number;
  alpha: number;
  scale: number;
  kappa: number;
  rhoFactor: number;
}

export function radialConstants(n: number, l: number, Z: number): RadialConstants {
  const rhoFactor = (2 * Z) / n;
  return {
    n,
    l,
    k: n - l - 1,
    alpha: 2 * l + 1,
    scale: radialNorm(n, l, Z) * pow(rhoFactor, l),
    kappa: Z / n,
    rhoFactor,
  };
}

/**
 * R_nl(r) and dR/dr without argument checks, for inner loops (callers validate n, l, Z once):
 * with rho = 2Zr/n, R = N rho^l e^{-rho/2} L(rho) and dR/dr = (2Z/n) N e^{-rho/2} rho^{l-1} [(l - rho/2) L + rho L'],
 * L' = -L_{k-1}^{alpha+1} (DLMF 18.9.23).
 */
export function radialValueAndSlope(c: RadialConstants, norm: number, r: number): { R: number; dR: number } {
  const rho = c.rhoFactor * r;
  const e = exp(-rho / 2);
  const L = genLaguerre(c.k, c.alpha, rho);
  const dL = c.k === 0 ? 0 : -genLaguerre(c.k - 1, c.alpha + 1, rho);
  const rl = c.l === 0 ? 1 : pow(rho, c.l);
  const R = norm * rl * e * L;
  // rho^{l-1} [(l - rho/2) L + rho L'] written as rho^l [(l/rho - 1/2) L + L'] avoids rho^{-1} at l = 0.
  const inner = (c.l === 0 ? -0.5 * L : (c.l / rho - 0.5) * L) + dL;
  const dR = rho === 0 && c.l > 0 ? (c.l === 1 ? c.rhoFactor * norm * L : 0) : c.rhoFactor * norm * rl * e * inner;
  return { R, dR };
}
