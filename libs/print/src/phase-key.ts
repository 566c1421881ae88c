// The phase key of a complex state: a ring coloured by arg ψ through the one phase-colouring rule (the caller passes
// it: @psiform/colour phaseHex on the figure's palette and swatchbook wheel), marked 0, π/2, π and 3π/2. One
// geometry for every place the key appears: the Studio's legend (SVG), the figure's 2D layer (Canvas 2D: preview,
// PNG, figure sets) and SVG files. Angles run counterclockwise from the right, as arg z in the complex plane
// (common practice for Argand diagrams).

import type { Recipe } from '@psiform/contracts';
import { isRealState } from '@psiform/orbitals';
import { OVERLAY_MM } from './figure-text';

const { PI, cos, sin } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/**
 * True when the figure is coloured by arg ψ (phase mode 'argument', or 'auto' on a complex state): then it carries
 * the phase key, and the ψ > 0 / ψ < 0 legend does not apply.
 */
export function usesPhaseKey(recipe: Pick<Recipe, 'content' | 'phase'>): boolean {
  const mode = recipe.phase?.mode ?? 'auto';
  if (mode !== 'auto') return mode === 'argument';
  return !isRealState({ Z: recipe.content.Z, terms: recipe.content.terms });
}

/** Colour (#rrggbb) of the phase angle `angle` (radians) on the figure's wheel. */
export type PhaseColourAt = (angle: number) => string;

/** Sectors of the ring: enough that neighbouring colours differ by far less than the eye can tell at key size. */
export const PHASE_KEY_SECTORS = 72;

/** Marks of the key: arg ψ in radians and its printed text. */
export const PHASE_KEY_MARKS: readonly { angle: number; text: string }[] = [
  { angle: 0, text: '0' },
  { angle: PI / 2, text: 'π/2' },
  { angle: PI, text: 'π' },
  { angle: (3 * PI) / 2, text: '3π/2' },
];

/** Inner radius as a fraction of the outer one (a ring, so the centre reads as "no phase"). */
export const PHASE_KEY_HOLE = 0.5;

export interface PhaseKeySector {
  /** Mid angle of the sector (radians): its colour is the wheel's colour there. */
  angle: number;
  /** Start and end angles (radians), counterclockwise. */
  from: number;
  to: number;
}

/** The ring's sectors, each with the angle its colour is taken at. */
export function phaseKeySectors(n = PHASE_KEY_SECTORS): PhaseKeySector[] {
  const out: PhaseKeySector[] = [];
  const step = (2 * PI) / n;
  for (let i = 0; i < n; i++) out.push({ angle: i * step, from: i * step - step / 2, to: i * step + step / 2 });
  return out;
}

const fx = (x: number) => Number(x.toFixed(3)).toString();

/**
 * One sector as an SVG path centred at (cx, cy), outer radius r, in user units with y down (so a counterclockwise
 * angle on paper is a negative y).
 */
export function sectorPath(cx: number, cy: number, r: number, s: PhaseKeySector, hole = PHASE_KEY_HOLE): string {
  const ri = r * hole;
  const p = (rad: number, a: number) => `${fx(cx + rad * cos(a))} ${fx(cy - rad * sin(a))}`;
  // Outer arc counterclockwise on paper = sweep-flag 0 in SVG's y-down frame; inner arc back with sweep 1.
  return `M${p(r, s.from)}A${fx(r)} ${fx(r)} 0 0 0 ${p(r, s.to)}L${p(ri, s.to)}A${fx(ri)} ${fx(ri)} 0 0 1 ${p(ri, s.from)}Z`;
}

/** Where a mark's text sits: just outside the ring on its angle (user units, y down). */
export function markPosition(cx: number, cy: number, r: number, angle: number, gap: number): { x: number; y: number; anchor: 'start' | 'middle' | 'end' } {
  const c = cos(angle);
  const s = sin(angle);
  const anchor = c > 0.3 ? 'start' : c < -0.3 ? 'end' : 'middle';
  return { x: cx + (r + gap) * c, y: cy - (r + gap) * s, anchor };
}

const esc = (t: string) => t.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;');

/**
 * The key as an SVG group: `title` above, the ring of radius `r` centred at (cx, cy), the four marks. Lengths in the
 * document's user units (mm in our files); `fontSize` for the marks and title.
 */
export function phaseKeySvg(o: { cx: number; cy: number; r: number; colourAt: PhaseColourAt; ink: string; fontSize: number; title?: string; fontFamily?: string }): string {
  const parts: string[] = [`<g class="phase-key" data-marks="${PHASE_KEY_MARKS.map((m) => m.text).join(' ')}">`];
  if (o.title) parts.push(`<text class="phase-key-title" x="${fx(o.cx)}" y="${fx(o.cy - o.r - o.fontSize * 1.9)}" text-anchor="middle" font-size="${fx(o.fontSize)}" fill="${o.ink}"${o.fontFamily ? ` font-family="${esc(o.fontFamily)}"` : ''}>${esc(o.title)}</text>`);
  for (const s of phaseKeySectors()) parts.push(`<path d="${sectorPath(o.cx, o.cy, o.r, s)}" fill="${o.colourAt(s.angle)}" data-angle="${fx(s.angle)}"/>`);
  for (const m of PHASE_KEY_MARKS) {
    const at = markPosition(o.cx, o.cy, o.r, m.angle, o.fontSize * 0.5);
    parts.push(
      `<text class="phase-key-mark" x="${fx(at.x)}" y="${fx(at.y + o.fontSize * 0.35)}" text-anchor="${at.anchor}" font-size="${fx(o.fontSize)}" fill="${o.ink}"${o.fontFamily ? ` font-family="${esc(o.fontFamily)}"` : ''}>${esc(m.text)}</text>`,
    );
  }
  parts.push('</g>');
  return parts.join('');
}

/** The Canvas 2D calls the key needs (a subset of CanvasRenderingContext2D, so libs stay free of the DOM). */
export interface KeyCanvas {
  fillStyle: unknown;
  font: string;
  textAlign: string;
  textBaseline: string;
  beginPath(): void;
  arc(x: number, y: number, r: number, a0: number, a1: number, ccw?: boolean): void;
  closePath(): void;
  fill(): void;
  fillText(text: string, x: number, y: number): void;
  save(): void;
  restore(): void;
}

/**
 * Draws the key centred at (cx, cy) in pixels (y down), outer radius r px: the same sectors and marks as the SVG.
 * Canvas angles run clockwise on screen, so a phase angle a is drawn at canvas angle −a.
 */
export function drawPhaseKey(ctx: KeyCanvas, o: { cx: number; cy: number; r: number; colourAt: PhaseColourAt; ink: string; fontPx: number; fontFamily: string; title?: string }): void {
  ctx.save();
  const ri = o.r * PHASE_KEY_HOLE;
  for (const s of phaseKeySectors()) {
    ctx.beginPath();
    ctx.arc(o.cx, o.cy, o.r, -s.from, -s.to, true);
    ctx.arc(o.cx, o.cy, ri, -s.to, -s.from, false);
    ctx.closePath();
    ctx.fillStyle = o.colourAt(s.angle);
    ctx.fill();
  }
  ctx.fillStyle = o.ink;
  ctx.font = `400 ${o.fontPx.toFixed(2)}px ${o.fontFamily}`;
  ctx.textBaseline = 'middle';
  for (const m of PHASE_KEY_MARKS) {
    const at = markPosition(o.cx, o.cy, o.r, m.angle, o.fontPx * 0.5);
    ctx.textAlign = at.anchor === 'middle' ? 'center' : at.anchor === 'start' ? 'left' : 'right';
    ctx.fillText(m.text, at.x, at.y);
  }
  if (o.title) {
    ctx.textAlign = 'center';
    ctx.fillText(o.title, o.cx, o.cy - o.r - o.fontPx * 1.6);
  }
  ctx.restore();
}

/**
 * Where the figure's 2D layer (preview, PNG, TIFF, thumbnails, set panels) puts the key on an image `widthPx` wide at
 * `pxPerMm`: top right of the figure area, with room right of the ring for the "0" mark and above it for the title and
 * the π/2 mark. Pixels, y down. The one placement the overlay draws and tests read the written files at.
 */
export function phaseKeyPlacement(widthPx: number, pxPerMm: number): { cx: number; cy: number; r: number; fontPx: number } {
  const fontPx = OVERLAY_MM.small * pxPerMm;
  const r = OVERLAY_MM.keyRadius * pxPerMm;
  const margin = OVERLAY_MM.margin * pxPerMm;
  return { cx: widthPx - margin - r - fontPx * 1.2, cy: margin + fontPx * 2.2 + r, r, fontPx };
}
