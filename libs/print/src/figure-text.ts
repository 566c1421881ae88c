// Sizes of the figure's 2D layer (label, scale bar, caption, axis letters) in mm of the printed figure. One owner:
// the studio's overlay (apps/web scene/overlay.ts) draws with these, and preflight reads them to state the
// effective font sizes and line weights of a raster export (which carries its text as pixels).
import type { Recipe } from '@psiform/contracts';
import { mmToPt } from './preflight';
import { SCRIPT_METRICS, typeset } from './typeset';

/** Sizes in mm of the printed figure (our choice; readable at a single-column width). */
export const OVERLAY_MM = { margin: 3, label: 3.6, small: 2.4, caption: 2.2, bar: 0.35, axisLetter: 2.6, keyRadius: 4 } as const;
/** Sub- and superscripts are set at this fraction of their text's size (the typesetter's, libs/print typeset.ts). */
export const SUBSCRIPT_SCALE = SCRIPT_METRICS.size;

/**
 * Every text size and line weight the figure's 2D layer prints at its own size, subscripts at their own size.
 * `label` is the display label, read by the one typesetter (typeset.ts) for its sub- and superscripts; `phaseKey`
 * when the figure is coloured by arg ψ and so carries the phase key.
 */
export function figureTextFacts(annotations: Recipe['annotations'], label: string, phaseKey = false): { texts: { what: string; sizePt: number }[]; lines: { what: string; weightPt: number }[] } {
  const texts: { what: string; sizePt: number }[] = [];
  const lines: { what: string; weightPt: number }[] = [];
  if (annotations.label.show && label) {
    texts.push({ what: 'orbital label', sizePt: mmToPt(OVERLAY_MM.label) });
    if (typeset(label).some((r) => r.script !== 'base')) texts.push({ what: 'orbital label subscript', sizePt: mmToPt(OVERLAY_MM.label * SUBSCRIPT_SCALE) });
  }
  if (annotations.scaleBar.show) {
    texts.push({ what: 'scale bar length', sizePt: mmToPt(OVERLAY_MM.small) });
    if (annotations.scaleBar.unit === 'bohr') texts.push({ what: 'scale bar unit subscript (a₀)', sizePt: mmToPt(OVERLAY_MM.small * SUBSCRIPT_SCALE) });
    lines.push({ what: 'scale bar', weightPt: mmToPt(OVERLAY_MM.bar) });
  }
  if (annotations.caption?.trim()) texts.push({ what: 'caption', sizePt: mmToPt(OVERLAY_MM.caption) });
  if (annotations.axes) texts.push({ what: 'axis letters', sizePt: mmToPt(OVERLAY_MM.axisLetter) });
  // A complex state's phase key (phase-key.ts): its title and marks at the small size.
  if (phaseKey) texts.push({ what: 'phase key marks', sizePt: mmToPt(OVERLAY_MM.small) });
  return { texts, lines };
}
