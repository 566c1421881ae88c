// The 2D layer of a figure (orbital label, scale bar, caption, axis letters), drawn with Canvas 2D in
// millimetres of the printed figure. The studio draws it over the WebGL canvas; the render page draws it
// into each tile and composites it, so both show the same layer at any resolution.
import { BOHR_RADIUS_ANGSTROM } from '@psiform/orbitals';
import type { Recipe } from '@psiform/contracts';
import { OVERLAY_MM, SUBSCRIPT_SCALE } from '@psiform/print';

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

/** A run of text, set normally or as a subscript. */
export interface Run {
  text: string;
  sub: boolean;
}

const SUB_CHARS = /[A-Za-z0-9²³¹⁰⁴⁵⁶⁷⁸⁹−()]/;

/**
 * Splits a display label into runs: '3d_xy' -> 3d + sub(xy); '3d_x²−y²' -> 3d + sub(x²−y²);
 * '0.707·2p_x + 0.707·2p_y' keeps each subscript; 'sp³ #1' has none.
 */
export function labelRuns(label: string): Run[] {
  const runs: Run[] = [];
  let buf = '';
  let i = 0;
  while (i < label.length) {
    const ch = label[i];
    if (ch === '_' && i + 1 < label.length) {
      if (buf) runs.push({ text: buf, sub: false });
      buf = '';
      let j = i + 1;
      let depth = 0;
      while (j < label.length && (SUB_CHARS.test(label[j]) || (depth > 0 && label[j] !== ' '))) {
        if (label[j] === '(') depth += 1;
        if (label[j] === ')') depth -= 1;
        j += 1;
      }
      runs.push({ text: label.slice(i + 1, j), sub: true });
      i = j;
      continue;
    }
    buf += ch;
    i += 1;
  }
  if (buf) runs.push({ text: buf, sub: false });
  return runs;
}

/** Unit text as runs: Å, or a with a subscript 0. */
export function unitRuns(unit: ScaleUnit): Run[] {
  return unit === 'angstrom' ? [{ text: 'Å', sub: false }] : [{ text: 'a', sub: false }, { text: '0', sub: true }];
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
}

// Sizes in mm of the printed figure and the subscript scale live in @psiform/print (preflight reads them too).
export { OVERLAY_MM, SUBSCRIPT_SCALE } from '@psiform/print';

function font(px: number, family: string, weight = 400): string {
  return `${weight} ${px.toFixed(2)}px ${family}`;
}

function runsWidth(ctx: CanvasRenderingContext2D, runs: Run[], px: number, family: string, weight: number): number {
  let w = 0;
  for (const r of runs) {
    ctx.font = font(r.sub ? px * SUBSCRIPT_SCALE : px, family, weight);
    w += ctx.measureText(r.text).width;
  }
  return w;
}

/** Draws runs with their baseline at y; subscripts at SUBSCRIPT_SCALE of the size, dropped by 0.22 em. */
export function drawRuns(ctx: CanvasRenderingContext2D, runs: Run[], x: number, y: number, px: number, family: string, weight = 400): number {
  let cx = x;
  for (const r of runs) {
    const size = r.sub ? px * SUBSCRIPT_SCALE : px;
    ctx.font = font(size, family, weight);
    ctx.fillText(r.text, cx, r.sub ? y + px * 0.22 : y);
    cx += ctx.measureText(r.text).width;
  }
  return cx - x;
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

/** Draws the label (top left), scale bar (bottom right), caption (bottom left) and axis letters. */
export function drawOverlay(ctx: CanvasRenderingContext2D, o: OverlayInput): void {
  const family = o.fontFamily ?? 'Lato, "Helvetica Neue", Arial, sans-serif';
  const mm = o.pxPerMm;
  const margin = OVERLAY_MM.margin * mm;
  ctx.save();
  ctx.fillStyle = o.ink;
  ctx.strokeStyle = o.ink;
  ctx.textBaseline = 'alphabetic';

  if (o.annotations.label.show && o.label) {
    const px = OVERLAY_MM.label * mm;
    drawRuns(ctx, labelRuns(o.label), margin, margin + px * 0.8, px, family, 700);
  }

  let bottomUsed = 0;
  const bar = o.annotations.scaleBar;
  if (bar.show && o.visibleWidthBohr > 0) {
    const { length, fraction } = chooseScaleBar(o.visibleWidthBohr, bar.unit, bar.length);
    const barPx = fraction * o.width;
    const textPx = OVERLAY_MM.small * mm;
    const x1 = o.width - margin;
    const x0 = x1 - barPx;
    const yBar = o.height - margin;
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
    const runs: Run[] = [{ text: `${formatLength(length)} `, sub: false }, ...unitRuns(bar.unit)];
    const w = runsWidth(ctx, runs, textPx, family, 400);
    drawRuns(ctx, runs, (x0 + x1) / 2 - w / 2, yBar - 1.4 * mm, textPx, family, 400);
    bottomUsed = barPx + margin;
  }

  const caption = o.annotations.caption?.trim();
  if (caption) {
    const px = OVERLAY_MM.caption * mm;
    ctx.font = font(px, family, 400);
    const maxW = Math.max(o.width - 2 * margin - bottomUsed - 2 * mm, o.width * 0.3);
    const lines = wrap(ctx, caption, maxW).slice(0, 6);
    const lh = px * 1.3;
    let y = o.height - margin - (lines.length - 1) * lh;
    for (const line of lines) {
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
