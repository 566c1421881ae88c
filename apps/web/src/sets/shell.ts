// "Every orbital of one shell": the real orbitals of shell n (optionally one subshell l), matched to existing
// figures of a publication by label, and recipes for the ones that are missing.
import { RECIPE_DEFAULTS, RECIPE_VERSION, type FigureSummaryDto } from '@psiform/contracts';
import { parseOrbitalLabel, prettyLabel } from '@psiform/orbitals';

/** Real-form names per l (s; p_x p_y p_z; the five real d; the seven real f of the general set), common practice. */
const REAL_NAMES: readonly (readonly string[])[] = [
  ['s'],
  ['px', 'py', 'pz'],
  ['dxy', 'dyz', 'dxz', 'dx2-y2', 'dz2'],
  ['fz3', 'fxz2', 'fyz2', 'fxyz', 'fz(x2-y2)', 'fx(x2-3y2)', 'fy(3x2-y2)'],
];
export const SHELL_MAX_N = 7;
const L_LETTERS = 'spdf';

export interface ShellOrbital {
  /** Parser key, e.g. "2px". */
  key: string;
  /** Display label, e.g. "2p_x" (stored as the recipe label). */
  label: string;
}

/** The orbitals of shell n (l < min(n, 4)), or only subshell l when given. Throws on n/l out of range. */
export function shellOrbitals(n: number, l: number | null = null): ShellOrbital[] {
  if (!Number.isInteger(n) || n < 1 || n > SHELL_MAX_N) throw new RangeError(`n must be a whole number from 1 to ${SHELL_MAX_N}`);
  if (l !== null && (!Number.isInteger(l) || l < 0 || l >= Math.min(n, 4))) {
    throw new RangeError(`l must be from 0 to ${Math.min(n, 4) - 1} for n = ${n} (${L_LETTERS.slice(0, Math.min(n, 4)).split('').join(', ')})`);
  }
  const ls = l === null ? [...Array(Math.min(n, 4)).keys()] : [l];
  return ls.flatMap((li) => REAL_NAMES[li].map((name) => ({ key: `${n}${name}`, label: prettyLabel(`${n}${name}`) })));
}

/** Label comparison that ignores case, '_', braces, spaces and ²/2 differences. */
export function labelKey(s: string | undefined): string {
  return (s ?? '')
    .toLowerCase()
    .replace(/²/g, '2')
    .replace(/³/g, '3')
    .replace(/[−–]/g, '-')
    .replace(/[\s_{}()^#-]/g, '');
}

/** For each wanted orbital, the first figure (in the given order) whose label matches, else null. */
export function matchFigures(wanted: ShellOrbital[], figures: Pick<FigureSummaryDto, 'id' | 'label'>[]): (string | null)[] {
  const used = new Set<string>();
  return wanted.map((w) => {
    const k = labelKey(w.key);
    const f = figures.find((x) => !used.has(x.id) && (labelKey(x.label) === k || labelKey(x.label) === labelKey(w.label)));
    if (!f) return null;
    used.add(f.id);
    return f.id;
  });
}

/** A recipe document for one orbital (Z = 1; the server fills the stage, palette and canvas defaults). */
export function orbitalRecipe(o: ShellOrbital, gridN: number | 'auto' = RECIPE_DEFAULTS.gridN, fraction: number = RECIPE_DEFAULTS.fraction) {
  const parsed = parseOrbitalLabel(o.key);
  return {
    version: RECIPE_VERSION,
    label: o.label,
    content: { Z: 1, terms: parsed.state.terms.map((t) => ({ n: t.n, l: t.l, m: t.m, basis: t.basis, re: t.re, im: t.im })) },
    grid: { n: gridN, extent: 'auto' as const },
    surface: { rule: 'enclosed' as const, fraction },
  };
}
