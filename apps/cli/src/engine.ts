// Thin adapter between the CLI and the engine libraries, so command code does not depend on their
// exact call shapes. Library RangeErrors about user input become UsageErrors (exit 2).
import type { Recipe } from '@psiform/contracts';
import {
  DEFAULT_GRID_BUDGET_BYTES,
  GridTooLargeError,
  LabelError,
  checkGridFits,
  classicalTurningPoint,
  compileState,
  meanRadius,
  mostProbableRadius,
  parseOrbitalLabel,
  probabilityOutside,
  prettyLabel,
  radialNodes,
  stateFromNlm,
  type CompiledState,
  type OrbitalState,
  type Term,
} from '@psiform/orbitals';
import { UsageError, oneLine } from './errors';

export function stateForLabel(label: string): { label: string; terms: Term[] } {
  try {
    const p = parseOrbitalLabel(label);
    // The typeset form (3d_z², sp³ #2) is what figures print and what the Composer writes.
    return { label: prettyLabel(p.label), terms: p.state.terms };
  } catch (err) {
    if (err instanceof LabelError || err instanceof RangeError) throw new UsageError(oneLine(err.message));
    throw err;
  }
}

export function stateForNlm(n: number, l: number, m: number, complex: boolean): Term[] {
  try {
    return stateFromNlm(n, l, m, { complex }).terms;
  } catch (err) {
    if (err instanceof RangeError) throw new UsageError(oneLine(err.message));
    throw err;
  }
}

export function stateOfRecipe(recipe: Recipe): CompiledState {
  const state: OrbitalState = { Z: recipe.content.Z, terms: recipe.content.terms.map((t) => ({ ...t })) };
  try {
    return compileState(state);
  } catch (err) {
    if (err instanceof RangeError) throw new UsageError(oneLine(err.message));
    throw err;
  }
}

/** Memory budget for the sampled arrays: the library default, or PSIFORM_MEMORY_BUDGET_MB on small machines. */
export function memoryBudgetBytes(): number {
  const raw = process.env.PSIFORM_MEMORY_BUDGET_MB;
  if (raw === undefined || raw === '') return DEFAULT_GRID_BUDGET_BYTES;
  const mb = Number(raw);
  if (!Number.isFinite(mb) || mb <= 0) throw new UsageError(`PSIFORM_MEMORY_BUDGET_MB must be a positive number of megabytes (got '${raw}')`);
  return mb * 1e6;
}

/** Largest points per side whose sampled arrays fit the memory budget (caps automatic grids). */
export function largestGridWithinBudget(complex: boolean): number {
  const budget = memoryBudgetBytes();
  // The extraction field reuses the sampled array; complex states keep Re and Im.
  return Math.max(16, Math.floor(Math.cbrt(budget / (4 * (complex ? 2 : 1)))));
}

export function ensureGridFits(n: number, complex: boolean): void {
  try {
    checkGridFits(n, complex, memoryBudgetBytes());
  } catch (err) {
    if (err instanceof GridTooLargeError || err instanceof RangeError) throw new UsageError(oneLine(err.message));
    throw err;
  }
}

export interface RadialFacts {
  nodes: number[];
  most_probable_r: number;
  mean_r: number;
  turning_point_r: number;
  prob_outside: number | null;
}

export function radialFacts(n: number, l: number, Z: number, outside: number | null): RadialFacts {
  try {
    return {
      nodes: radialNodes(n, l, Z).map(Number),
      most_probable_r: mostProbableRadius(n, l, Z),
      mean_r: meanRadius(n, l, Z),
      turning_point_r: classicalTurningPoint(n, l, Z),
      prob_outside: outside === null ? null : probabilityOutside(n, l, Z, outside),
    };
  } catch (err) {
    if (err instanceof RangeError) throw new UsageError(oneLine(err.message));
    throw err;
  }
}
