// Panel layout of a figure set on one canvas: a grid of cells, one camera and one length scale for all.
// Pure arithmetic (no three, no DOM) so the layout is unit-tested; the render page applies it.

export interface Rect {
  x: number;
  y: number;
  width: number;
  height: number;
}

export interface PanelCell extends Rect {
  index: number;
  row: number;
  col: number;
  /** Centre of the cell on the nominal (fractional) grid, in canvas pixels from the top left. */
  cx: number;
  cy: number;
}

export interface PanelGrid {
  rows: number;
  columns: number;
  /** Nominal cell size (canvas / grid, fractional): every panel's camera is placed for this size. */
  cellWidth: number;
  cellHeight: number;
  /** One cell per panel, row by row; edges rounded so neighbouring cells share a pixel boundary. */
  cells: PanelCell[];
  /** Grid cells without a panel (the last row may be short): filled with the background. */
  empty: Rect[];
}

/** Grid of `count` panels in `columns` columns (capped at count) over a W × H canvas; cells tile it exactly. */
export function panelGrid(width: number, height: number, count: number, columns: number): PanelGrid {
  if (!(count >= 1) || !(columns >= 1)) throw new Error('a panel grid needs at least one panel and one column');
  const cols = Math.min(columns, count);
  const rows = Math.ceil(count / cols);
  const cellWidth = width / cols;
  const cellHeight = height / rows;
  const xs = Array.from({ length: cols + 1 }, (_, c) => Math.round(c * cellWidth));
  const ys = Array.from({ length: rows + 1 }, (_, r) => Math.round(r * cellHeight));
  const cells: PanelCell[] = [];
  const empty: Rect[] = [];
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const index = r * cols + c;
      const rect = { x: xs[c], y: ys[r], width: xs[c + 1] - xs[c], height: ys[r + 1] - ys[r] };
      if (index < count) cells.push({ ...rect, index, row: r, col: c, cx: (c + 0.5) * cellWidth, cy: (r + 0.5) * cellHeight });
      else empty.push(rect);
    }
  }
  return { rows, columns: cols, cellWidth, cellHeight, cells, empty };
}

/** Overlap of two rectangles, or null. */
export function intersect(a: Rect, b: Rect): Rect | null {
  const x = Math.max(a.x, b.x);
  const y = Math.max(a.y, b.y);
  const x1 = Math.min(a.x + a.width, b.x + b.width);
  const y1 = Math.min(a.y + a.height, b.y + b.height);
  return x1 > x && y1 > y ? { x, y, width: x1 - x, height: y1 - y } : null;
}

/**
 * Arguments for camera.setViewOffset(fullWidth, fullHeight, x, y, width, height) that draw the canvas region
 * `sub` (inside `cell`) through a camera placed for the nominal cell (cellWidth × cellHeight centred on the cell's
 * centre). Every pixel of every panel then covers the same a0 whatever the cell's rounded size, and sub-regions
 * (tiles) join without seams because they are windows onto one projection.
 */
export function panelViewOffset(grid: Pick<PanelGrid, 'cellWidth' | 'cellHeight'>, cell: Pick<PanelCell, 'cx' | 'cy'>, sub: Rect): [number, number, number, number, number, number] {
  const left = cell.cx - grid.cellWidth / 2;
  const top = cell.cy - grid.cellHeight / 2;
  return [grid.cellWidth, grid.cellHeight, sub.x - left, sub.y - top, sub.width, sub.height];
}

/**
 * The framing radius shared by all panels: the largest panel extent, so a smaller orbital is drawn smaller at the
 * same a0 per pixel (lobes compare truly).
 */
export function commonRadius(radii: readonly number[]): number {
  let r = 0;
  for (const x of radii) if (Number.isFinite(x) && x > r) r = x;
  return r > 0 ? r : 1;
}
