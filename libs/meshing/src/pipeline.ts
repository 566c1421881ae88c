// High-level: state -> sampled grid -> surface rule -> per-phase meshes with statistics.

import { autoExtent, compileState, enclosedFractionAt, enclosedThreshold, type Bohr, type CompiledState, type OrbitalState } from '@psiform/orbitals';
import { extractOrbitalSurfaces, type CubeGrid, type Phase, type OrbitalSurfaceOptions } from './orbital-surfaces';
import type { Mesh } from './mesh';
import { extractNodalSurface } from './nodal';
import { meshStats, type MeshStats } from './stats';

export type SurfaceRule = { rule: 'enclosed'; fraction: number } | { rule: 'psi'; value: number };

export interface BuildRequest {
  state: OrbitalState;
  grid: { n: number; extent?: 'auto' | number };
  surface: SurfaceRule;
}

export interface BuildOptions extends Pick<OrbitalSurfaceOptions, 'normals' | 'skipEmpty' | 'blockSize'> {
  /** Replace the default sampler (e.g. the parallel Node sampler). */
  sample?: (compiled: CompiledState, grid: CubeGrid) => { re: Float32Array; im: Float32Array | null };
  /** Skip meshStats (timings_ms.stats is then 0). */
  stats?: boolean;
  /** Also extract the nodal surfaces (psi = 0) where they cut the figure (real states; see extractNodalSurface). */
  nodal?: boolean;
}

export interface OrbitalMeshResult {
  /** The |psi| level of the surfaces. Enclosed rule: sqrt of the grid density threshold t, moved
   * halfway down to the next lower sample value (same enclosed voxels; see levelBetweenSamples). */
  isovalue: number;
  /** Probability actually enclosed by |psi| > isovalue on the sampled grid. */
  enclosed: number;
  grid: { n: number; extent: number };
  surfaces: { phase: Phase; mesh: Mesh; stats: MeshStats | null }[];
  /** Only with opts.nodal: psi = 0 between the lobes, or null (complex state, or no node, as 1s). Not a surface of
   * the figure: no stats, not in `surfaces`. */
  nodal?: Mesh | null;
  timings_ms: { sample: number; threshold: number; extract: number; stats: number };
}

function defaultSample(compiled: CompiledState, grid: CubeGrid): { re: Float32Array; im: Float32Array | null } {
  const N = grid.n ** 3;
  const re = new Float32Array(N);
  const im = compiled.isReal ? null : new Float32Array(N);
  compiled.sampleGrid({ n: grid.n, extent: grid.extent as Bohr }, re, im);
  return { re, im };
}

/**
 * Density-threshold for the enclosed rule without a second n³ buffer for real states: psi is
 * squared in place (signs kept in a bit mask), thresholded, and restored by sqrt. For float32,
 * fl(sqrt(fl(x²))) = |x| exactly under round-to-nearest (no over/underflow), so the restored field
 * equals the sampled one except values below ~1e-19, which lie far beneath any isovalue.
 */
/**
 * The density level actually meshed for threshold t: halfway between t (a sample value) and the
 * next lower sample value. The voxels with density > level are exactly those >= t, and no sample
 * lies on the surface (a sample equal to the level would put several edge vertices on one point
 * and leave zero-area triangles).
 */
export function levelBetweenSamples(density: Float32Array, t: number): number {
  let below = 0;
  for (let i = 0; i < density.length; i++) {
    const d = density[i];
    if (d < t && d > below) below = d;
  }
  return 0.5 * (t + below);
}

function enclosedOnReal(re: Float32Array, fraction: number): { t: number; enclosed: number } {
  const N = re.length;
  const sign = new Uint8Array((N + 7) >> 3);
  for (let i = 0; i < N; i++) {
    const v = re[i];
    if (v < 0) sign[i >> 3] |= 1 << (i & 7);
    re[i] = v * v;
  }
  const t0 = enclosedThreshold(re, fraction);
  const enclosed = enclosedFractionAt(re, t0);
  const t = levelBetweenSamples(re, t0);
  for (let i = 0; i < N; i++) {
    const a = Math.sqrt(re[i]);
    re[i] = sign[i >> 3] & (1 << (i & 7)) ? -a : a;
  }
  return { t, enclosed };
}

export function buildOrbitalMesh(req: BuildRequest, opts: BuildOptions = {}): OrbitalMeshResult {
  const n = req?.grid?.n;
  if (!Number.isInteger(n) || n < 2) throw new RangeError(`grid.n must be an integer >= 2 (got ${n})`);
  const rule = req.surface;
  if (rule?.rule === 'enclosed') {
    if (!(rule.fraction > 0 && rule.fraction < 1)) throw new RangeError(`surface.fraction must be between 0 and 1 (got ${rule.fraction})`);
  } else if (rule?.rule === 'psi') {
    if (!(rule.value > 0) || !Number.isFinite(rule.value)) throw new RangeError(`surface.value must be a positive |psi| level (got ${rule.value})`);
  } else {
    throw new RangeError(`surface.rule must be 'enclosed' or 'psi'`);
  }
  const compiled = compileState(req.state);
  const ext = req.grid.extent ?? 'auto';
  const extent = ext === 'auto' ? Number(autoExtent(req.state)) : ext;
  if (!(extent > 0) || !Number.isFinite(extent)) throw new RangeError(`grid.extent must be 'auto' or a positive number (got ${String(ext)})`);
  const grid: CubeGrid = { n, extent };

  let t0 = performance.now();
  const field = (opts.sample ?? defaultSample)(compiled, grid);
  const N = n ** 3;
  if (field.re.length !== N || (!compiled.isReal && field.im?.length !== N)) throw new RangeError('sampler returned arrays of the wrong length');
  const tSample = performance.now() - t0;

  t0 = performance.now();
  let isovalue: number;
  let enclosed: number;
  let absBuffer: Float32Array | undefined;
  if (compiled.isReal) {
    if (rule.rule === 'enclosed') {
      const r = enclosedOnReal(field.re, rule.fraction);
      isovalue = Math.sqrt(r.t);
      enclosed = r.enclosed;
    } else {
      isovalue = rule.value;
      const re = field.re;
      let tot = 0;
      let inside = 0;
      const c2 = isovalue * isovalue;
      for (let i = 0; i < N; i++) {
        const d = re[i] * re[i];
        tot += d;
        if (d > c2) inside += d;
      }
      enclosed = tot > 0 ? inside / tot : 0;
    }
  } else {
    const re = field.re;
    const im = field.im as Float32Array;
    absBuffer = new Float32Array(N);
    for (let i = 0; i < N; i++) absBuffer[i] = re[i] * re[i] + im[i] * im[i];
    if (rule.rule === 'enclosed') {
      const t = enclosedThreshold(absBuffer, rule.fraction);
      enclosed = enclosedFractionAt(absBuffer, t);
      isovalue = Math.sqrt(levelBetweenSamples(absBuffer, t));
    } else {
      isovalue = rule.value;
      enclosed = enclosedFractionAt(absBuffer, isovalue * isovalue);
    }
  }
  const tThreshold = performance.now() - t0;

  t0 = performance.now();
  const surfaces = extractOrbitalSurfaces(compiled, field, grid, isovalue, {
    absBuffer,
    normals: opts.normals,
    skipEmpty: opts.skipEmpty,
    blockSize: opts.blockSize,
  });
  const nodal = opts.nodal ? (compiled.isReal ? extractNodalSurface(field.re, grid, isovalue) : null) : undefined;
  const tExtract = performance.now() - t0;

  t0 = performance.now();
  const withStats = surfaces.map((s) => ({ phase: s.phase, mesh: s.mesh, stats: opts.stats === false ? null : meshStats(s.mesh) }));
  const tStats = opts.stats === false ? 0 : performance.now() - t0;

  return {
    isovalue,
    enclosed,
    grid: { n, extent },
    surfaces: withStats,
    ...(nodal !== undefined ? { nodal } : {}),
    timings_ms: { sample: tSample, threshold: tThreshold, extract: tExtract, stats: tStats },
  };
}
