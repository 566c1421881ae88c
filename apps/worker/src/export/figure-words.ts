import type { Recipe } from '@psiform/contracts';
import { figureMetadata, type FigureMetadata, type MeshResultLike } from '@psiform/print';
import { plotPalette } from './svg-export';

/** The metadata sheet (caption, alt text, model note) of a version from its mesh statistics: one place for every job. */
export function figureWords(recipe: Recipe, meshStats: Record<string, unknown>, engineVersion: string, generatedAt: string): FigureMetadata {
  const s = meshStats as { isovalue: number; enclosed: number; grid: { n: number; extent: number }; surfaces?: Array<{ phase: '+' | '-' | 'complex' } & Record<string, unknown>> };
  const result: MeshResultLike = {
    isovalue: s.isovalue,
    enclosed: s.enclosed,
    grid: { n: s.grid.n, extent: s.grid.extent },
    surfaces: (s.surfaces ?? []).map(({ phase, ...stats }) => ({ phase, stats: stats as never })),
  };
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
