import { radiusForProbability, stateProbabilityInside } from './probability';
import { OrbitalState, toComplexBasis } from './state';
import { Bohr } from './units';

/**
 * Half-width (Bohr) of a cube holding at least `fraction` (default 0.999) of the probability.
 * The sphere of radius R with P(r < R) >= fraction is found for the slowest-decaying (n, l) term; the
 * superposition's own P(r < R) (cross terms included) is then checked and R grown by 2 % steps if needed.
 * A cube of half-width R contains that sphere. Rounded up to 0.5 a0 below 20 a0, to 1 a0 above
 * (common practice for tidy axis labels).
 */
export function autoExtent(state: OrbitalState, opts: { fraction?: number } = {}): Bohr {
  const fraction = opts.fraction ?? 0.999;
  if (!(fraction > 0 && fraction < 1)) throw new RangeError(`fraction must be between 0 and 1 (exclusive), got ${String(fraction)}`);
  const cx = toComplexBasis(state);
  let R = 0;
  const seen = new Set<string>();
  for (const t of cx.terms) {
    const key = `${t.n}/${t.l}`;
    if (seen.has(key)) continue;
    seen.add(key);
    R = Math.max(R, radiusForProbability(t.n, t.l, cx.Z, fraction));
  }
  for (let i = 0; i < 200 && stateProbabilityInside(cx, R) < fraction; i++) R *= 1.02;
  const step = R < 20 ? 0.5 : 1;
  return (Math.ceil(R / step - 1e-9) * step) as Bohr;
}
