import { N_MAX } from './quantum';

/**
 * Limits of what people type, with ONE wording, shared by the API (400 messages "<field>: <problem>") and the
 * client (inline messages under the field), so both name the same limit in the same words.
 */

/**
 * Figure and figure-set titles (figures.title is varchar; 200 keeps a title readable in lists and file names), the
 * figure's label and caption, a review decision's note and a proof comment.
 */
export const TEXT_LIMITS = { titleMax: 200, labelMax: 80, captionMax: 2000, noteMax: 2000, commentMax: 4000 } as const;

/** Engine limits shared by the CLI, API, worker and web (memory: 384³ float32 ≈ 226 MB per field). */
export const RECIPE_LIMITS = {
  /** The quantum-number rule's own bound (quantum.ts). */
  nMax: N_MAX,
  zMax: 118,
  gridMin: 16,
  gridMax: 384,
  termsMax: 16,
  extentMax: 2000,
} as const;

/** The physical canvas of a figure or export, millimetres (a stamp to a poster). */
export const CANVAS_LIMITS = { mmMin: 10, mmMax: 1000 } as const;

/**
 * Raster exports are capped in pixels: the render page takes at most 20000 px a side, and 64 megapixels keep
 * the RGBA image (256 MB) and its PNG well inside one worker's memory.
 */
export const RASTER_LIMITS = { pxMax: 20000, megapixelsMax: 64 } as const;

/** A colour as stored in recipes and swatchbooks. */
export const HEX_COLOUR = /^#[0-9a-fA-F]{6}$/;
export const HEX_COLOUR_MESSAGE = 'must be a colour like #1a2b3c (# and six hex digits)';

/** Problem with a title, or null. Leading and trailing spaces do not count (the server trims them). */
export function titleProblem(title: unknown): string | null {
  if (typeof title !== 'string') return 'must be a string';
  const t = title.trim();
  if (t.length === 0) return 'must not be empty';
  if (t.length > TEXT_LIMITS.titleMax) return `must be at most ${TEXT_LIMITS.titleMax} characters (this one has ${t.length})`;
  return null;
}

/** Problem with a length in millimetres, or null. */
export function mmProblem(value: unknown): string | null {
  if (typeof value !== 'number' || !Number.isFinite(value)) return `must be a number of millimetres from ${CANVAS_LIMITS.mmMin} to ${CANVAS_LIMITS.mmMax}`;
  if (value < CANVAS_LIMITS.mmMin || value > CANVAS_LIMITS.mmMax) return `must be from ${CANVAS_LIMITS.mmMin} to ${CANVAS_LIMITS.mmMax} mm (got ${value} mm)`;
  return null;
}

/** Pixels for a length at a resolution: round(mm / 25.4 × dpi) (1 in = 25.4 mm exactly). */
export function pixelsAt(mm: number, dpi: number): number {
  return Math.round((mm / 25.4) * dpi);
}

/** Problem with a raster size, or null ("… is 47244 × 47244 px; the largest raster export is …"). */
export function rasterProblem(widthMm: number, heightMm: number, dpi: number): string | null {
  const w = pixelsAt(widthMm, dpi);
  const h = pixelsAt(heightMm, dpi);
  if (w > RASTER_LIMITS.pxMax || h > RASTER_LIMITS.pxMax || w * h > RASTER_LIMITS.megapixelsMax * 1e6) {
    return `${widthMm} × ${heightMm} mm at ${dpi} dpi is ${w} × ${h} px; the largest raster export is ${RASTER_LIMITS.pxMax} px a side and ${RASTER_LIMITS.megapixelsMax} megapixels (choose a lower dpi or a smaller size)`;
  }
  return null;
}

/** Problem with a colour, or null. */
export function hexProblem(value: unknown): string | null {
  return typeof value === 'string' && HEX_COLOUR.test(value) ? null : HEX_COLOUR_MESSAGE;
}

// The problems below all read "<field> <problem>": the API's 400 message is "<path>: <field> <problem>" (the schemas
// in recipe.ts take these very functions as their error text) and the client puts its own field name in front.

const got = (v: unknown) => (v === undefined ? '' : ` (got ${typeof v === 'string' ? JSON.stringify(v) : String(v)})`);

/** Problem with a grid size ('auto', or whole points per side within RECIPE_LIMITS), or null. */
export function gridProblem(value: unknown): string | null {
  if (value === 'auto') return null;
  if (typeof value === 'number' && Number.isInteger(value) && value >= RECIPE_LIMITS.gridMin && value <= RECIPE_LIMITS.gridMax) return null;
  return `must be 'auto' or a whole number from ${RECIPE_LIMITS.gridMin} to ${RECIPE_LIMITS.gridMax}${got(value)}`;
}

/** Problem with an enclosed fraction, or null; `percent` words it for a field typed in percent (0.9 = 90 %). */
export function fractionProblem(value: unknown, unit: 'fraction' | 'percent' = 'fraction'): string | null {
  const ok = typeof value === 'number' && Number.isFinite(value) && value > 0 && value < (unit === 'percent' ? 100 : 1);
  if (ok) return null;
  return unit === 'percent'
    ? `must be a number between 0% and 100%, both excluded${typeof value === 'number' && Number.isFinite(value) ? ` (got ${value}%)` : got(value)}`
    : `must be a number between 0 and 1, both excluded${got(value)}`;
}

/** Problem with a nuclear charge Z, or null. */
export function zProblem(value: unknown): string | null {
  if (typeof value === 'number' && Number.isInteger(value) && value >= 1 && value <= RECIPE_LIMITS.zMax) return null;
  return `must be a whole number from 1 to ${RECIPE_LIMITS.zMax}${got(value)}`;
}

/** Problem with an isovalue |ψ| = c (a0^−3/2), or null. Whether a surface exists at c depends on the state. */
export function isovalueProblem(value: unknown): string | null {
  if (typeof value === 'number' && Number.isFinite(value) && value > 0) return null;
  return `must be a positive number${got(value)}`;
}

/** Problem with free text of at most `max` characters, or null (`required`: blank text is a problem too). */
export function textProblem(value: unknown, max: number, required = false): string | null {
  if (typeof value !== 'string') return 'must be a string';
  if (required && value.trim().length === 0) return 'must not be empty';
  if (value.length > max) return `must be at most ${max} characters (this one has ${value.length})`;
  return null;
}
