// The 2D companions are drawn by @psiform/print (figure-files.ts), the one owner the Studio's preflight also uses.
import type { Recipe } from '@psiform/contracts';
import { figureSvg, type SvgParams } from '@psiform/print';
import { latoFonts, withFallbackWhereNeeded } from './fonts';

export { dominantTerm, figureSvg, plotPalette, PLOT_INK, SECTION_SAMPLES, type SvgParams } from '@psiform/print';

/** The SVG companion as delivered: Lato embedded, and the fallback face too when the text needs it. */
export function companionSvg(recipe: Recipe, p: SvgParams): string {
  return withFallbackWhereNeeded(figureSvg(recipe, p, latoFonts())).svg;
}
