// The 2D layer of a figure (orbital label, scale bar, caption, axis letters), drawn with Canvas 2D in
// millimetres of the printed figure. The studio draws it over the WebGL canvas; the render page draws it
// into each tile and composites it, so both show the same layer at any resolution.
import { BOHR_RADIUS_ANGSTROM } from '@psiform/orbitals';
import type { Recipe } from '@psiform/contracts';
import { OVERLAY_FAMILY } from './fonts';
import { drawPhaseKey, drawRuns, phaseKeyPlacement, measureRuns, OVERLAY_MM, typeset, UNIT_TEXT, type PhaseColourAt, type TextCanvas, type TextRun } from '@psiform/print';

export type ScaleUnit = Recipe['annotations']['scaleBar']['unit'];

/** Round lengths 1, 2, 5 × 10^k: the largest one not above `target` (common practice for scale bars). */
export function niceLength(target: number): number {
  if (!(target > 0) || !Number.isFinite(target)) return 1;
  const k = Math.floor(Math.log10(target));
  const base = 10 ** k;
  const f = target / base;
  const m = f >= 5 ? 5 : f >= 2 ? 2 : 1;
  // Round off binary noise (0.1 * 3 etc.) to a clean decimal.
  return Number((m * base).toPrecision(6));
}

/** Length in a0 of a scale bar `length` long in `unit`. */
export function barBohr(length: number, unit: ScaleUnit): number {
  return unit === 'angstrom' ? length / BOHR_RADIUS_ANGSTROM : length;
}

/**
 * The scale bar for a view `visibleWidthBohr` wide: the recipe's own length when given, else a round
 * length near a fifth of the width. Returns the length in its unit and as a fraction of the width.
 */
export function chooseScaleBar(visibleWidthBohr: number, unit: ScaleUnit, fixed?: number): { length: number; fraction: number } {
  const widthInUnit = unit === 'angstrom' ? visibleWidthBohr * BOHR_RADIUS_ANGSTROM : visibleWidthBohr;
  const length = fixed && fixed > 0 ? fixed : niceLength(widthInUnit / 5);
  return { length, fraction: barBohr(length, unit) / visibleWidthBohr };
}

export function formatLength(x: number): string {
  return Number(x.toPrecision(4)).toLocaleString('en-GB', { maximumFractionDigits: 4 });
}

/** The figure's length unit as typeset text (Å, or a with a subscript 0): the one typesetter of @psiform/print. */
export function unitRuns(unit: ScaleUnit): TextRun[] {
  return typeset(UNIT_TEXT[unit]);
}

export interface OverlayInput {
  /** Full image size in pixels (the tile offset is applied by the caller's transform). */
  width: number;
  height: number;
  /** Pixels per millimetre of the printed figure. */
  pxPerMm: number;
  annotations: Recipe['annotations'];
  label: string;
  /** Visible width in a0 at the target plane. */
  visibleWidthBohr: number;
  /** Ink colour for text and lines (chosen against the background). */
  ink: string;
  /** Axis letters at image positions (pixels, origin top-left), when axes are shown. */
  axisLetters?: { text: string; x: number; y: number }[];
  fontFamily?: string;
  /** The caption's lines and band (captionLayout); computed here when absent. */
  caption?: CaptionLayout;
  /** A figure coloured by arg ψ: the phase key (the figure's own colour rule), top right of the figure area. */
  phaseKey?: PhaseColourAt;
}

/** The caption set in its own band under the figure: lines, and the band's height in mm. */
export interface CaptionLayout {
  lines: string[];
  /** Height of the band at the bottom of the canvas that holds the caption and nothing of the 3D view. */
  bandMm: number;
}

export const CAPTION_MAX_LINES = 6;

const FAMILY = OVERLAY_FAMILY;

/**
 * Lays the caption out for a canvas `widthMm` wide, measuring with `ctx` at `pxPerMm`: the lines (at most
 * CAPTION_MAX_LINES, the last ending in … when cut) and the band they need. The 3D view is drawn only above the
 * band, so a caption never covers the lobes. Same numbers on screen and in print (lengths in mm of the figure).
 */
export function captionLayout(ctx: TextCanvas, caption: string | undefined, widthMm: number, pxPerMm: number, family = FAMILY): CaptionLayout {
  const text = caption?.trim();
  if (!text) return { lines: [], bandMm: 0 };
  const px = OVERLAY_MM.caption * pxPerMm;
  ctx.font = font(px, family, 400);
  const all = wrap(ctx as CanvasRenderingContext2D, text, (widthMm - 2 * OVERLAY_MM.margin) * pxPerMm);
  const lines = all.slice(0, CAPTION_MAX_LINES);
  if (all.length > CAPTION_MAX_LINES) lines[CAPTION_MAX_LINES - 1] = `${lines[CAPTION_MAX_LINES - 1].replace(/\s+\S*$/, '')} …`;
  const bandMm = OVERLAY_MM.margin + lines.length * OVERLAY_MM.caption * 1.3 + OVERLAY_MM.margin * 0.5;
  return { lines, bandMm };
}

// Sizes in mm of the printed figure and the subscript scale live in @psiform/print (preflight reads them too).
export { OVERLAY_MM, SUBSCRIPT_SCALE } from '@psiform/print';

function font(px: number, family: string, weight = 400): string {
  return `${weight} ${px.toFixed(2)}px ${family}`;
}

function wrap(ctx: CanvasRenderingContext2D, text: string, maxWidth: number): string[] {
  const lines: string[] = [];
  for (const para of text.split(/\n/)) {
    let line = '';
    for (const word of para.split(/\s+/).filter(Boolean)) {
      const next = line ? `${line} ${word}` : word;
      if (ctx.measureText(next).width > maxWidth && line) {
        lines.push(line);
        line = word;
      } else line = next;
    }
    lines.push(line);
  }
  return lines;
}

/**
 * Draws the label (top left), scale bar (bottom right of the figure area), caption (in its own band at the
 * bottom, under the figure area) and axis letters. Names and units are typeset (real subscripts).
 */
export function drawOverlay(ctx: CanvasRenderingContext2D, o: OverlayInput): void {
  const family = o.fontFamily ?? FAMILY;
  const mm = o.pxPerMm;
  const margin = OVERLAY_MM.margin * mm;
  const cap = o.caption ?? captionLayout(ctx, o.annotations.caption, o.width / mm, mm, family);
  const figureBottom = o.height - cap.bandMm * mm;
  ctx.save();
  ctx.fillStyle = o.ink;
  ctx.strokeStyle = o.ink;
  ctx.textBaseline = 'alphabetic';

  if (o.annotations.label.show && o.label) {
    const px = OVERLAY_MM.label * mm;
    drawRuns(ctx, typeset(o.label), margin, margin + px * 0.8, px, family, 700);
  }

  const bar = o.annotations.scaleBar;
  if (bar.show && o.visibleWidthBohr > 0) {
    const { length, fraction } = chooseScaleBar(o.visibleWidthBohr, bar.unit, bar.length);
    const barPx = fraction * o.width;
    const textPx = OVERLAY_MM.small * mm;
    const x1 = o.width - margin;
    const x0 = x1 - barPx;
    const yBar = figureBottom - margin;
    ctx.lineWidth = OVERLAY_MM.bar * mm;
    ctx.lineCap = 'butt';
    ctx.beginPath();
    ctx.moveTo(x0, yBar);
    ctx.lineTo(x1, yBar);
    // end ticks
    ctx.moveTo(x0, yBar - 0.8 * mm);
    ctx.lineTo(x0, yBar + 0.001);
    ctx.moveTo(x1, yBar - 0.8 * mm);
    ctx.lineTo(x1, yBar + 0.001);
    ctx.stroke();
    const runs: TextRun[] = [{ text: `${formatLength(length)} `, script: 'base' }, ...unitRuns(bar.unit)];
    const w = measureRuns(ctx, runs, textPx, family, 400);
    drawRuns(ctx, runs, (x0 + x1) / 2 - w / 2, yBar - 1.4 * mm, textPx, family, 400);
  }

  if (o.phaseKey) {
    const { cx, cy, r, fontPx } = phaseKeyPlacement(o.width, mm);
    drawPhaseKey(ctx, { cx, cy, r, colourAt: o.phaseKey, ink: o.ink, fontPx, fontFamily: family, title: 'arg ψ' });
  }

  if (cap.lines.length) {
    const px = OVERLAY_MM.caption * mm;
    ctx.font = font(px, family, 400);
    const lh = px * 1.3;
    let y = figureBottom + OVERLAY_MM.margin * 0.5 * mm + px;
    for (const line of cap.lines) {
      ctx.fillText(line, margin, y);
      y += lh;
    }
  }

  if (o.axisLetters?.length) {
    const px = OVERLAY_MM.axisLetter * mm;
    ctx.font = font(px, family, 400);
    ctx.textAlign = 'center';
    ctx.textBaseline = 'middle';
    for (const a of o.axisLetters) ctx.fillText(a.text, a.x, a.y);
  }
  ctx.restore();
}

/** Ink that reads on the background: near-black on light, near-white on dark (relative luminance, WCAG 2.x). */
export function inkFor(background: string | null): string {
  if (!background) return '#1f1d1a';
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(background);
  if (!m) return '#1f1d1a';
  const lin = (h: string) => {
    const c = parseInt(h, 16) / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  };
  const L = 0.2126 * lin(m[1]) + 0.7152 * lin(m[2]) + 0.0722 * lin(m[3]);
  return L > 0.18 ? '#1f1d1a' : '#f4f1ea';
}
