import { RECIPE_LIMITS } from '@psiform/contracts';
import { L_LETTERS, LabelError, parseOrbitalLabel, prettyLabel, type Term } from '@psiform/orbitals';

/** Per-field messages for n, l, m typed into the form (null: fine). Rules: 1 ≤ n ≤ 12, 0 ≤ l < n, |m| ≤ l. */
export interface QuantumErrors {
  n: string | null;
  l: string | null;
  m: string | null;
}

function asInt(text: string): number | null {
  const t = text.trim().replace(/^\u2212/, '-');
  if (!/^[+-]?\d+$/.test(t)) return null;
  return Number(t);
}

function choices(values: number[]): string {
  const shown = values.map((v) => (v < 0 ? `−${-v}` : String(v)));
  if (shown.length === 1) return shown[0];
  return `${shown.slice(0, -1).join(', ')} or ${shown[shown.length - 1]}`;
}

function range(a: number, b: number): number[] {
  const out: number[] = [];
  for (let i = a; i <= b; i++) out.push(i);
  return out;
}

export function checkQuantumNumbers(nText: string, lText: string, mText: string): QuantumErrors & { values: { n: number; l: number; m: number } | null } {
  const nMax = RECIPE_LIMITS.nMax;
  const n = asInt(nText);
  const l = asInt(lText);
  const m = asInt(mText);
  const errors: QuantumErrors = { n: null, l: null, m: null };

  if (nText.trim() === '') errors.n = 'Enter the principal quantum number n.';
  else if (n === null) errors.n = 'n must be a whole number.';
  else if (n < 1 || n > nMax) errors.n = `n must be between 1 and ${nMax} (got ${n}).`;

  const nOk = errors.n === null && n !== null;
  if (lText.trim() === '') errors.l = 'Enter the angular momentum quantum number l.';
  else if (l === null) errors.l = 'l must be a whole number.';
  else if (l < 0) errors.l = `l cannot be negative (got ${l}).`;
  else if (nOk && l >= n) {
    errors.l = `l must be less than n: with n = ${n}, l can be ${choices(range(0, Math.min(n - 1, 11)))} (got ${l}).`;
  } else if (l > L_LETTERS.length - 1) errors.l = `l must be at most ${L_LETTERS.length - 1} (got ${l}).`;

  const lOk = errors.l === null && l !== null;
  if (mText.trim() === '') errors.m = 'Enter the magnetic quantum number m.';
  else if (m === null) errors.m = 'm must be a whole number (it may be negative).';
  else if (lOk && Math.abs(m) > l) {
    errors.m = `|m| must not exceed l: with l = ${l}, m can be ${choices(range(-l, l))} (got ${m}).`;
  }

  const ok = errors.n === null && errors.l === null && errors.m === null;
  return { ...errors, values: ok ? { n: n!, l: l!, m: m! } : null };
}

export interface OrbitalChoice {
  terms: Term[];
  /** Display label for the recipe, e.g. '2p_z', '3d_xy', 'sp³ #1', '2p(m=+1)'. */
  label: string;
  isReal: boolean;
}

/** An orbital from its label (2pz, 3dxy, 3dz2, 4fxyz, sp3, 2p+1 ...), or the parser's readable message. */
export function orbitalFromLabel(text: string): { ok: true; value: OrbitalChoice } | { ok: false; message: string } {
  if (text.trim() === '') return { ok: false, message: 'Enter an orbital label such as 2pz, 3dxy, 3dz2, 4fxyz or sp3.' };
  try {
    const parsed = parseOrbitalLabel(text);
    let label: string;
    try {
      label = prettyLabel(text);
    } catch {
      label = parsed.label;
    }
    return { ok: true, value: { terms: parsed.state.terms, label, isReal: parsed.isReal } };
  } catch (err) {
    if (err instanceof LabelError || err instanceof RangeError) {
      const msg = err.message.replace(/^orbital label /, 'Orbital label ');
      return { ok: false, message: /[.!?)]$/.test(msg) ? msg : `${msg}.` };
    }
    throw err;
  }
}

/** A single term from n, l, m: the chemists' real form (m > 0 cos type, m < 0 sin type) or complex Y_lm. */
export function orbitalFromNlm(n: number, l: number, m: number, basis: 'real' | 'complex'): OrbitalChoice {
  const term: Term = { n, l, m, basis, re: 1, im: 0 };
  return { terms: [term], label: prettyLabel(term), isReal: basis === 'real' || m === 0 };
}
