import type { Recipe } from '@psiform/contracts';
import { figureMetadata, type FigureMetadata, type MeshResultLike } from '@psiform/print';
import { plotPalette } from './svg-export';

/** The metadata sheet (caption, alt text, model note) of a version from its mesh statistics: one place for every job. */
export function figureWords(recipe: Recipe, meshStats: Record<string, unknown>, engineVersion: string, generatedAt: string): FigureMetadata {
  // The mesh statistics ARE the summary (@psiform/meshing summariseSurfaces): the all-space fraction with its
  // error, the part inside the box, the grids and every warning travel with the figure into caption and sheet.
  const result = meshStats as unknown as MeshResultLike;
  const palette = plotPalette(recipe);
  return figureMetadata({
    recipe: recipe as never,
    result,
    engineVersion,
    palette: { positive: palette.positive, negative: palette.negative, background: palette.background, swatchbookId: recipe.palette.swatchbookId },
    generatedAt,
  });
}

/** Alt text as preflight reads it: the short text, and the caption as the long description. */
export function altOf(meta: Pick<FigureMetadata, 'altText' | 'caption'>): { short: string; long: string } {
  return { short: meta.altText, long: meta.caption };
}
