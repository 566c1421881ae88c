// Root finding shared by the level solvers.

const { abs, exp, log } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/**
 * The level t in (0, top) with P(t) = fraction for a decreasing P (the probability above a density level):
 * bracketing on x = ln t, then the Illinois variant of regula falsi (Dowell & Jarratt, BIT 11 (1971) 168) until
 * P matches to 1e-13 or the bracket in ln t is under 1e-13.
 */
export function solveDecreasingLevel(P: (t: number) => number, top: number, fraction: number): number {
  const F = (x: number) => P(exp(x)) - fraction;
  let hi = log(top);
  let fhi = -fraction;
  let lo = hi - 2;
  let flo = F(lo);
  for (let i = 0; i < 400 && flo < 0; i++) {
    hi = lo;
    fhi = flo;
    lo -= 2;
    flo = F(lo);
  }
  if (flo < 0) throw new RangeError(`no level encloses ${fraction} of the probability`);
  let side = 0;
  for (let it = 0; it < 200; it++) {
    const x = fhi !== flo ? hi - (fhi * (hi - lo)) / (fhi - flo) : 0.5 * (lo + hi);
    const xm = x > lo && x < hi ? x : 0.5 * (lo + hi);
    const fm = F(xm);
    if (abs(fm) < 1e-13 || hi - lo < 1e-13) return exp(xm);
    if (fm > 0) {
      lo = xm;
      flo = fm;
      if (side === -1) fhi /= 2;
      side = -1;
    } else {
      hi = xm;
      fhi = fm;
      if (side === 1) flo /= 2;
      side = 1;
    }
  }
  return exp(0.5 * (lo + hi));
}

