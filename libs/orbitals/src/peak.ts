// The largest |psi|² over all space, as a figure states it ("largest |psi| over all space") and as the level
// solvers use it (the top of the bracket the level is searched in).
//
// The solvers meet |psi|² only on their nodes (a direction grid times the radial peaks, or quadrature directions
// times quadrature radii), and the best node is a lower bound of the maximum: a superposition's sampled maximum was
// measured up to a few parts in a thousand low. So each of the best nodes is climbed to the local maximum near it
// by steepest ascent on the analytic gradient with an adaptive step: the step doubles after a move that raised
// |psi|² and halves after one that did not (a safeguarded pattern search along the gradient; see J. Nocedal,
// S. J. Wright, "Numerical Optimization", 2nd ed., Springer 2006, ch. 3 on step-length control). The climb stops
// when the step is below 1e-12 of the point's distance from the nucleus (plus 1e-12 a0), so the value returned is
// |psi|² at a stationary point to about float64 precision (the error of a maximum goes with the step squared).
// At a cusp (the nucleus of an s state) the gradient is undefined; the climb simply finds no higher point there.

import type { CompiledState } from './compile';

const { abs, hypot } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/** Where a climb ended and |psi|² there. */
export interface DensityPeak {
  density: number;
  x: number;
  y: number;
  z: number;
}

const MAX_STEPS = 2000;

/**
 * Climbs |psi|² from (x, y, z) to the local maximum near it (see the file comment). step0: the first step (a0), about
 * the spacing of the nodes the start came from. Never returns less than the start's density.
 */
export function climbDensity(compiled: CompiledState, x: number, y: number, z: number, step0: number): DensityPeak {
  if (!(step0 > 0) || !Number.isFinite(step0)) throw new RangeError(`step0 must be a positive length in a0 (got ${String(step0)})`);
  const w = new Float64Array(8);
  compiled.gradient(x, y, z, w);
  let f = w[6] * w[6] + w[7] * w[7];
  // grad |psi|² = 2 (Re psi grad Re psi + Im psi grad Im psi); only its direction is used.
  let gx = w[6] * w[0] + w[7] * w[3];
  let gy = w[6] * w[1] + w[7] * w[4];
  let gz = w[6] * w[2] + w[7] * w[5];
  let step = step0;
  for (let it = 0; it < MAX_STEPS; it++) {
    const gl = hypot(gx, gy, gz);
    if (!(gl > 0) || !Number.isFinite(gl)) break;
    if (step < 1e-12 * (1 + abs(x) + abs(y) + abs(z))) break;
    const nx = x + (step * gx) / gl, ny = y + (step * gy) / gl, nz = z + (step * gz) / gl;
    compiled.gradient(nx, ny, nz, w);
    const fn = w[6] * w[6] + w[7] * w[7];
    if (fn > f && Number.isFinite(fn)) {
      x = nx;
      y = ny;
      z = nz;
      f = fn;
      gx = w[6] * w[0] + w[7] * w[3];
      gy = w[6] * w[1] + w[7] * w[4];
      gz = w[6] * w[2] + w[7] * w[5];
      step *= 2;
    } else step *= 0.5;
  }
  return { density: f, x, y, z };
}

/**
 * The largest |psi|² reached by climbing from each start (xyz triples, the best nodes of a solver) and the best
 * sampled value `sampled` (a lower bound the climbs can only raise). step0 as in climbDensity, per start.
 */
export function peakDensity(compiled: CompiledState, starts: ArrayLike<number>, steps: ArrayLike<number>, sampled: number): number {
  let best = sampled;
  for (let s = 0; 3 * s + 2 < starts.length; s++) {
    const d = climbDensity(compiled, starts[3 * s], starts[3 * s + 1], starts[3 * s + 2], steps[s]).density;
    if (d > best) best = d; // a NaN (a start at a singular point) is never taken
  }
  return best;
}
