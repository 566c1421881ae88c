// Per-phase isosurfaces of a sampled wavefunction. The kernels here only need the structural shape of a compiled
// state (evaluate / gradient), so they do not depend on @psiform/orbitals.

import { blockMinMax, extractIsosurface, type NormalFn } from './marching-cubes';
import { mergeMeshes, type Mesh } from './mesh';

const { atan2 } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/** What the surface code needs from @psiform/orbitals' CompiledState. */
export interface CompiledLike {
  readonly isReal: boolean;
  evaluate(x: number, y: number, z: number): { re: number; im: number };
  /** out = dRe/dx, dRe/dy, dRe/dz, dIm/dx, dIm/dy, dIm/dz. */
  gradient(x: number, y: number, z: number, out: Float64Array): void;
}

/** Cube grid as in @psiform/orbitals: n points per side from -extent to +extent inclusive. */
export interface CubeGrid {
  n: number;
  extent: number;
}

export type Phase = '+' | '-' | 'complex';

export interface PhaseSurface {
  phase: Phase;
  mesh: Mesh;
}

export interface OrbitalSurfaceOptions {
  /** 'analytic' (default): normals from compiled.gradient; 'field': central differences only. */
  normals?: 'analytic' | 'field';
  skipEmpty?: boolean;
  blockSize?: number;
}

export function cubeGeometry(grid: CubeGrid): { dims: { nx: number; ny: number; nz: number }; origin: [number, number, number]; spacing: number } {
  if (!Number.isInteger(grid?.n) || grid.n < 2) throw new RangeError(`grid.n must be an integer >= 2 (got ${grid?.n})`);
  if (!(grid.extent > 0) || !Number.isFinite(grid.extent)) throw new RangeError(`grid.extent must be > 0 (got ${grid.extent})`);
  const { n, extent } = grid;
  return { dims: { nx: n, ny: n, nz: n }, origin: [-extent, -extent, -extent], spacing: (2 * extent) / (n - 1) };
}

/**
 * Isosurfaces at the value c > 0 of a real extraction field f (x fastest, on `grid`):
 * the surface f = +c around f > c and the surface f = -c around f < -c (Lorensen & Cline 1987, no box caps: a
 * surface that reaches the box stays open there, so it is never reported closed).
 * Real states (f = psi): phase '+' and '-', outward normals -grad psi and +grad psi.
 * Complex states (f = ±|psi| with a sign that flips across nodes, see @psiform/orbitals' analyseSurface): the two
 * parts together are the |psi| = c surface, returned as one 'complex' surface with arg psi per vertex
 * (mesh.phaseAngle) and outward normals -grad|psi|. Where the analytic gradient vanishes, central differences.
 */
export function extractOrbitalSurfaces(compiled: CompiledLike, f: Float32Array, grid: CubeGrid, isovalue: number, opts: OrbitalSurfaceOptions = {}): PhaseSurface[] {
  if (!(isovalue > 0) || !Number.isFinite(isovalue)) throw new RangeError(`isovalue must be a positive number (|psi| level), got ${isovalue}`);
  const { dims, origin, spacing } = cubeGeometry(grid);
  const N = grid.n ** 3;
  if (f.length !== N) throw new RangeError(`field length ${f.length} must be n³ = ${N}`);
  const geom = { origin, spacing };
  const analytic = opts.normals !== 'field';
  const g = new Float64Array(6);
  const common = { skipEmpty: opts.skipEmpty, blockSize: opts.blockSize, closeAtBoundary: false };
  const range = opts.skipEmpty === false ? undefined : blockMinMax(f, dims, opts.blockSize ?? 8, false);

  if (compiled.isReal) {
    const normalFor = (sign: number): NormalFn => (x, y, z, out) => {
      compiled.gradient(x, y, z, g);
      out[0] = sign * g[0];
      out[1] = sign * g[1];
      out[2] = sign * g[2];
    };
    const plus = extractIsosurface(f, dims, geom, isovalue, { ...common, inside: 'above', normal: analytic ? normalFor(-1) : undefined, blockRange: range });
    const minus = extractIsosurface(f, dims, geom, -isovalue, { ...common, inside: 'below', normal: analytic ? normalFor(1) : undefined, blockRange: range });
    return [
      { phase: '+', mesh: plus },
      { phase: '-', mesh: minus },
    ];
  }

  const normal: NormalFn | undefined = analytic
    ? (x, y, z, out) => {
        const v = compiled.evaluate(x, y, z);
        compiled.gradient(x, y, z, g);
        // grad|psi| = (re grad re + im grad im) / |psi|; outward is its negative. Scale is irrelevant.
        out[0] = -(v.re * g[0] + v.im * g[3]);
        out[1] = -(v.re * g[1] + v.im * g[4]);
        out[2] = -(v.re * g[2] + v.im * g[5]);
      }
    : undefined;
  const plus = extractIsosurface(f, dims, geom, isovalue, { ...common, inside: 'above', normal, blockRange: range });
  const minus = extractIsosurface(f, dims, geom, -isovalue, { ...common, inside: 'below', normal, blockRange: range });
  const mesh = mergeMeshes([plus, minus]);
  const P = mesh.positions;
  const phaseAngle = new Float32Array(P.length / 3);
  for (let v = 0; v < phaseAngle.length; v++) {
    const psi = compiled.evaluate(P[3 * v], P[3 * v + 1], P[3 * v + 2]);
    phaseAngle[v] = atan2(psi.im, psi.re);
  }
  mesh.phaseAngle = phaseAngle;
  return [{ phase: 'complex', mesh }];
}
