import type { Recipe, SectionPlane } from '@psiform/contracts';
import { autoExtent, type OrbitalState } from '@psiform/orbitals';
import { radialPlotSvg, sectionMapSvg, type FontBytes, type PlotPalette } from '@psiform/print';
import { recipeState as stateOf } from '@psiform/meshing';
import { latoFonts, withFallbackWhereNeeded } from './fonts';

export interface SvgParams {
  kind: 'radial' | 'section';
  plane: SectionPlane;
  offset: number;
  levels: number;
  widthMm: number;
  heightMm: number;
}

/** Ink of the plots' text and axes (the client's ink colour, apps/web styles.css). */
export const PLOT_INK = '#1f1d1a';
/** Samples per side of a section map: odd, so a row and a column of samples lie on the axes. */
export const SECTION_SAMPLES = 201;

/** The recipe's phase colours on its background (white when the stage is transparent: an SVG is printed on paper). */
export function plotPalette(recipe: Recipe): PlotPalette {
  const bg = recipe.stage.background;
  return { positive: recipe.palette.positive, negative: recipe.palette.negative, background: bg.transparent ? '#ffffff' : bg.color, label: PLOT_INK };
}

/**
 * The term the radial plot shows: the largest weight |c|² (the first of equals). A radial plot is of one R_nl;
 * a superposition of different n, l has no single P(r), so the plot names the term it draws and its weight.
 */
export function dominantTerm(recipe: Recipe): { n: number; l: number; weight: number; single: boolean } {
  const terms = recipe.content.terms;
  const w = terms.map((t) => t.re * t.re + t.im * t.im);
  const sum = w.reduce((a, b) => a + b, 0);
  let k = 0;
  for (let i = 1; i < w.length; i++) if (w[i] > w[k]) k = i;
  // Terms sharing n and l share R_nl, so their weights add up for the plot.
  const same = terms.reduce((acc, t, i) => (t.n === terms[k].n && t.l === terms[k].l ? acc + w[i] : acc), 0);
  const single = terms.every((t) => t.n === terms[k].n && t.l === terms[k].l);
  return { n: terms[k].n, l: terms[k].l, weight: sum > 0 ? same / sum : 1, single };
}

const L = 'spdfghiklmnoqrtuv';

export function figureSvg(recipe: Recipe, p: SvgParams, fonts: FontBytes | undefined): string {
  const palette = plotPalette(recipe);
  const unit = recipe.annotations.scaleBar.unit;
  const Z = recipe.content.Z;
  if (p.kind === 'radial') {
    const d = dominantTerm(recipe);
    const title = d.single ? undefined : `Radial distribution of the dominant term ${d.n}${L[d.l]} (${Math.round(d.weight * 100)}% of the state), Z = ${Z}`;
    return radialPlotSvg({ n: d.n, l: d.l, Z, palette, widthMm: p.widthMm, heightMm: p.heightMm, unit, fonts, title });
  }
  const state: OrbitalState = stateOf(recipe);
  const extent = recipe.grid.extent === 'auto' ? Number(autoExtent(state)) : recipe.grid.extent;
  return sectionMapSvg({ state, plane: p.plane, offset: p.offset, extent, n: SECTION_SAMPLES, levels: p.levels, palette, widthMm: p.widthMm, heightMm: p.heightMm, fonts, unit });
}

/** The SVG companion as delivered: Lato embedded, and the fallback face too when the text needs it. */
export function companionSvg(recipe: Recipe, p: SvgParams): string {
  return withFallbackWhereNeeded(figureSvg(recipe, p, latoFonts())).svg;
}
