// Pieces of the Composer's content (the draft model is ./draft.ts): coefficients as magnitude and phase,
// Σ|c|², hybrid tables, the searchable label list, Z and ion names.
import { zProblem } from '@psiform/contracts';
import { L_LETTERS, normaliseState, prettyLabel, stateNormSquared, type OrbitalState, type Term } from '@psiform/orbitals';
import { ionName } from '@psiform/print';

export const HYBRID_MEMBERS: Record<string, number> = { sp: 2, sp2: 3, sp3: 4, sp3d: 5, sp3d2: 6 };
export const HYBRID_PRETTY: Record<string, string> = { sp: 'sp', sp2: 'sp²', sp3: 'sp³', sp3d: 'sp³d', sp3d2: 'sp³d²' };

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

export function trimNumber(x: number, digits = 6): string {
  if (Math.abs(x) < 1e-12) return '0';
  return String(Number(x.toFixed(digits)));
}

export function zError(text: string): string | null {
  if (text.trim() === '') return 'Enter the nuclear charge Z.';
  const p = zProblem(num(text));
  return p ? `Z ${p}.` : null;
}

/** One-electron ions by Z: H, He⁺, Li²⁺, Be³⁺, B⁴⁺, C⁵⁺ … (from @psiform/print). */
export function ionLabel(Z: number): string {
  try {
    return ionName(Z);
  } catch {
    return '';
  }
}

export function hybridLabel(set: string, member: number): string {
  return `${set}#${member}`;
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
