import { checkSwatchbook } from '@psiform/colour';
import {
  COLOUR_GATE,
  FIGURE_STATUS_LABELS,
  parseRecipe,
  type FigureStatus,
  type HouseStyleEffect,
  type HouseStyleImpactDto,
  type HouseStyleImpactFigureDto,
  type HouseStyleImpactFor,
  type SwatchbookColorsDto,
} from '@psiform/contracts';
import { recipeChanges } from '@psiform/print';
import { withPalette } from '@psiform/server';

/** Only figures still being worked on are re-rendered; proofs in review, approved and released ones stay as they are. */
export const RERENDERABLE: readonly FigureStatus[] = ['draft', 'changes_requested'];

/**
 * The swatchbook's colour checks as a gate (the same checkSwatchbook the swatchbook page shows): error-level
 * warnings are failures that block without a written reason; the other warnings are reported only.
 */
export function colourGate(colors: SwatchbookColorsDto): HouseStyleImpactDto['gate'] {
  const { warnings } = checkSwatchbook(colors);
  const failures = warnings.filter((w) => w.level === 'error').map((w) => w.message);
  return { name: COLOUR_GATE, failures, warnings: warnings.filter((w) => w.level !== 'error').map((w) => w.message), blocks: failures.length > 0 };
}

export interface ImpactInput {
  figure: { id: string; title: string; status: FigureStatus; currentVersion: number };
  recipe: unknown;
}

export interface ImpactBook {
  id: string;
  name: string;
  version: number;
  colors: SwatchbookColorsDto;
}

/**
 * What pinning a swatchbook (`pin`) or a batch re-render with the pinned one (`rerender`) does to each figure of the
 * publication: its colour changes in words, the effect and why. One rule for the confirmation the client shows and for
 * what the re-render does (RerenderService acts on exactly the 'rerender' rows; saveVersion's idempotence stays the
 * last word). A pin changes no figure now: the house palette reaches a figure at its next save (saveVersion).
 */
export function houseStyleImpact(figures: ImpactInput[], book: ImpactBook, mode: HouseStyleImpactFor, opts: { allowOverride?: boolean } = {}): HouseStyleImpactFigureDto[] {
  return figures.map(({ figure, recipe: stored }) => {
    const base = { figureId: figure.id, title: figure.title, status: figure.status, versionNumber: figure.currentVersion };
    const parsed = parseRecipe(stored);
    if (!parsed.ok) return { ...base, usesSwatchbook: false, changes: [], effect: 'kept' as const, reason: 'its stored recipe is not valid', affected: false };
    const recipe = parsed.recipe;
    const usesSwatchbook = recipe.palette.swatchbookId === book.id;
    const palette = { swatchbookId: book.id, positive: book.colors.positive, negative: book.colors.negative, background: book.colors.background };
    const changes = recipeChanges(recipe, withPalette(recipe, palette)).filter((c) => c.path !== 'palette.swatchbookId');
    const editable = RERENDERABLE.includes(figure.status);
    const state = FIGURE_STATUS_LABELS[figure.status];
    let effect: HouseStyleEffect = 'kept';
    let reason: string;
    if (mode === 'rerender') {
      if (!usesSwatchbook) reason = 'does not use the pinned swatchbook';
      else if (!editable) reason = `status is ${figure.status}: only draft and changes_requested figures are re-rendered`;
      else if (changes.length === 0) reason = `already has the colours of swatchbook "${book.name}" v${book.version}`;
      else {
        effect = 'rerender';
        reason = `${state}: a new version in these colours, then its mesh`;
      }
    } else if (changes.length === 0) {
      reason = 'already in these colours';
    } else if (opts.allowOverride) {
      // Not enforced at save: only a batch re-render changes the colours of the figures that name the swatchbook.
      reason = usesSwatchbook ? 'uses this swatchbook: a batch re-render gives it these colours' : 'may keep its own colours (the house style allows figures to override them)';
    } else if (editable) {
      effect = 'next_save';
      reason = `${state}: takes these colours at its next save`;
    } else {
      reason = `${state}: keeps the colours it has until a new version`;
    }
    return { ...base, usesSwatchbook, changes, effect, reason, affected: usesSwatchbook || changes.length > 0 };
  });
}
