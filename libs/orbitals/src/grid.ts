import { Bohr } from './units';

/** Cube grid: n points per side from -extent to +extent inclusive (spacing 2*extent/(n-1)), x fastest. */
export interface GridSpec {
  n: number;
  extent: Bohr;
}

/** Largest grid side accepted by the samplers (512³ real = 0.54 GB per Float32 array). */
export const MAX_GRID_N = 512;
/** Default memory budget for checkGridFits: 4.0 GB (decimal). */
export const DEFAULT_GRID_BUDGET_BYTES = 4e9;

export function validateGridSpec(grid: GridSpec): string | null {
  if (!grid || typeof grid !== 'object') return 'grid must be an object { n, extent }';
  if (!Number.isInteger(grid.n) || grid.n < 2) return `grid.n must be an integer >= 2, got ${String(grid.n)}`;
  if (grid.n > MAX_GRID_N) return `grid.n = ${grid.n} is larger than the maximum of ${MAX_GRID_N} points per side`;
  if (typeof grid.extent !== 'number' || !Number.isFinite(grid.extent) || grid.extent <= 0) {
    return `grid.extent must be a positive number of Bohr radii, got ${String(grid.extent)}`;
  }
  return null;
}

export function assertGridSpec(grid: GridSpec): void {
  const e = validateGridSpec(grid);
  if (e) throw new RangeError(e);
}

/** Spacing between neighbouring grid points, in Bohr. */
export function gridSpacing(grid: GridSpec): Bohr {
  return ((2 * grid.extent) / (grid.n - 1)) as Bohr;
}

/** Volume of one voxel (spacing³), in Bohr³. */
export function voxelVolume(grid: GridSpec): number {
  const h = gridSpacing(grid);
  return h * h * h;
}

/** Bytes for the sampled arrays: n³ Float32 values, twice for complex states. */
export function gridBytes(n: number, complex: boolean): number {
  return n * n * n * 4 * (complex ? 2 : 1);
}

export class GridTooLargeError extends RangeError {
  constructor(
    message: string,
    readonly n: number,
    readonly bytes: number,
    readonly budgetBytes: number,
  ) {
    super(message);
    this.name = 'GridTooLargeError';
  }
}

export function formatBytes(b: number): string {
  if (b >= 1e9) return `${(b / 1e9).toFixed(1)} GB`;
  if (b >= 1e6) return `${(b / 1e6).toFixed(1)} MB`;
  if (b >= 1e3) return `${(b / 1e3).toFixed(1)} kB`;
  return `${b} B`;
}

/** Throws GridTooLargeError (with a message such as "grid 2048³ needs 34.4 GB, more than the 4.0 GB budget"). */
export function checkGridFits(n: number, complex: boolean, budgetBytes: number = DEFAULT_GRID_BUDGET_BYTES): void {
  if (!Number.isInteger(n) || n < 2) throw new RangeError(`grid size n must be an integer >= 2, got ${String(n)}`);
  const bytes = gridBytes(n, complex);
  if (bytes > budgetBytes) {
    throw new GridTooLargeError(
      `grid ${n}³${complex ? ' (complex)' : ''} needs ${formatBytes(bytes)}, more than the ${formatBytes(budgetBytes)} budget`,
      n,
      bytes,
      budgetBytes,
    );
  }
  if (n > MAX_GRID_N) {
    throw new GridTooLargeError(`grid ${n}³ is larger than the maximum of ${MAX_GRID_N} points per side`, n, bytes, budgetBytes);
  }
}
