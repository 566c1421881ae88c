import { N_MAX, quantumNumberError } from '@psiform/contracts';

/** The quantum-number rule lives in @psiform/contracts (quantum.ts), with its one wording; the engine uses it. */
export const MAX_N = N_MAX;

/** Spectroscopic letters for l = 0..11 (j is skipped by convention). */
export const L_LETTERS = ['s', 'p', 'd', 'f', 'g', 'h', 'i', 'k', 'l', 'm', 'n', 'o'] as const;

/** Returns the rule's readable error, or null when (n, l, m) is a valid hydrogen-like state. */
export function validateQuantumNumbers(n: number, l: number, m: number): string | null {
  return quantumNumberError(n, l, m);
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
