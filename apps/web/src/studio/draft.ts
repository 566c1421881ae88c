// The Composer's ONE draft model: a reducer over the recipe. `draft.recipe` is always the document Save sends;
// the four ways of choosing the state (label, n l m, superposition, hybrid) are views of its terms, so switching
// between them never changes ψ. A view that cannot show the current terms exactly shows them read-only and
// offers an explicit "replace with…". Typed text that is not (yet) valid is kept beside the recipe in `text`,
// with its message, and never rewrites the recipe.
import {
  CANVAS_LIMITS,
  canonicalJson,
  fractionProblem,
  gridProblem,
  isovalueProblem,
  mmProblem,
  RECIPE_LIMITS,
  TEXT_LIMITS,
  textProblem,
  titleProblem,
  type Recipe,
  type RecipeTerm,
} from '@psiform/contracts';
import { F_CUBIC_SET, HYBRID_SETS, L_LETTERS, parseOrbitalLabel, prettyLabel, type Term } from '@psiform/orbitals';
import { checkQuantumNumbers, orbitalFromLabel } from '../figures/quantum';
import { complexToPolar, HYBRID_MEMBERS, hybridLabel, labelGroups, normalisation, polarToComplex, trimNumber, zError } from './content';

export type ContentMode = 'label' | 'nlm' | 'superposition' | 'hybrid';

export interface ComposerDraft {
  /** What Save sends; the one source of truth for the figure's content and look. */
  recipe: Recipe;
  /** The view of the state being used. */
  mode: ContentMode;
  /** Stable ids of recipe.content.terms (same order), for the superposition rows. */
  rowIds: number[];
  /** Text as typed where it differs from (or is not yet) a recipe value; keys as in FIELD_KEYS. */
  text: Record<string, string>;
  /** The "replace with…" chooser is open in a view that cannot show the current state. */
  replacing: boolean;
  /** Title of a new figure (an existing figure's title is edited on its page). */
  title: string;
  /** A new figure: the title is asked for and checked. */
  isNew: boolean;
}

export type DraftAction =
  | { type: 'mode'; mode: ContentMode }
  | { type: 'replacing'; open: boolean }
  /** Replace the state's terms (a label, hybrid member or preset picked on purpose). */
  | { type: 'replace'; terms: RecipeTerm[]; label: string }
  | { type: 'text'; key: string; value: string }
  | { type: 'basis'; basis: 'real' | 'complex' }
  | { type: 'row-basis'; id: number; basis: 'real' | 'complex' }
  | { type: 'add-row' }
  | { type: 'remove-row'; id: number }
  | { type: 'normalise' }
  | { type: 'hybrid'; set: string; member: number }
  | { type: 'surface'; surface: Recipe['surface'] }
  | { type: 'look'; stage: Recipe['stage']; annotations: Recipe['annotations'] }
  | { type: 'canvas'; canvas: Partial<Recipe['canvas']> }
  /** The sampled box and grid (the Studio's warnings offer a wider box or the engine's own grid). */
  | { type: 'grid'; grid: Partial<Recipe['grid']> }
  | { type: 'palette'; palette: Recipe['palette']; background?: string }
  /** The publication's one length unit (a new figure takes it; the server applies it to every saved version). */
  | { type: 'unit'; unit: Recipe['annotations']['scaleBar']['unit'] }
  /** Load a recipe as the new starting point (after a save, or a preset for a new figure). */
  | { type: 'load'; recipe: Recipe; keepTitle?: boolean; keepMode?: boolean };

let nextRowId = 1;
const newIds = (k: number) => Array.from({ length: k }, () => nextRowId++);

// ---------------------------------------------------------------- names of states

const TOL = 1e-12;

function sameTerms(a: readonly Term[] | readonly RecipeTerm[], b: readonly Term[] | readonly RecipeTerm[]): boolean {
  return (
    a.length === b.length &&
    a.every((t, i) => {
      const u = b[i];
      const scale = Math.max(1, Math.hypot(t.re, t.im ?? 0));
      return t.n === u.n && t.l === u.l && t.m === u.m && t.basis === u.basis && Math.abs(t.re - u.re) <= TOL * scale && Math.abs((t.im ?? 0) - (u.im ?? 0)) <= TOL * scale;
    })
  );
}

export interface NamedState {
  /** Canonical ASCII key the parser reads (2pz, 3dz2, 2p+1, sp3#2, 4fx3). */
  key: string;
  kind: 'real' | 'complex' | 'hybrid';
  /** Display name from @psiform/orbitals (typeset by the UI). */
  label: string;
}

function tryParse(key: string): Term[] | null {
  try {
    return parseOrbitalLabel(key).state.terms;
  } catch {
    return null;
  }
}

/** The named orbital (real form, complex Y_lm, hybrid member, cubic f) whose terms equal these exactly, or null. */
export function namedState(terms: readonly RecipeTerm[]): NamedState | null {
  if (terms.length === 1) {
    const t = terms[0];
    if (t.re !== 1 || (t.im ?? 0) !== 0) return null;
    if (t.basis === 'complex' || t.l === 0) {
      if (t.l === 0) return { key: `${t.n}s`, kind: 'real', label: prettyLabel(`${t.n}s`) };
      const key = `${t.n}${L_LETTERS[t.l]}${t.m > 0 ? '+' : t.m < 0 ? '-' : ''}${Math.abs(t.m)}`;
      return sameTerms(tryParse(key) ?? [], terms) ? { key, kind: 'complex', label: prettyLabel(terms[0] as Term) } : null;
    }
    for (const g of labelGroups(RECIPE_LIMITS.nMax)) {
      for (const it of g.items) {
        if (!it.key.startsWith(String(t.n)) || /sp/.test(it.key)) continue;
        const ts = tryParse(it.key);
        if (ts && sameTerms(ts, terms)) return { key: it.key, kind: 'real', label: it.pretty };
      }
    }
    return null;
  }
  for (const set of HYBRID_SETS) {
    for (let k = 1; k <= (HYBRID_MEMBERS[set] ?? 0); k++) {
      const key = hybridLabel(set, k);
      const ts = tryParse(key);
      if (ts && sameTerms(ts, terms)) return { key, kind: 'hybrid', label: prettyLabel(key) };
    }
  }
  for (let n = 4; n <= RECIPE_LIMITS.nMax; n++) {
    for (const name of F_CUBIC_SET) {
      const key = `${n}${name}`;
      const ts = tryParse(key);
      if (ts && sameTerms(ts, terms)) return { key, kind: 'real', label: prettyLabel(key) };
    }
  }
  return null;
}

/** A single term with coefficient exactly 1: what the n, l, m view can show. */
export function singleUnitTerm(terms: readonly RecipeTerm[]): RecipeTerm | null {
  return terms.length === 1 && terms[0].re === 1 && (terms[0].im ?? 0) === 0 ? terms[0] : null;
}

/** Can this view show the current terms exactly (and so edit them)? */
export function viewShowsState(mode: ContentMode, terms: readonly RecipeTerm[]): boolean {
  if (mode === 'superposition') return true;
  if (mode === 'nlm') return singleUnitTerm(terms) !== null;
  const named = namedState(terms);
  if (mode === 'hybrid') return named?.kind === 'hybrid';
  return named !== null && named.kind !== 'hybrid';
}

/** The view a recipe opens in: the most specific one that shows it exactly. */
export function initialMode(terms: readonly RecipeTerm[]): ContentMode {
  const named = namedState(terms);
  if (named) return named.kind === 'hybrid' ? 'hybrid' : 'label';
  if (singleUnitTerm(terms)) return 'nlm';
  return 'superposition';
}

/** The name the recipe carries for these terms (informative; the terms are authoritative). */
export function labelFor(terms: readonly RecipeTerm[]): string {
  const named = namedState(terms);
  if (named) return named.label;
  try {
    return prettyLabel({ Z: 1, terms: terms.map((t) => ({ ...t, im: t.im ?? 0 })) }).slice(0, TEXT_LIMITS.labelMax);
  } catch {
    return 'superposition';
  }
}

// ---------------------------------------------------------------- initial draft

export function createDraft(recipe: Recipe, opts: { isNew?: boolean; title?: string } = {}): ComposerDraft {
  return {
    recipe,
    mode: initialMode(recipe.content.terms),
    rowIds: newIds(recipe.content.terms.length),
    text: {},
    replacing: false,
    title: opts.title ?? '',
    isNew: opts.isNew ?? false,
  };
}

// ---------------------------------------------------------------- typed fields

function num(text: string): number {
  const t = text.trim().replace(/^\u2212/, '-').replace(',', '.');
  return t === '' ? Number.NaN : Number(t);
}

function withTerms(d: ComposerDraft, terms: RecipeTerm[], rowIds = d.rowIds): ComposerDraft {
  return { ...d, rowIds, recipe: { ...d.recipe, label: labelFor(terms), content: { ...d.recipe.content, terms } } };
}

/** Drops typed text for these key prefixes (their recipe values were replaced by an action). */
function dropText(text: Record<string, string>, prefixes: string[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(text)) if (!prefixes.some((p) => k === p || k.startsWith(`${p}.`))) out[k] = v;
  return out;
}

/** What a field shows: the typed text, else the recipe's value. */
export function fieldText(d: ComposerDraft, key: string): string {
  if (key in d.text) return d.text[key];
  const r = d.recipe;
  const terms = r.content.terms;
  const row = /^row\.(\d+)\.(n|l|m|mag|phase)$/.exec(key);
  if (row) {
    const i = d.rowIds.indexOf(Number(row[1]));
    const t = terms[i];
    if (!t) return '';
    if (row[2] === 'mag' || row[2] === 'phase') {
      const p = complexToPolar(t.re, t.im ?? 0);
      return row[2] === 'mag' ? trimNumber(p.mag) : trimNumber(p.phaseDeg, 4);
    }
    return String(t[row[2] as 'n' | 'l' | 'm']);
  }
  switch (key) {
    case 'title':
      return d.title;
    case 'Z':
      return String(r.content.Z);
    case 'grid':
      return String(r.grid.n);
    case 'percent':
      return r.surface.rule === 'enclosed' ? String(Number((r.surface.fraction * 100).toFixed(6))) : '';
    case 'psi':
      return r.surface.rule === 'psi' ? String(r.surface.value) : '';
    case 'label':
      return namedState(terms)?.key ?? '';
    case 'n':
    case 'l':
    case 'm':
      return singleUnitTerm(terms) ? String(singleUnitTerm(terms)![key]) : '';
    case 'canvas.widthMm':
      return String(r.canvas.widthMm);
    case 'canvas.heightMm':
      return String(r.canvas.heightMm);
    case 'label.text':
      return r.annotations.label.text ?? '';
    case 'caption':
      return r.annotations.caption ?? '';
    default:
      return '';
  }
}

/** The message for a typed field, or null when it is fine (or untouched). */
export function fieldError(d: ComposerDraft, key: string): string | null {
  if (!(key in d.text) && key !== 'title') return null;
  const v = fieldText(d, key);
  if (key === 'title') {
    if (!d.isNew) return null;
    const p = titleProblem(v);
    return p ? `The title ${p}.` : null;
  }
  if (key === 'Z') return zError(v);
  if (key === 'grid') {
    const t = v.trim();
    if (t === '') return 'Enter the grid size N.';
    if (t.toLowerCase() === 'auto') return null; // the engine picks the grid that resolves the surface
    const p = gridProblem(num(t));
    return p ? `Grid N ${p}.` : null;
  }
  if (key === 'percent') {
    const t = v.trim();
    if (t === '') return 'Enter the enclosed probability in percent.';
    const p = fractionProblem(num(t), 'percent');
    return p ? `The enclosed probability ${p}.` : null;
  }
  if (key === 'psi') {
    const t = v.trim();
    if (t === '') return 'Enter the |ψ| value.';
    const p = isovalueProblem(num(t));
    return p ? `The |ψ| value ${p}.` : null;
  }
  if (key === 'label') {
    const r = orbitalFromLabel(v);
    return r.ok ? null : r.message;
  }
  if (key === 'n' || key === 'l' || key === 'm') {
    const q = checkQuantumNumbers(fieldText(d, 'n'), fieldText(d, 'l'), fieldText(d, 'm'));
    return q[key];
  }
  const row = /^row\.(\d+)\.(n|l|m|mag|phase)$/.exec(key);
  if (row) {
    const id = row[1];
    const f = row[2];
    if (f === 'n' || f === 'l' || f === 'm') {
      const q = checkQuantumNumbers(fieldText(d, `row.${id}.n`), fieldText(d, `row.${id}.l`), fieldText(d, `row.${id}.m`));
      return q[f];
    }
    if (v.trim() === '') return f === 'mag' ? 'Enter |c|.' : 'Enter the phase in degrees.';
    const x = num(v);
    if (!Number.isFinite(x)) return f === 'mag' ? '|c| must be a number.' : 'The phase must be a number of degrees.';
    if (f === 'mag' && x < 0) return '|c| cannot be negative (use the phase).';
    return null;
  }
  if (key === 'canvas.widthMm' || key === 'canvas.heightMm') {
    const t = v.trim();
    const what = key === 'canvas.widthMm' ? 'width' : 'height';
    if (t === '') return `Enter the ${what} in mm (${CANVAS_LIMITS.mmMin} to ${CANVAS_LIMITS.mmMax}).`;
    const p = mmProblem(num(t));
    return p ? `The ${what} ${p}.` : null;
  }
  if (key === 'label.text') {
    const p = textProblem(v, TEXT_LIMITS.labelMax);
    return p ? `The label ${p}.` : null;
  }
  if (key === 'caption') {
    const p = textProblem(v, TEXT_LIMITS.captionMax);
    return p ? `The caption ${p}.` : null;
  }
  return null;
}

/** Every message of the draft by field key (typed fields only, plus the title of a new figure). */
export function draftErrors(d: ComposerDraft): Record<string, string> {
  const out: Record<string, string> = {};
  const keys = new Set([...Object.keys(d.text), ...(d.isNew ? ['title'] : [])]);
  // n, l, m are checked together: a typed l can make an untouched n wrong and the reverse.
  for (const k of [...keys]) {
    const row = /^row\.(\d+)\.(n|l|m)$/.exec(k);
    if (row) for (const f of ['n', 'l', 'm']) keys.add(`row.${row[1]}.${f}`);
    if (k === 'n' || k === 'l' || k === 'm') for (const f of ['n', 'l', 'm']) keys.add(f);
  }
  for (const k of keys) {
    if (/^(label|n|l|m)$/.test(k) && !(d.mode === (k === 'label' ? 'label' : 'nlm'))) continue;
    if (k.startsWith('row.') && d.mode !== 'superposition') continue;
    const e = fieldError(d, k);
    if (e) out[k] = e;
  }
  const terms = d.recipe.content.terms;
  if (d.mode === 'superposition') {
    if (terms.length === 0) out.rows = 'Add at least one term.';
    else {
      const s = normalisation(terms.map((t) => ({ ...t, im: t.im ?? 0 })));
      if (!s || s.sumSquares === 0) out.rows = 'All coefficients are zero or cancel: give at least one term a non-zero |c|.';
    }
  }
  return out;
}

/** The recipe value a valid typed field stands for, applied; the draft unchanged while the text is invalid. */
function applyText(d: ComposerDraft, key: string): ComposerDraft {
  if (key === 'title') return { ...d, title: d.text.title ?? '' };
  if (fieldError(d, key)) return d;
  const v = fieldText(d, key);
  const r = d.recipe;
  if (key === 'Z') return { ...d, recipe: { ...r, content: { ...r.content, Z: num(v) } } };
  if (key === 'grid') return { ...d, recipe: { ...r, grid: { ...r.grid, n: v.trim().toLowerCase() === 'auto' ? 'auto' : num(v) } } };
  if (key === 'percent') return { ...d, recipe: { ...r, surface: { rule: 'enclosed', fraction: Number((num(v) / 100).toPrecision(10)) } } };
  if (key === 'psi') return { ...d, recipe: { ...r, surface: { rule: 'psi', value: num(v) } } };
  if (key === 'label') {
    const o = orbitalFromLabel(v);
    if (!o.ok) return d;
    const terms = o.value.terms.map(toRecipeTerm);
    if (sameTerms(terms, r.content.terms)) return d;
    return withTerms(d, terms, newIds(terms.length));
  }
  if (key === 'n' || key === 'l' || key === 'm') {
    const q = checkQuantumNumbers(fieldText(d, 'n'), fieldText(d, 'l'), fieldText(d, 'm'));
    const t = singleUnitTerm(r.content.terms);
    if (!q.values || !t) return d;
    if (q.values.n === t.n && q.values.l === t.l && q.values.m === t.m) return d;
    return withTerms(d, [{ ...t, ...q.values }]);
  }
  const row = /^row\.(\d+)\.(n|l|m|mag|phase)$/.exec(key);
  if (row) {
    const id = Number(row[1]);
    const i = d.rowIds.indexOf(id);
    const t = r.content.terms[i];
    if (!t) return d;
    const f = row[2];
    let next: RecipeTerm = t;
    if (f === 'n' || f === 'l' || f === 'm') {
      const q = checkQuantumNumbers(fieldText(d, `row.${id}.n`), fieldText(d, `row.${id}.l`), fieldText(d, `row.${id}.m`));
      if (!q.values) return d;
      next = { ...t, ...q.values };
    } else {
      if (fieldError(d, `row.${id}.mag`) || fieldError(d, `row.${id}.phase`)) return d;
      // Only the typed part changes; the other keeps its exact value.
      const p = complexToPolar(t.re, t.im ?? 0);
      const mag = `row.${id}.mag` in d.text ? num(d.text[`row.${id}.mag`]) : p.mag;
      const phase = `row.${id}.phase` in d.text ? num(d.text[`row.${id}.phase`]) : p.phaseDeg;
      next = { ...t, ...polarToComplex(mag, phase) };
    }
    const terms = r.content.terms.map((x, k) => (k === i ? next : x));
    return withTerms(d, terms);
  }
  if (key === 'canvas.widthMm' || key === 'canvas.heightMm') {
    const k = key === 'canvas.widthMm' ? 'widthMm' : 'heightMm';
    return { ...d, recipe: { ...r, canvas: { ...r.canvas, [k]: num(v) } } };
  }
  if (key === 'label.text') return { ...d, recipe: { ...r, annotations: { ...r.annotations, label: { ...r.annotations.label, text: v.trim() ? v : undefined } } } };
  if (key === 'caption') return { ...d, recipe: { ...r, annotations: { ...r.annotations, caption: v.trim() ? v : undefined } } };
  return d;
}

function toRecipeTerm(t: Term): RecipeTerm {
  return { n: t.n, l: t.l, m: t.m, basis: t.basis, re: t.re, im: t.im ?? 0 };
}

// ---------------------------------------------------------------- reducer

export function draftReducer(d: ComposerDraft, a: DraftAction): ComposerDraft {
  const r = d.recipe;
  switch (a.type) {
    case 'mode':
      // A view change only: the terms stay exactly as they are.
      return { ...d, mode: a.mode, replacing: false, text: dropText(d.text, ['label', 'n', 'l', 'm']) };
    case 'replacing':
      return { ...d, replacing: a.open };
    case 'replace': {
      const terms = a.terms.map((t) => toRecipeTerm(t as Term));
      const next = withTerms({ ...d, replacing: false, text: dropText(d.text, ['label', 'n', 'l', 'm', 'row']) }, terms, newIds(terms.length));
      return { ...next, recipe: { ...next.recipe, label: a.label || next.recipe.label } };
    }
    case 'text': {
      const withText = { ...d, text: { ...d.text, [a.key]: a.value } };
      return applyText(withText, a.key);
    }
    case 'basis': {
      const t = singleUnitTerm(r.content.terms);
      if (!t || t.basis === a.basis) return d;
      return withTerms(d, [{ ...t, basis: a.basis }]);
    }
    case 'row-basis': {
      const i = d.rowIds.indexOf(a.id);
      if (i < 0) return d;
      return withTerms(d, r.content.terms.map((t, k) => (k === i ? { ...t, basis: a.basis } : t)));
    }
    case 'add-row': {
      if (r.content.terms.length >= RECIPE_LIMITS.termsMax) return d;
      // A new row starts at |c| = 0, so adding it does not change ψ until a coefficient is typed.
      return withTerms(d, [...r.content.terms, { n: 2, l: 1, m: 0, basis: 'real', re: 0, im: 0 }], [...d.rowIds, ...newIds(1)]);
    }
    case 'remove-row': {
      const i = d.rowIds.indexOf(a.id);
      if (i < 0) return d;
      return withTerms(
        { ...d, text: dropText(d.text, [`row.${a.id}`]) },
        r.content.terms.filter((_, k) => k !== i),
        d.rowIds.filter((x) => x !== a.id),
      );
    }
    case 'normalise': {
      const terms = r.content.terms.map((t) => ({ ...t, im: t.im ?? 0 }));
      const s = normalisation(terms);
      if (!s || s.sumSquares === 0) return d;
      const k = Math.sqrt(s.sumSquares);
      return withTerms({ ...d, text: dropText(d.text, d.rowIds.map((id) => `row.${id}`)) }, terms.map((t) => ({ ...t, re: t.re / k, im: t.im / k })));
    }
    case 'hybrid': {
      const key = hybridLabel(a.set, a.member);
      const terms = parseOrbitalLabel(key).state.terms.map(toRecipeTerm);
      return draftReducer(d, { type: 'replace', terms, label: prettyLabel(key) });
    }
    case 'surface':
      return { ...d, recipe: { ...r, surface: a.surface }, text: dropText(d.text, ['percent', 'psi']) };
    case 'look':
      return { ...d, recipe: { ...r, stage: a.stage, annotations: a.annotations } };
    case 'canvas':
      return { ...d, recipe: { ...r, canvas: { ...r.canvas, ...a.canvas } }, text: dropText(d.text, Object.keys(a.canvas).map((k) => `canvas.${k}`)) };
    case 'grid':
      return { ...d, recipe: { ...r, grid: { ...r.grid, ...a.grid } }, text: 'n' in a.grid ? dropText(d.text, ['grid']) : d.text };
    case 'palette': {
      const stage = a.background && !r.stage.background.transparent ? { ...r.stage, background: { ...r.stage.background, color: a.background } } : r.stage;
      return { ...d, recipe: { ...r, palette: a.palette, stage } };
    }
    case 'unit': {
      if (r.annotations.scaleBar.unit === a.unit) return d;
      const { length: _length, ...bar } = r.annotations.scaleBar;
      return { ...d, recipe: { ...r, annotations: { ...r.annotations, scaleBar: { ...bar, unit: a.unit } } } };
    }
    case 'load': {
      const next = createDraft(a.recipe, { isNew: d.isNew, title: a.keepTitle ? d.title : '' });
      return a.keepMode && viewShowsState(d.mode, a.recipe.content.terms) ? { ...next, mode: d.mode } : next;
    }
    default:
      return d;
  }
}

/** The draft differs from what was saved (canonical JSON, so key order does not count). */
export function isDirty(d: ComposerDraft, saved: Recipe | null): boolean {
  return saved === null || canonicalJson(d.recipe) !== canonicalJson(saved);
}
