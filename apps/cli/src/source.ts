import * as fs from 'node:fs';
import { RECIPE_LIMITS, RECIPE_VERSION, parseRecipe, quantumNumberError, type Recipe, type RecipeIssue } from '@psiform/contracts';
import { UsageError, oneLine } from './errors';
import { parseIntOption, parseNlm, parseNumberOption } from './numbers';
import { stateForLabel, stateForNlm } from './engine';

/** --grid default: the engine picks the grid that resolves the surface (see the recipe schema). */
export const DEFAULT_GRID = 'auto' as const;
export const DEFAULT_ENCLOSE = 0.9;

/** The options every state-taking command shares (all still raw strings from the command line). */
export interface StateOptions {
  orbital?: string;
  nlm?: string;
  complex?: boolean;
  recipe?: string;
  Z?: string;
  grid?: string;
  extent?: string;
  enclose?: string;
  iso?: string;
}

export const STATE_OPTION_SPEC = {
  orbital: { type: 'string' },
  nlm: { type: 'string' },
  complex: { type: 'boolean' },
  recipe: { type: 'string' },
  Z: { type: 'string' },
  grid: { type: 'string' },
  extent: { type: 'string' },
} as const;

export const SURFACE_OPTION_SPEC = {
  enclose: { type: 'string' },
  iso: { type: 'string' },
} as const;

/** Spectroscopic letters for l = 0..11 (j is skipped by common practice). */
const L_LETTERS = 'spdfghiklmno';

export function nlmLabel(n: number, l: number, m: number, complex: boolean): string {
  const letter = L_LETTERS[l] ?? `(l=${l})`;
  return `${n}${letter} m=${m}${complex ? ' complex' : m === 0 ? '' : ' real'}`;
}

interface ParsedNumbers {
  Z?: number;
  grid?: number | 'auto';
  extent?: number;
  surface?: { rule: 'enclosed'; fraction: number } | { rule: 'psi'; value: number };
}

function parseShared(o: StateOptions, withSurface: boolean): ParsedNumbers {
  const out: ParsedNumbers = {};
  if (o.Z !== undefined) out.Z = parseIntOption('--Z', o.Z, { min: 1, max: RECIPE_LIMITS.zMax });
  if (o.grid !== undefined) out.grid = o.grid === 'auto' ? 'auto' : parseIntOption('--grid', o.grid, { min: RECIPE_LIMITS.gridMin, max: RECIPE_LIMITS.gridMax });
  if (o.extent !== undefined) {
    const e = parseNumberOption('--extent', o.extent);
    if (!(e > 0 && e <= RECIPE_LIMITS.extentMax)) throw new UsageError(`--extent must be in (0, ${RECIPE_LIMITS.extentMax}] a0 (got ${e})`);
    out.extent = e;
  }
  if (withSurface) {
    if (o.enclose !== undefined && o.iso !== undefined) throw new UsageError('give either --enclose or --iso, not both');
    if (o.enclose !== undefined) {
      const f = parseNumberOption('--enclose', o.enclose);
      if (!(f > 0 && f < 1)) throw new UsageError(`--enclose must be a fraction between 0 and 1, exclusive (got ${o.enclose})`);
      out.surface = { rule: 'enclosed', fraction: f };
    } else if (o.iso !== undefined) {
      const v = parseNumberOption('--iso', o.iso);
      if (!(v > 0)) throw new UsageError(`--iso must be a positive value of |psi| in a0^-3/2 (got ${o.iso})`);
      out.surface = { rule: 'psi', value: v };
    }
  }
  return out;
}

function describeIssues(issues: RecipeIssue[], withPath: boolean): string {
  return issues.map((i) => (withPath ? `${i.path}: ${i.message}` : i.message)).join('; ');
}

function readRecipeFile(file: string): unknown {
  let text: string;
  try {
    text = fs.readFileSync(file, 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a folder' : code === 'EACCES' ? 'permission denied' : (err as Error).message;
    throw new UsageError(`cannot read recipe '${file}': ${why}`);
  }
  try {
    return JSON.parse(text);
  } catch (err) {
    throw new UsageError(`recipe '${file}' is not valid JSON: ${oneLine((err as Error).message)}`);
  }
}

/**
 * Turns --orbital / --nlm / --recipe plus the shared options into a validated recipe (defaults filled).
 * Command-line values are checked here with messages naming the flag; the recipe schema then checks
 * the whole document, so the CLI accepts exactly what the API would.
 */
export function resolveRecipe(o: StateOptions, opts: { withSurface: boolean }): Recipe {
  const sources = (['orbital', 'nlm', 'recipe'] as const).filter((k) => o[k] !== undefined);
  if (sources.length === 0) throw new UsageError('give the state with one of --orbital LABEL, --nlm n,l,m or --recipe FILE');
  if (sources.length > 1) throw new UsageError(`give only one of --orbital, --nlm, --recipe (got ${sources.map((s) => '--' + s).join(' and ')})`);
  if (o.complex && o.nlm === undefined) throw new UsageError('--complex goes with --nlm (orbital labels such as 2pz name real orbitals)');

  const nums = parseShared(o, opts.withSurface);

  if (o.recipe !== undefined) {
    const doc = readRecipeFile(o.recipe);
    // Command-line values override the file; the schema validates the result as a whole.
    if (doc !== null && typeof doc === 'object' && !Array.isArray(doc)) {
      const d = doc as Record<string, any>;
      if (nums.Z !== undefined && d.content && typeof d.content === 'object') d.content.Z = nums.Z;
      if (nums.grid !== undefined || nums.extent !== undefined) {
        d.grid = d.grid && typeof d.grid === 'object' ? d.grid : {};
        if (nums.grid !== undefined) d.grid.n = nums.grid;
        if (nums.extent !== undefined) d.grid.extent = nums.extent;
      }
      if (nums.surface) d.surface = nums.surface;
    }
    const parsed = parseRecipe(doc);
    if (!parsed.ok) throw new UsageError(`recipe '${o.recipe}': ${describeIssues(parsed.issues, true)}`);
    return parsed.recipe;
  }

  let label: string;
  let content: { Z: number; terms: unknown[] };
  if (o.orbital !== undefined) {
    const s = stateForLabel(o.orbital);
    label = s.label;
    content = { Z: nums.Z ?? 1, terms: s.terms };
  } else {
    const [n, l, m] = parseNlm(o.nlm!);
    const complex = !!o.complex;
    // The one quantum-number rule (libs/contracts quantum.ts), first broken part in reading order.
    const broken = quantumNumberError(n, l, m);
    if (broken) throw new UsageError(broken);
    label = nlmLabel(n, l, m, complex);
    content = { Z: nums.Z ?? 1, terms: stateForNlm(n, l, m, complex) };
  }

  const doc = {
    version: RECIPE_VERSION,
    label,
    content,
    grid: { n: nums.grid ?? DEFAULT_GRID, extent: nums.extent ?? 'auto' },
    surface: nums.surface ?? { rule: 'enclosed', fraction: DEFAULT_ENCLOSE },
  };
  const parsed = parseRecipe(doc);
  if (!parsed.ok) throw new UsageError(describeIssues(parsed.issues, true));
  return parsed.recipe;
}
