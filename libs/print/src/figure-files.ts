// The files of a figure as the worker writes them and as the Studio plans them before an export: the 2D companions
// (radial plot, section map) drawn from a recipe, the words of its metadata sheet, and the preflight subject of a
// file that is about to be made. One owner, so the preflight shown before an export checks the same drawing and
// the same sizes the export job then writes (and checks again on the written bytes).
import { pressCondition, type ColourMode, type PressConditionId, type Recipe, type SectionPlane } from '@psiform/contracts';
import { autoExtent, compileState } from '@psiform/orbitals';
import { recipeState, sectionPlane } from '@psiform/meshing';
import { figureTextFacts } from './figure-text';
import { usesPhaseKey } from './phase-key';
import { displayLabel, figureMetadata, type FigureMetadata, type MeshResultLike } from './metadata';
import { svgPrintFacts, type PreflightSubject } from './preflight';
import { radialPlotSvg } from './radial-plot';
import { sectionMapSvg } from './section-map';
import { pixelsFor } from './size';
import type { FontBytes, PlotPalette } from './svg-common';

const { round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

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

const L = 'spdfghiklmnoqrtuv';

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

/** The radial plot or section map of a computed recipe as SVG (fonts embedded when given). */
export function figureSvg(recipe: Recipe, p: SvgParams, fonts: FontBytes | undefined): string {
  const palette = plotPalette(recipe);
  const unit = recipe.annotations.scaleBar.unit;
  const Z = recipe.content.Z;
  if (p.kind === 'radial') {
    const d = dominantTerm(recipe);
    const title = d.single ? undefined : `Radial distribution of the dominant term ${d.n}${L[d.l]} (${round(d.weight * 100)}% of the state), Z = ${Z}`;
    return radialPlotSvg({ n: d.n, l: d.l, Z, palette, widthMm: p.widthMm, heightMm: p.heightMm, unit, fonts, title });
  }
  const state = recipeState(recipe);
  const extent = recipe.grid.extent === 'auto' ? Number(autoExtent(state)) : recipe.grid.extent;
  return sectionMapSvg({
    state, plane: p.plane, offset: p.offset, extent, n: SECTION_SAMPLES, levels: p.levels, palette, widthMm: p.widthMm, heightMm: p.heightMm, fonts, unit,
    // Coloured as the figure's surfaces are: by arg ψ on the swatchbook's wheel (with its key) or by sign.
    colouring: { mode: recipe.phase?.mode ?? 'auto', wheel: recipe.palette.wheel ?? null },
  });
}

/**
 * The coordinate plane a section map shows when nobody chose one (the bundle's): the plane through the nucleus that
 * holds the most of |ψ|² (summed on a coarse 33 × 33 grid of the figure's box), xz first among equals. A state coloured
 * by phase shows its phase where it is largest: the xy plane for m ≠ 0 rings (the whole wheel), xz for 2p_z or 3d_z².
 */
export function sectionPlaneFor(recipe: Recipe): SectionPlane {
  const state = recipeState(recipe);
  const compiled = compileState(state);
  const extent = recipe.grid.extent === 'auto' ? Number(autoExtent(state)) : recipe.grid.extent;
  let best: SectionPlane = 'xz';
  let bestSum = -1;
  for (const plane of ['xz', 'xy', 'yz'] as const) {
    const s = sectionPlane(compiled, { plane, offset: 0, extent, n: 33 });
    let sum = 0;
    for (let i = 0; i < s.values.length; i++) sum += s.values[i] * s.values[i];
    if (sum > bestSum * (1 + 1e-6)) {
      best = plane;
      bestSum = sum;
    }
  }
  return best;
}

/**
 * The 2D companions a bundle carries, in this order: the radial plot, and the section map in sectionPlanesFor's
 * plane (coloured as the figure is, so a figure coloured by phase brings its phase key into the bundle's vector files).
 */
export function bundleCompanions(recipe: Recipe): SvgParams[] {
  const size = { widthMm: recipe.canvas.widthMm, heightMm: recipe.canvas.heightMm };
  return [
    { kind: 'radial', plane: 'xz', offset: 0, levels: 4, ...size },
    { kind: 'section', plane: sectionPlaneFor(recipe), offset: 0, levels: 4, ...size },
  ];
}

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

/** A plot's alt text from its own SVG: the title (short) and title plus description (long). */
export function plotAlt(svg: string): { short: string; long: string } {
  const un = (x: string) => x.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&apos;/g, "'").replace(/&amp;/g, '&');
  const title = un(/<title>([\s\S]*?)<\/title>/.exec(svg)?.[1] ?? '');
  const desc = un(/<desc>([\s\S]*?)<\/desc>/.exec(svg)?.[1] ?? '');
  return { short: title, long: `${title}. ${desc}`.trim() };
}

/** The label the figure prints (the overlay's): the annotation's own text, else the recipe's display label. */
export function printedLabel(recipe: Recipe): string {
  return recipe.annotations.label.text || displayLabel(recipe);
}

/** A file an export is asked to make (the export request, with the colour the export will use filled in). */
export type PlannedFile =
  | { format: 'png'; widthMm: number; heightMm: number; dpi: number }
  | { format: 'tiff'; widthMm: number; heightMm: number; dpi: number; colour: ColourMode; pressCondition: PressConditionId }
  | { format: 'svg'; kind: 'radial' | 'section'; plane?: SectionPlane; widthMm: number; heightMm: number }
  | { format: 'pdf'; kind: 'radial' | 'section'; plane?: SectionPlane; widthMm: number; heightMm: number; colour: ColourMode; pressCondition: PressConditionId };

/**
 * The preflight subject of a file BEFORE it is written: the pixel size and dpi tag the export writes for the asked
 * mm and dpi (pixelsFor, the export's own arithmetic), the colour space and profile it embeds, the text and lines of
 * its 2D layer (rasters) or of the very SVG it will draw (vector files, drawn here with figureSvg), and the alt text
 * it will carry. `rasterAlt` is the figure's alt text (figureWords of the version's mesh statistics); null when the
 * version has no mesh yet, in which case the subject says so and the alt-text rule fails until the mesh exists.
 * The export job checks the written bytes again (the report that travels with the file is that one).
 */
export function plannedSubject(file: PlannedFile, recipe: Recipe, rasterAlt: { short: string; long: string } | null): PreflightSubject {
  const icc = (colour: ColourMode, press: PressConditionId) =>
    colour === 'cmyk' ? { description: pressCondition(press)?.name ?? press, condition: press } : { description: 'sRGB IEC61966-2.1', condition: 'srgb' };
  if (file.format === 'png' || file.format === 'tiff') {
    const facts = figureTextFacts(recipe.annotations, printedLabel(recipe), usesPhaseKey(recipe));
    const colour: ColourMode = file.format === 'tiff' ? file.colour : 'rgb';
    return {
      file: `figure.${file.format === 'tiff' ? 'tif' : 'png'}`,
      format: file.format,
      widthMm: file.widthMm,
      heightMm: file.heightMm,
      raster: { widthPx: pixelsFor(file.widthMm, file.dpi), heightPx: pixelsFor(file.heightMm, file.dpi), dpi: file.dpi, dpiTagged: file.dpi },
      colourSpace: colour,
      icc: file.format === 'tiff' ? icc(file.colour, file.pressCondition) : { description: 'sRGB (PNG sRGB chunk)', condition: 'srgb' },
      texts: facts.texts,
      lines: facts.lines,
      fonts: 'rasterised',
      altText: rasterAlt ?? {},
    };
  }
  const params: SvgParams = { kind: file.kind, plane: file.plane ?? 'xz', offset: 0, levels: 4, widthMm: file.widthMm, heightMm: file.heightMm };
  const svg = figureSvg(recipe, params, undefined);
  const drawn = svgPrintFacts(svg);
  const pdf = file.format === 'pdf';
  return {
    file: `${file.kind}.${file.format}`,
    format: file.format,
    widthMm: file.widthMm,
    heightMm: file.heightMm,
    pageMm: { width: file.widthMm, height: file.heightMm },
    colourSpace: pdf ? file.colour : 'rgb',
    icc: pdf ? icc(file.colour, file.pressCondition) : { description: 'sRGB (SVG colours are sRGB by definition)', condition: 'srgb' },
    texts: drawn.texts,
    lines: drawn.lines,
    fonts: drawn.texts.length ? [{ name: 'Lato', embedded: true, subset: pdf }] : [],
    altText: plotAlt(svg),
  };
}
