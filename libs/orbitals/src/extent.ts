import { radiusForProbability, stateProbabilityInside } from './probability';
import { OrbitalState, toComplexBasis } from './state';
import { Bohr } from './units';

const { ceil, floor, log10, max } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/**
 * Half-width (Bohr) of a cube holding at least `fraction` (default 0.999) of the probability.
 * The sphere of radius R with P(r < R) >= fraction is found for the slowest-decaying (n, l) term; the
 * superposition's own P(r < R) (cross terms included) is then checked and R grown by 2 % steps if needed.
 * A cube of half-width R contains that sphere. Rounded up to 4 significant digits only, so it scales exactly
 * as 1/Z (a whole-a0 rounding would make heavy ions' boxes several times too large). Used where there is no
 * surface to fit (density cubes, section maps); meshes fit their box to the surface (@psiform/meshing).
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
    R = max(R, radiusForProbability(t.n, t.l, cx.Z, fraction));
  }
  for (let i = 0; i < 200 && stateProbabilityInside(cx, R) < fraction; i++) R *= 1.02;
  const p = 10 ** (floor(log10(R)) - 3);
  return (ceil(R / p - 1e-9) * p) as Bohr;
}
