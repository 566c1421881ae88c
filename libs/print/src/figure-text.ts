// Sizes of the figure's 2D layer (label, scale bar, caption, axis letters) in mm of the printed figure. One owner:
// the studio's overlay (apps/web scene/overlay.ts) draws with these, and preflight reads them to state the
// effective font sizes and line weights of a raster export (which carries its text as pixels).
import type { Recipe } from '@psiform/contracts';
import { mmToPt } from './preflight';

/** Sizes in mm of the printed figure (our choice; readable at a single-column width). */
export const OVERLAY_MM = { margin: 3, label: 3.6, small: 2.4, caption: 2.2, bar: 0.35, axisLetter: 2.6 } as const;
/** Subscripts are set at this fraction of their text's size (and dropped by 0.22 em). */
export const SUBSCRIPT_SCALE = 0.68;

/**
 * Every text size and line weight the figure's 2D layer prints at its own size, subscripts at their own size.
 * `label` is the display label (a '_' starts a subscript, as labelRuns reads it).
 */
export function figureTextFacts(annotations: Recipe['annotations'], label: string): { texts: { what: string; sizePt: number }[]; lines: { what: string; weightPt: number }[] } {
  const texts: { what: string; sizePt: number }[] = [];
  const lines: { what: string; weightPt: number }[] = [];
  if (annotations.label.show && label) {
    texts.push({ what: 'orbital label', sizePt: mmToPt(OVERLAY_MM.label) });
    if (label.includes('_')) texts.push({ what: 'orbital label subscript', sizePt: mmToPt(OVERLAY_MM.label * SUBSCRIPT_SCALE) });
  }
  if (annotations.scaleBar.show) {
    texts.push({ what: 'scale bar length', sizePt: mmToPt(OVERLAY_MM.small) });
    if (annotations.scaleBar.unit === 'bohr') texts.push({ what: 'scale bar unit subscript (a₀)', sizePt: mmToPt(OVERLAY_MM.small * SUBSCRIPT_SCALE) });
    lines.push({ what: 'scale bar', weightPt: mmToPt(OVERLAY_MM.bar) });
  }
  if (annotations.caption?.trim()) texts.push({ what: 'caption', sizePt: mmToPt(OVERLAY_MM.caption) });
  if (annotations.axes) texts.push({ what: 'axis letters', sizePt: mmToPt(OVERLAY_MM.axisLetter) });
  return { texts, lines };
}
