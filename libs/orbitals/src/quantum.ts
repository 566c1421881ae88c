/** Quantum-number rules shared by every entry point. */
export const MAX_N = 12;

/** Spectroscopic letters for l = 0..11 (j is skipped by convention). */
export const L_LETTERS = ['s', 'p', 'd', 'f', 'g', 'h', 'i', 'k', 'l', 'm', 'n', 'o'] as const;

/**
 * Returns a readable error, or null when (n, l, m) is a valid hydrogen-like state:
 * 1 <= n <= 12 integer, 0 <= l < n, |m| <= l.
 */
export function validateQuantumNumbers(n: number, l: number, m: number): string | null {
  if (typeof n !== 'number' || !Number.isInteger(n)) return `n must be an integer, got ${String(n)}`;
  if (n < 1 || n > MAX_N) return `n must be between 1 and ${MAX_N}, got ${n}`;
  if (typeof l !== 'number' || !Number.isInteger(l)) return `l must be an integer, got ${String(l)}`;
  if (l < 0 || l >= n) return `l must satisfy 0 <= l < n (n = ${n}), got l = ${l}`;
  if (typeof m !== 'number' || !Number.isInteger(m)) return `m must be an integer, got ${String(m)}`;
  if (Math.abs(m) > l) return `m must satisfy |m| <= l (l = ${l}), got m = ${m}`;
  return null;
}

/** Returns a readable error, or null for a usable nuclear charge (positive, finite; effective charges allowed). */
export function validateZ(Z: number): string | null {
  if (typeof Z !== 'number' || !Number.isFinite(Z) || Z <= 0) return `Z must be a positive finite number, got ${String(Z)}`;
  return null;
}

export function assertQuantumNumbers(n: number, l: number, m: number): void {
  const err = validateQuantumNumbers(n, l, m);
  if (err) throw new RangeError(err);
}

export function assertZ(Z: number): void {
  const err = validateZ(Z);
  if (err) throw new RangeError(err);
}
