import { FIGURE_STATUS_LABELS, fractionProblem, gridProblem, zProblem, type FigureStatus, type Recipe } from '@psiform/contracts';
import { formatBytes, gridBytes, isRealState, prettyLabel, type OrbitalState } from '@psiform/orbitals';
import { PSI_UNIT_TEXT } from '@psiform/print';

export function statusLabel(status: FigureStatus | string): string {
  return (FIGURE_STATUS_LABELS as Record<string, string>)[status] ?? status;
}

/** Memory of the sampled grid: n³ float32 values per field, two fields (re, im) for a complex state. */
export function gridMemoryText(n: number, complex: boolean): string {
  const fields = complex ? 'two fields (complex ψ)' : 'one field (real ψ)';
  return `${n}³ × 4 bytes × ${complex ? 2 : 1} = ${formatBytes(gridBytes(n, complex))} for ${fields}`;
}

// Inline messages in the words of libs/contracts limits.ts, the API's own (one wording for client and server).
export function validateGridN(n: number): string | null {
  const p = gridProblem(n);
  return p ? `Grid N ${p}.` : null;
}

export function validateFraction(f: number): string | null {
  const p = fractionProblem(f);
  return p ? `The enclosed fraction ${p}.` : null;
}

export function validateZInt(Z: number): string | null {
  const p = zProblem(Z);
  return p ? `Z ${p}.` : null;
}

function stateOf(recipe: Recipe): OrbitalState {
  return { Z: recipe.content.Z, terms: recipe.content.terms.map((t) => ({ ...t, im: t.im ?? 0 })) };
}

export function recipeIsComplex(recipe: Recipe): boolean {
  try {
    return !isRealState(stateOf(recipe));
  } catch {
    return recipe.content.terms.some((t) => t.basis === 'complex' && t.m !== 0);
  }
}

export function recipeLabel(recipe: Recipe): string {
  if (recipe.label) return recipe.label;
  try {
    return prettyLabel(stateOf(recipe));
  } catch {
    return 'superposition';
  }
}

function percent(f: number): string {
  const p = f * 100;
  return `${Number.isInteger(p) ? p : p.toFixed(1)}%`;
}

/**
 * The recipe stated as the model it is: label, Z, one-electron hydrogen-like model, the surface rule,
 * the grid, and the reminder that many-electron orbitals differ.
 */
export function describeRecipe(recipe: Recipe): string {
  const surface =
    recipe.surface.rule === 'enclosed'
      ? `surface encloses ${percent(recipe.surface.fraction)} of the probability`
      : `surface drawn at |ψ| = ${recipe.surface.value} ${PSI_UNIT_TEXT}`;
  const src = recipe.source;
  if (src?.kind === 'upload') {
    const spacing = src.spacing.every((d) => d === src.spacing[0]) ? `${src.spacing[0]} a0` : `${src.spacing.join(' × ')} a0`;
    return (
      `Uploaded ${src.quantity === 'psi' ? 'ψ' : 'density |ψ|²'} cube ${src.sizes.join(' × ')} at ${spacing} spacing; ${surface}; ` +
      `the model is whatever produced the cube, not Psiform's one-electron hydrogen-like model`
    );
  }
  const extent = recipe.grid.extent === 'auto' ? '' : ` over ±${recipe.grid.extent} a0`;
  return (
    `${recipeLabel(recipe)}, Z = ${recipe.content.Z}, one-electron hydrogen-like model; ` +
    `${surface}; grid ${recipe.grid.n}³${extent} — many-electron orbitals differ`
  );
}

export function formatNumber(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return '—';
  return x.toLocaleString('en-GB', { maximumFractionDigits: digits });
}

export function formatDate(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return d.toLocaleString('en-GB', { year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit' });
}
