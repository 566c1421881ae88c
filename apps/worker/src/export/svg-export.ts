// The 2D companions are drawn by @psiform/print (figure-files.ts), the one owner the Studio's preflight also uses.
export { dominantTerm, figureSvg, plotPalette, PLOT_INK, SECTION_SAMPLES, type SvgParams } from '@psiform/print';
