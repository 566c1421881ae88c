const { exp, log, round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/**
 * Log-factorial table (no lgamma): log n! = sum_{i<=n} log i, exact enough (relative 1e-15) for the
 * normalisation constants used here, whose arguments never exceed 2*12 = 24.
 */
const TABLE_SIZE = 171;
const LOG_FACT = new Float64Array(TABLE_SIZE);
const FACT = new Float64Array(TABLE_SIZE);
FACT[0] = 1;
for (let i = 1; i < TABLE_SIZE; i++) {
  LOG_FACT[i] = LOG_FACT[i - 1] + log(i);
  FACT[i] = FACT[i - 1] * i;
}

export function logFactorial(n: number): number {
  if (!Number.isInteger(n) || n < 0 || n >= TABLE_SIZE) {
    throw new RangeError(`logFactorial: n must be an integer in 0..${TABLE_SIZE - 1}, got ${n}`);
  }
  return LOG_FACT[n];
}

/** n! as a double (exact up to 18!, correctly rounded products beyond). */
export function factorial(n: number): number {
  if (!Number.isInteger(n) || n < 0 || n >= TABLE_SIZE) {
    throw new RangeError(`factorial: n must be an integer in 0..${TABLE_SIZE - 1}, got ${n}`);
  }
  return FACT[n];
}

/** Binomial coefficient C(n, k) via the log table, rounded to the nearest integer. */
export function binomial(n: number, k: number): number {
  if (k < 0 || k > n) return 0;
  return round(exp(LOG_FACT[n] - LOG_FACT[k] - LOG_FACT[n - k]));
}
