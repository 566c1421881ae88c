/**
 * THE quantum-number rule of a hydrogen-like state, with its one wording, used by the recipe schema, the engine
 * (libs/orbitals validateQuantumNumbers), the CLI and the web forms: n, l, m are integers with
 * 1 ≤ n ≤ N_MAX, 0 ≤ l < n and |m| ≤ l (Bethe & Salpeter §3; the bound N_MAX is ours: the radial functions are
 * checked up to n = 12).
 */
export const N_MAX = 12;

export type QuantumField = 'n' | 'l' | 'm';

export interface QuantumIssue {
  field: QuantumField;
  message: string;
}

const isInt = (v: unknown): v is number => typeof v === 'number' && Number.isInteger(v);

/**
 * Every broken part of the rule, one issue per field at most, in reading order. l is compared with n only when n is an
 * integer, and m with l only when l is a non-negative integer, so each message is about the number it names.
 * `m` may be left out (a radial function has none).
 */
export function quantumNumberIssues(q: { n: unknown; l: unknown; m?: unknown }): QuantumIssue[] {
  const issues: QuantumIssue[] = [];
  const { n, l, m } = q;
  if (!isInt(n)) issues.push({ field: 'n', message: `n must be an integer (got n=${String(n)})` });
  else if (n < 1 || n > N_MAX) issues.push({ field: 'n', message: `n must be between 1 and ${N_MAX} (got n=${n})` });
  if (!isInt(l)) issues.push({ field: 'l', message: `l must be an integer (got l=${String(l)})` });
  else if (l < 0) issues.push({ field: 'l', message: `l must be at least 0 (got l=${l})` });
  else if (isInt(n) && l >= n) issues.push({ field: 'l', message: `l must be less than n (got n=${n}, l=${l})` });
  if ('m' in q) {
    if (!isInt(m)) issues.push({ field: 'm', message: `m must be an integer (got m=${String(m)})` });
    else if (isInt(l) && l >= 0 && Math.abs(m) > l) issues.push({ field: 'm', message: `|m| must not exceed l (got l=${l}, m=${m})` });
  }
  return issues;
}

/** The first broken part of the rule as one line, or null for a valid state. */
export function quantumNumberError(n: unknown, l: unknown, m?: unknown): string | null {
  return quantumNumberIssues(m === undefined ? { n, l } : { n, l, m })[0]?.message ?? null;
}
