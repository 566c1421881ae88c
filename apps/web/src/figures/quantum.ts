import { quantumNumberIssues } from '@psiform/contracts';
import { LabelError, parseOrbitalLabel, prettyLabel, type Term } from '@psiform/orbitals';

/**
 * Per-field messages for n, l, m typed into the form (null: fine). The rule and its wording are the one of
 * @psiform/contracts (quantum.ts), shared with the API, the engine and the CLI; the form adds which values would do.
 */
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
  const n = asInt(nText);
  const l = asInt(lText);
  const m = asInt(mText);
  const errors: QuantumErrors = { n: null, l: null, m: null };
  // Reading the text first: an empty or non-integer field says so; only numbers go to the rule.
  if (nText.trim() === '') errors.n = 'Enter the principal quantum number n.';
  else if (n === null) errors.n = 'n must be a whole number.';
  if (lText.trim() === '') errors.l = 'Enter the angular momentum quantum number l.';
  else if (l === null) errors.l = 'l must be a whole number.';
  if (mText.trim() === '') errors.m = 'Enter the magnetic quantum number m.';
  else if (m === null) errors.m = 'm must be a whole number (it may be negative).';

  const hint = { n: '', l: n !== null ? `: with n = ${n}, l can be ${choices(range(0, n - 1))}` : '', m: l !== null && l >= 0 ? `: with l = ${l}, m can be ${choices(range(-l, l))}` : '' };
  const q = { n: n ?? undefined, l: l ?? undefined, m: m ?? undefined };
  for (const issue of quantumNumberIssues(q)) {
    // A relation (l < n, |m| ≤ l) is only shown when the number it is compared with is itself fine.
    if (issue.field === 'l' && errors.n !== null && l !== null && l >= 0) continue;
    if (issue.field === 'm' && errors.l !== null) continue;
    errors[issue.field] ??= `${issue.message}${issue.message.includes('less than n') || issue.message.includes('not exceed l') ? hint[issue.field] : ''}.`;
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
