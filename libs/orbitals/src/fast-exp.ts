// e^x for x <= 0 on the sampling kernels' hot path (one call per grid point).
//
// Why our own: V8's Math.exp is a call out of optimised code (measured here: about 25-30 ns a call in the grid
// kernel, two thirds of the time per point); this inlines and runs about a third faster at the same accuracy.
// Method: table-driven reduction (P. T. P. Tang, "Table-driven implementation of the exponential function in IEEE
// floating-point arithmetic", ACM TOMS 15(2), 1989): x = (64 m + j) ln2 / 64 + r with |r| <= ln2 / 128, so
// e^x = 2^m 2^(j/64) e^r; ln2 / 64 is split in two parts (Cody & Waite) so r carries no rounding of k ln2 / 64,
// and e^r is its Taylor polynomial of degree 6 (remainder below r^7 / 5040 < 2e-20). Relative error at most a few
// ulp (checked against Math.exp in test/fast-exp.test.ts), far below the float32 samples it feeds.

const { LN2, exp } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

const TABLE_J = new Float64Array(64);
for (let j = 0; j < 64; j++) TABLE_J[j] = 2 ** (j / 64);
/** 2^m for m in [-1150, 0] (subnormal and zero at the low end, as e^x there). */
const M_LOW = 1150;
const TABLE_M = new Float64Array(M_LOW + 1);
for (let m = 0; m <= M_LOW; m++) TABLE_M[m] = 2 ** (m - M_LOW);
const K_PER_X = 64 / LN2;
// ln2 / 64 in two parts: the high part has trailing zero bits, so k × high is exact for |k| < 2^20 (fdlibm's split).
const LN2_64_HI = 6.93147180369123816490e-1 / 64;
const LN2_64_LO = 1.90821492927058770002e-10 / 64;
/** Adding and subtracting 1.5 × 2^52 rounds a double of magnitude below 2^51 to the nearest integer. */
const ROUND = 6755399441055744;

/** e^x for x <= 0 (NaN gives NaN, below -745 gives 0). Not for x > 0: the table stops at 2^0. */
export function expNonPositive(x: number): number {
  if (!(x > -745)) return x === x ? 0 : x;
  const kf = x * K_PER_X + ROUND - ROUND;
  const r = x - kf * LN2_64_HI - kf * LN2_64_LO;
  const k = kf | 0;
  const p = 1 + r * (1 + r * (0.5 + r * (1 / 6 + r * (1 / 24 + r * (1 / 120 + r * (1 / 720))))));
  return TABLE_J[k & 63] * TABLE_M[(k >> 6) + M_LOW] * p;
}
