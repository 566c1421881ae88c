import type { Recipe } from '@psiform/contracts';

/** A swatchbook's colours as a figure takes them (the house palette, or a batch re-render's). */
export interface PaletteColours {
  swatchbookId: string;
  positive: string;
  negative: string;
  background: string;
}

/** The recipe with the swatchbook's colours copied in: the phases, and the background unless it is transparent. */
export function withPalette(recipe: Recipe, p: PaletteColours): Recipe {
  return {
    ...recipe,
    palette: { ...recipe.palette, swatchbookId: p.swatchbookId, positive: p.positive, negative: p.negative },
    stage: { ...recipe.stage, background: recipe.stage.background.transparent ? recipe.stage.background : { ...recipe.stage.background, color: p.background } },
  };
}
