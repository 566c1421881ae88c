// The Composer's content: what the illustrator types (labels, n l m, coefficient rows as magnitude and phase,
// hybrid presets, Z) turned into recipe terms, with a message per field while anything is wrong.
import { RECIPE_LIMITS, type RecipeTerm } from '@psiform/contracts';
import { HYBRID_SETS, isRealState, L_LETTERS, normaliseState, parseOrbitalLabel, prettyLabel, stateNormSquared, type OrbitalState, type Term } from '@psiform/orbitals';
import { ionName } from '@psiform/print';
import { checkQuantumNumbers, orbitalFromLabel, type QuantumErrors } from '../figures/quantum';

export type ContentMode = 'label' | 'nlm' | 'superposition' | 'hybrid';
export type Basis = 'real' | 'complex';

export interface TermRow {
  id: number;
  n: string;
  l: string;
  m: string;
  basis: Basis;
  /** |c| */
  mag: string;
  /** arg c in degrees */
  phase: string;
}

export interface ContentDraft {
  mode: ContentMode;
  label: string;
  n: string;
  l: string;
  m: string;
  basis: Basis;
  rows: TermRow[];
  hybrid: { set: string; member: number };
  Z: string;
}

export const HYBRID_MEMBERS: Record<string, number> = { sp: 2, sp2: 3, sp3: 4, sp3d: 5, sp3d2: 6 };
export const HYBRID_PRETTY: Record<string, string> = { sp: 'sp', sp2: 'sp²', sp3: 'sp³', sp3d: 'sp³d', sp3d2: 'sp³d²' };

let rowId = 1;
export function newRow(partial: Partial<Omit<TermRow, 'id'>> = {}): TermRow {
  return { id: rowId++, n: '2', l: '1', m: '0', basis: 'real', mag: '1', phase: '0', ...partial };
}

export function defaultDraft(): ContentDraft {
  return {
    mode: 'label',
    label: '2pz',
    n: '2',
    l: '1',
    m: '0',
    basis: 'real',
    rows: [newRow({ n: '2', l: '1', m: '1', mag: '1', phase: '0' }), newRow({ n: '2', l: '1', m: '-1', mag: '1', phase: '90' })],
    hybrid: { set: 'sp3', member: 1 },
    Z: '1',
  };
}

function num(text: string): number {
  const t = text.trim().replace(/^\u2212/, '-').replace(',', '.');
  return t === '' ? Number.NaN : Number(t);
}

/** Coefficient c = |c| e^{iφ} from magnitude and phase in degrees; exact for multiples of 90°. */
export function polarToComplex(mag: number, phaseDeg: number): { re: number; im: number } {
  const q = ((phaseDeg % 360) + 360) % 360;
  if (q === 0) return { re: mag, im: 0 };
  if (q === 90) return { re: 0, im: mag };
  if (q === 180) return { re: -mag, im: 0 };
  if (q === 270) return { re: 0, im: -mag };
  const a = (phaseDeg * Math.PI) / 180;
  return { re: mag * Math.cos(a), im: mag * Math.sin(a) };
}

export function complexToPolar(re: number, im: number): { mag: number; phaseDeg: number } {
  const mag = Math.hypot(re, im);
  let phaseDeg = (Math.atan2(im, re) * 180) / Math.PI;
  if (Math.abs(phaseDeg) < 1e-12) phaseDeg = 0;
  return { mag, phaseDeg };
}

export interface RowCheck extends QuantumErrors {
  mag: string | null;
  phase: string | null;
  term: Term | null;
}

export function checkRow(row: TermRow): RowCheck {
  const q = checkQuantumNumbers(row.n, row.l, row.m);
  const mag = num(row.mag);
  const phase = num(row.phase);
  const magErr = row.mag.trim() === '' ? 'Enter |c|.' : !Number.isFinite(mag) ? '|c| must be a number.' : mag < 0 ? '|c| cannot be negative (use the phase).' : null;
  const phaseErr = row.phase.trim() === '' ? 'Enter the phase in degrees.' : !Number.isFinite(phase) ? 'The phase must be a number of degrees.' : null;
  const term =
    q.values && !magErr && !phaseErr ? { n: q.values.n, l: q.values.l, m: q.values.m, basis: row.basis, ...polarToComplex(mag, phase) } : null;
  return { n: q.n, l: q.l, m: q.m, mag: magErr, phase: phaseErr, term };
}

export interface Normalisation {
  /** Σ|c|² of the rows as typed, over the orthonormal expansion (equals the plain sum for distinct orthonormal rows). */
  sumSquares: number;
  /** The coefficients divided by √Σ|c|². */
  normalised: { re: number; im: number; mag: number; phaseDeg: number }[];
}

export function normalisation(terms: Term[], Z = 1): Normalisation | null {
  if (terms.length === 0) return null;
  const state: OrbitalState = { Z, terms };
  const s = stateNormSquared(state);
  if (!(s > 0)) return { sumSquares: 0, normalised: [] };
  const norm = normaliseState(state);
  return { sumSquares: s, normalised: norm.terms.map((t) => ({ re: t.re, im: t.im, ...complexToPolar(t.re, t.im) })) };
}

/** Rows rewritten with normalised magnitudes (phases kept). */
export function normaliseRows(rows: TermRow[], Z = 1): TermRow[] {
  const checks = rows.map(checkRow);
  if (checks.some((c) => !c.term)) return rows;
  const n = normalisation(checks.map((c) => c.term!), Z);
  if (!n || n.sumSquares === 0) return rows;
  return rows.map((r, i) => ({ ...r, mag: trimNumber(n.normalised[i].mag) }));
}

export function trimNumber(x: number, digits = 6): string {
  if (Math.abs(x) < 1e-12) return '0';
  return String(Number(x.toFixed(digits)));
}

export function zError(text: string): string | null {
  if (text.trim() === '') return 'Enter the nuclear charge Z.';
  const Z = num(text);
  if (!Number.isInteger(Z)) return 'Z must be a whole number.';
  if (Z < 1 || Z > RECIPE_LIMITS.zMax) return `Z must be between 1 and ${RECIPE_LIMITS.zMax} (got ${Z}).`;
  return null;
}

/** One-electron ions by Z: H, He⁺, Li²⁺, Be³⁺, B⁴⁺, C⁵⁺ … (from @psiform/print). */
export function ionLabel(Z: number): string {
  try {
    return ionName(Z);
  } catch {
    return '';
  }
}

export interface BuiltContent {
  terms: RecipeTerm[];
  label: string;
  isReal: boolean;
  Z: number;
}

export interface ContentCheck {
  built: BuiltContent | null;
  /** Messages by field: 'label', 'n', 'l', 'm', 'Z', 'rows.<i>.<field>', 'rows'. */
  errors: Record<string, string>;
}

export function hybridLabel(set: string, member: number): string {
  return `${set}#${member}`;
}

export function checkContent(d: ContentDraft): ContentCheck {
  const errors: Record<string, string> = {};
  const ze = zError(d.Z);
  if (ze) errors.Z = ze;
  let terms: Term[] | null = null;
  let label = '';
  if (d.mode === 'label') {
    const r = orbitalFromLabel(d.label);
    if (r.ok) {
      terms = r.value.terms;
      label = r.value.label;
    } else errors.label = r.message;
  } else if (d.mode === 'nlm') {
    const q = checkQuantumNumbers(d.n, d.l, d.m);
    for (const k of ['n', 'l', 'm'] as const) if (q[k]) errors[k] = q[k]!;
    if (q.values) {
      const t: Term = { ...q.values, basis: d.basis, re: 1, im: 0 };
      terms = [t];
      label = prettyLabel(t);
    }
  } else if (d.mode === 'hybrid') {
    if (!HYBRID_SETS.includes(d.hybrid.set)) errors.hybrid = `Choose one of ${HYBRID_SETS.join(', ')}.`;
    else {
      const max = HYBRID_MEMBERS[d.hybrid.set] ?? 1;
      if (!(d.hybrid.member >= 1 && d.hybrid.member <= max)) errors.hybrid = `${HYBRID_PRETTY[d.hybrid.set]} has members 1 to ${max}.`;
      else {
        const key = hybridLabel(d.hybrid.set, d.hybrid.member);
        terms = parseOrbitalLabel(key).state.terms;
        label = prettyLabel(key);
      }
    }
  } else {
    if (d.rows.length === 0) errors.rows = 'Add at least one term.';
    if (d.rows.length > RECIPE_LIMITS.termsMax) errors.rows = `At most ${RECIPE_LIMITS.termsMax} terms.`;
    const checks = d.rows.map(checkRow);
    checks.forEach((c, i) => {
      for (const k of ['n', 'l', 'm', 'mag', 'phase'] as const) if (c[k]) errors[`rows.${i}.${k}`] = c[k]!;
    });
    if (!errors.rows && checks.every((c) => c.term)) {
      const ts = checks.map((c) => c.term!);
      const s = normalisation(ts, 1);
      if (!s || s.sumSquares === 0) errors.rows = 'All coefficients are zero or cancel: give at least one term a non-zero |c|.';
      else {
        terms = ts;
        label = prettyLabel({ Z: 1, terms: ts });
      }
    }
  }
  if (Object.keys(errors).length > 0 || !terms) return { built: null, errors };
  const Z = num(d.Z);
  const state: OrbitalState = { Z, terms };
  let isReal: boolean;
  try {
    isReal = isRealState(state);
  } catch {
    isReal = false;
  }
  return {
    built: { terms: terms.map((t) => ({ n: t.n, l: t.l, m: t.m, basis: t.basis, re: t.re, im: t.im })), label: label.slice(0, 80), isReal, Z },
    errors,
  };
}

/** Orbital labels for the searchable list, grouped by shell (real forms up to f, n ≤ 7). */
export interface LabelGroup {
  title: string;
  items: { key: string; pretty: string }[];
}

const REAL_NAMES: Record<number, string[]> = {
  0: ['s'],
  1: ['px', 'py', 'pz'],
  2: ['dxy', 'dyz', 'dz2', 'dxz', 'dx2-y2'],
  3: ['fz3', 'fxz2', 'fyz2', 'fxyz', 'fz(x2-y2)', 'fx(x2-3y2)', 'fy(3x2-y2)'],
};

export function labelGroups(maxN = 7): LabelGroup[] {
  const groups: LabelGroup[] = [];
  for (let n = 1; n <= maxN; n++) {
    const items: { key: string; pretty: string }[] = [];
    for (let l = 0; l < Math.min(n, 4); l++) {
      for (const name of REAL_NAMES[l]) {
        const key = `${n}${name}`;
        items.push({ key, pretty: prettyLabel(key) });
      }
    }
    groups.push({ title: `n = ${n} (${[...Array(Math.min(n, 4)).keys()].map((l) => L_LETTERS[l]).join(', ')})`, items });
  }
  groups.push({
    title: 'Hybrids',
    items: Object.keys(HYBRID_MEMBERS).map((s) => ({ key: s, pretty: `${HYBRID_PRETTY[s]} #1` })),
  });
  return groups;
}

function squash(s: string): string {
  return s
    .toLowerCase()
    .replace(/²/g, '2')
    .replace(/³/g, '3')
    .replace(/[−–]/g, '-')
    .replace(/[\s_{}()^#-]/g, '');
}

export function filterLabelGroups(groups: LabelGroup[], query: string): LabelGroup[] {
  const q = squash(query);
  if (!q) return groups;
  return groups
    .map((g) => ({ ...g, items: g.items.filter((i) => squash(i.key).includes(q) || squash(i.pretty).includes(q)) }))
    .filter((g) => g.items.length > 0);
}

/** Reads a stored recipe's content back into the Composer's fields. */
export function draftFromTerms(terms: RecipeTerm[], Z: number, label?: string): ContentDraft {
  const d = defaultDraft();
  d.Z = String(Z);
  const same = (ts: Term[]) =>
    ts.length === terms.length &&
    ts.every((t, i) => t.n === terms[i].n && t.l === terms[i].l && t.m === terms[i].m && t.basis === terms[i].basis && Math.abs(t.re - terms[i].re) < 1e-9 && Math.abs(t.im - (terms[i].im ?? 0)) < 1e-9);
  // A hybrid preset?
  for (const set of Object.keys(HYBRID_MEMBERS)) {
    for (let k = 1; k <= HYBRID_MEMBERS[set]; k++) {
      if (same(parseOrbitalLabel(hybridLabel(set, k)).state.terms)) {
        d.mode = 'hybrid';
        d.hybrid = { set, member: k };
        return d;
      }
    }
  }
  if (terms.length === 1 && terms[0].re === 1 && (terms[0].im ?? 0) === 0) {
    const t = terms[0];
    d.n = String(t.n);
    d.l = String(t.l);
    d.m = String(t.m);
    d.basis = t.basis;
    d.mode = 'nlm';
    if (label) {
      const r = orbitalFromLabel(label);
      if (r.ok && same(r.value.terms)) {
        d.mode = 'label';
        d.label = label;
      }
    }
    return d;
  }
  d.mode = 'superposition';
  d.rows = terms.map((t) => {
    const p = complexToPolar(t.re, t.im ?? 0);
    return newRow({ n: String(t.n), l: String(t.l), m: String(t.m), basis: t.basis, mag: trimNumber(p.mag), phase: trimNumber(p.phaseDeg, 4) });
  });
  return d;
}
