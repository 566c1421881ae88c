import { UsageError } from './errors';

const INT_RE = /^[+-]?\d+$/;
const FLOAT_RE = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** Strict integer option: rejects "1.5", "1e2", "", "NaN". */
export function parseIntOption(flag: string, raw: string, range?: { min?: number; max?: number }): number {
  const s = raw.trim();
  if (!INT_RE.test(s)) throw new UsageError(`${flag} must be an integer (got '${raw}')`);
  const v = Number(s);
  if (range?.min !== undefined && v < range.min) throw new UsageError(`${flag} must be at least ${range.min} (got ${v})`);
  if (range?.max !== undefined && v > range.max) throw new UsageError(`${flag} must be at most ${range.max} (got ${v})`);
  return v;
}

/** Strict finite decimal option: rejects "NaN", "Infinity", "0x10", "". */
export function parseNumberOption(flag: string, raw: string): number {
  const s = raw.trim();
  if (!FLOAT_RE.test(s)) throw new UsageError(`${flag} must be a finite number (got '${raw}')`);
  const v = Number(s);
  if (!Number.isFinite(v)) throw new UsageError(`${flag} must be a finite number (got '${raw}')`);
  return v;
}

/** "--nlm 3,2,-1" -> [3, 2, -1]. */
export function parseNlm(raw: string): [number, number, number] {
  const parts = raw.split(',').map((p) => p.trim());
  if (parts.length !== 3 || !parts.every((p) => INT_RE.test(p))) {
    throw new UsageError(`--nlm must be three integers n,l,m such as 2,1,0 (got '${raw}')`);
  }
  return [Number(parts[0]), Number(parts[1]), Number(parts[2])];
}
