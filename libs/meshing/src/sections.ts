// 2D companions for figures: psi on a plane and its contour polygons (marching squares by
// d3-contour, https://d3js.org/d3-contour).

import { contours } from 'd3-contour';
import type { CompiledLike } from './orbital-surfaces';

const { atan2, hypot } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export type SectionPlaneName = 'xy' | 'xz' | 'yz';

export interface SectionSpec {
  plane: SectionPlaneName;
  /** Coordinate of the plane along its normal axis, in Bohr. */
  offset: number;
  /** Half-width of the square, in Bohr: samples from -extent to +extent inclusive. */
  extent: number;
  /** Samples per side. */
  n: number;
}

export interface Section extends SectionSpec {
  /** n*n values, u fastest (u, v = x,y for 'xy'; x,z for 'xz'; y,z for 'yz'). */
  values: Float64Array;
  /** 'real': psi itself; 'signed-modulus': |psi| with the sign of Re psi (complex states). */
  mode: 'real' | 'signed-modulus';
  /** Complex states only: arg psi per sample (radians, atan2(Im, Re)), for maps coloured by phase. */
  arg?: Float64Array;
}

/** Sample psi on a plane: real states give psi, complex states |psi| * sign(Re psi). */
export function sectionPlane(compiled: CompiledLike, spec: SectionSpec): Section {
  const { plane, offset, extent, n } = spec;
  if (plane !== 'xy' && plane !== 'xz' && plane !== 'yz') throw new RangeError(`plane must be 'xy', 'xz' or 'yz' (got ${String(plane)})`);
  if (!Number.isInteger(n) || n < 2 || n > 4096) throw new RangeError(`n must be an integer in 2..4096 (got ${n})`);
  if (!(extent > 0) || !Number.isFinite(extent)) throw new RangeError(`extent must be > 0 (got ${extent})`);
  if (!Number.isFinite(offset)) throw new RangeError(`offset must be finite (got ${offset})`);
  const h = (2 * extent) / (n - 1);
  const values = new Float64Array(n * n);
  const arg = compiled.isReal ? undefined : new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    const v = -extent + h * j;
    for (let i = 0; i < n; i++) {
      const u = -extent + h * i;
      const [x, y, z] = plane === 'xy' ? [u, v, offset] : plane === 'xz' ? [u, offset, v] : [offset, u, v];
      const psi = compiled.evaluate(x, y, z);
      values[i + n * j] = compiled.isReal ? psi.re : (psi.re < 0 ? -1 : 1) * hypot(psi.re, psi.im);
      if (arg) arg[i + n * j] = atan2(psi.im, psi.re);
    }
  }
  return { plane, offset, extent, n, values, mode: compiled.isReal ? 'real' : 'signed-modulus', ...(arg ? { arg } : {}) };
}

/** GeoJSON-like MultiPolygon (rings of [u, v] points). */
export interface ContourPolygons {
  type: 'MultiPolygon';
  /** The level: +c for '+' regions (psi >= c), -c for '-' regions (psi <= -c), 0 for the nodal set. */
  value: number;
  coordinates: number[][][][];
}

export interface SectionContours {
  plus: ContourPolygons[];
  minus: ContourPolygons[];
  /** Region psi >= 0; its boundary inside the square is the nodal line psi = 0. */
  nodal: ContourPolygons;
}

/**
 * Contours of a section: for each threshold c > 0 the region psi >= c ('+') and psi <= -c ('-'),
 * plus the psi >= 0 region whose edges inside the square are the nodal line. Coordinates are in
 * Bohr when extent is given (sample i sits at -extent + i*h), else in d3-contour's grid units
 * (sample i at i + 0.5).
 */
export function sectionContours(values: Float64Array | Float32Array | ArrayLike<number>, n: number, thresholds: readonly number[], extent?: number): SectionContours {
  if (!Number.isInteger(n) || n < 2) throw new RangeError(`n must be an integer >= 2 (got ${n})`);
  if (values.length !== n * n) throw new RangeError(`values length ${values.length} must be n² = ${n * n}`);
  for (const t of thresholds) if (!(t > 0) || !Number.isFinite(t)) throw new RangeError(`thresholds must be positive numbers (got ${t})`);
  if (extent !== undefined && (!(extent > 0) || !Number.isFinite(extent))) throw new RangeError(`extent must be > 0 (got ${extent})`);
  const arr = Array.from(values as ArrayLike<number>);
  const neg = arr.map((v) => -v);
  const gen = contours().size([n, n]);
  const h = extent !== undefined ? (2 * extent) / (n - 1) : 1;
  const map = (g: { coordinates: number[][][][]; value: number }, value: number): ContourPolygons => ({
    type: 'MultiPolygon',
    value,
    coordinates:
      extent === undefined
        ? g.coordinates
        : g.coordinates.map((poly) => poly.map((ring) => ring.map(([u, v]) => [-extent + (u - 0.5) * h, -extent + (v - 0.5) * h]))),
  });
  return {
    plus: thresholds.map((c) => map(gen.contour(arr, c), c)),
    minus: thresholds.map((c) => map(gen.contour(neg, c), -c)),
    nodal: map(gen.contour(arr, 0), 0),
  };
}

/**
 * The region values >= c of one field (any c, also 0 or negative) as polygons, in Bohr when extent is given: what
 * maps coloured by phase need for each band of the wheel and each |psi| level (same marching squares as above).
 */
export function regionContours(values: Float64Array | Float32Array | ArrayLike<number>, n: number, c: number, extent?: number): ContourPolygons {
  if (!Number.isInteger(n) || n < 2) throw new RangeError(`n must be an integer >= 2 (got ${n})`);
  if (values.length !== n * n) throw new RangeError(`values length ${values.length} must be n² = ${n * n}`);
  if (!Number.isFinite(c)) throw new RangeError(`c must be finite (got ${c})`);
  const g = contours().size([n, n]).contour(Array.from(values as ArrayLike<number>), c);
  const h = extent !== undefined ? (2 * extent) / (n - 1) : 1;
  return {
    type: 'MultiPolygon',
    value: c,
    coordinates: extent === undefined ? g.coordinates : g.coordinates.map((poly) => poly.map((ring) => ring.map(([u, v]) => [-extent + (u - 0.5) * h, -extent + (v - 0.5) * h]))),
  };
}
