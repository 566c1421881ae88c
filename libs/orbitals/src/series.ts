import { radialR } from './radial';
import { classicalTurningPoint, radialNodes, radiusForProbability } from './probability';
import { Bohr } from './units';

const { ceil, max } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export interface RadialSeries {
  n: number;
  l: number;
  Z: number;
  rMax: Bohr;
  /** Sample radii, 0..rMax inclusive (Bohr). */
  r: Float64Array;
  /** R_nl(r) in a0^{-3/2}. */
  R: Float64Array;
  /** r² R_nl² in a0^{-1}. */
  P: Float64Array;
  turningPoint: Bohr;
  nodes: Bohr[];
}

/**
 * Series for radial plots. Default rMax: the radius holding 99.9 % of the probability or 1.1 x the
 * classical turning point, whichever is larger, rounded up to a whole a0; default 401 samples.
 */
export function radialSeries(n: number, l: number, Z: number, opts: { rMax?: number; samples?: number } = {}): RadialSeries {
  const turningPoint = classicalTurningPoint(n, l, Z);
  const rMax = opts.rMax ?? ceil(max(radiusForProbability(n, l, Z, 0.999), 1.1 * turningPoint));
  if (!(rMax > 0) || !Number.isFinite(rMax)) throw new RangeError(`rMax must be a positive number of Bohr radii, got ${String(rMax)}`);
  const samples = opts.samples ?? 401;
  if (!Number.isInteger(samples) || samples < 2 || samples > 1_000_000) throw new RangeError(`samples must be an integer in 2..1000000, got ${String(samples)}`);
  const r = new Float64Array(samples);
  const R = new Float64Array(samples);
  const P = new Float64Array(samples);
  for (let i = 0; i < samples; i++) {
    const x = (rMax * i) / (samples - 1);
    const v = radialR(n, l, Z, x);
    r[i] = x;
    R[i] = v;
    P[i] = x * x * v * v;
  }
  return { n, l, Z, rMax: rMax as Bohr, r, R, P, turningPoint, nodes: radialNodes(n, l, Z) };
}
