// Physical size <-> pixel arithmetic for print exports, and tiling for images larger than the GPU limit.
import { DEFAULT_DELIVERY_PROFILE } from '@psiform/contracts';

const { ceil, round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export const MM_PER_INCH = 25.4;

/** Pixels for a physical length: round(mm / 25.4 * dpi) (1 inch = 25.4 mm exactly, by definition since 1959). */
export function pixelsFor(lengthMm: number, dpi: number): number {
  assertPositive('lengthMm', lengthMm);
  assertPositive('dpi', dpi);
  return round((lengthMm / MM_PER_INCH) * dpi);
}

export function inchesToMm(inches: number): number {
  return inches * MM_PER_INCH;
}

export function mmToInches(mm: number): number {
  return mm / MM_PER_INCH;
}

export interface PrintSize {
  widthMm: number;
  heightMm: number;
  dpi: number;
}

export function exportPixelSize(size: PrintSize): { width: number; height: number } {
  return { width: pixelsFor(size.widthMm, size.dpi), height: pixelsFor(size.heightMm, size.dpi) };
}

/**
 * Pixels per metre for the PNG pHYs chunk (unit specifier 1 = metre; PNG specification §11.3.5.3):
 * round(dpi / 0.0254). 300 dpi -> 11811.
 */
export function pixelsPerMetre(dpi: number): number {
  assertPositive('dpi', dpi);
  return round(dpi / 0.0254);
}

/** Inverse of pixelsPerMetre, for reading files back (11811 ppm -> 299.9994 dpi). */
export function dpiFromPixelsPerMetre(ppm: number): number {
  return ppm * 0.0254;
}

/**
 * Journal column widths. Common practice, no source: publishers' author guides differ; single
 * columns run about 85–90 mm, one-and-a-half 120–140 mm, double 170–180 mm. The values are our picks.
 */
const col = (i: number, label: string) => {
  const w = DEFAULT_DELIVERY_PROFILE.columnWidthsMm[i].widthMm;
  return { widthMm: w, label: `${label} (${w} mm)` };
};
/** The default delivery profile's columns (libs/contracts), which a publication's own profile replaces. */
export const COLUMN_PRESETS = {
  single: col(0, 'Single column'),
  oneAndHalf: col(1, 'One-and-a-half column'),
  double: col(2, 'Double column'),
} as const;

export type ColumnPreset = keyof typeof COLUMN_PRESETS;

/** Resolutions offered for raster exports (the recipe's canvas.dpi accepts exactly these). */
export const DPI_CHOICES = [300, 600, 1200] as const;

/** three's PerspectiveCamera.setViewOffset(fullWidth, fullHeight, x, y, width, height) arguments for one tile. */
export interface ViewOffset {
  fullWidth: number;
  fullHeight: number;
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface Tile {
  /** Column and row of the tile (row 0 at the top of the image). */
  col: number;
  row: number;
  /** Rectangle in image pixels, origin top-left (the same convention as setViewOffset's x, y). */
  x: number;
  y: number;
  width: number;
  height: number;
  view: ViewOffset;
}

/**
 * Splits width x height into the fewest columns and rows whose tiles are at most maxTile a side; sizes
 * are balanced (differ by at most one pixel) so no thin sliver tile is left at the edge. The tiles cover
 * the image exactly: no gap, no overlap, row-major order.
 */
export function planTiles(width: number, height: number, maxTile = 8192): Tile[] {
  for (const [name, v] of [['width', width], ['height', height], ['maxTile', maxTile]] as const) {
    if (!Number.isInteger(v) || v < 1) throw new RangeError(`${name} must be a positive integer (got ${String(v)})`);
  }
  const cols = ceil(width / maxTile);
  const rows = ceil(height / maxTile);
  const xs = split(width, cols);
  const ys = split(height, rows);
  const tiles: Tile[] = [];
  for (let row = 0; row < rows; row++) {
    for (let col = 0; col < cols; col++) {
      const x = xs[col];
      const y = ys[row];
      const w = xs[col + 1] - x;
      const h = ys[row + 1] - y;
      tiles.push({ col, row, x, y, width: w, height: h, view: { fullWidth: width, fullHeight: height, x, y, width: w, height: h } });
    }
  }
  return tiles;
}

/** Boundaries 0 = b0 < b1 < ... < bk = total with parts differing by at most one. */
function split(total: number, parts: number): number[] {
  const out = [0];
  for (let i = 1; i <= parts; i++) out.push(round((total * i) / parts));
  return out;
}

function assertPositive(name: string, v: number): void {
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) throw new RangeError(`${name} must be a positive number (got ${String(v)})`);
}
