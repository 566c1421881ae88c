// THE recipe → surfaces function. The worker's mesh jobs, the CLI and the Studio's preview Web Worker all call
// recipeToSurfaces; everything a figure claims (level, enclosed fraction over all space with its error, the
// grid, topology, warnings about the box or the resolution) comes out of this one call.
//
// Stages (explicit, each with a hook, so later work can replace one without touching the others):
//   plan       level over ALL space (@psiform/orbitals levelSolver), the surface's features (analyseSurface),
//              the box (automatic: holds the surface with a margin) and the grids (automatic: resolves the
//              smallest feature; inner radial lobes that need finer grids get their own box, cut at the node
//              spheres where |psi| = 0, so no surface crosses a cut)
//   sampling   psi on each grid (hooks.sample: worker threads in Node, the plain sampler in a browser)
//   threshold  how much of the surface the box leaves out (analytic quadrature, not the grid)
//   extracting marching cubes per phase on each grid, no box caps; automatic grids are refined where the mesh's
//              topology differs from the surface's (known from analyseSurface for one-(n, l) states, or checked
//              by refinement for superpositions)
//   refining   every vertex projected onto the analytic level set (safeguarded Newton), normals from the analytic
//              gradient, edges split until every chord lies within the tolerance the output needs (refine.ts);
//              hooks.refine replaces this stage
// Sampling is coarse-to-fine (sparse.ts) unless a caller brings its own sampler: an octree with safe interval
// bounds of psi (@psiform/orbitals fieldBound) samples only the blocks the surface can cross, so the grid can be
// fine while the work follows the surface's area.
//   statistics mesh statistics, topology found against expected, warnings

import {
  analyseSurface,
  autoExtent,
  compileState,
  levelSolver,
  type CompiledState,
  type LevelSolver,
  type OrbitalState,
  type SurfaceAnalysis,
  type SurfaceFeature,
  type Term,
} from '@psiform/orbitals';
import { radialNodes } from '@psiform/orbitals';
import { enclosedFractionAt, enclosedThreshold, fieldBound } from '@psiform/orbitals';
import { ENGINE_CONVENTIONS, type MeshStatsDto } from '@psiform/contracts';
import { extractIsosurface } from './marching-cubes';
import { mergeMeshes, type Mesh } from './mesh';
import { extractNodalSurface } from './nodal';
import { cubeGeometry, type CubeGrid, type Phase, type PhaseSurface } from './orbital-surfaces';
import { meshStats, type MeshStats } from './stats';
import { levelFunction, meshDeviation, projectMesh, refineMesh, type ProjectInfo, type RefineInfo } from './refine';
import { denseBlockField, extractSparse, type BlockField, type SparseInfo } from './sparse';
import { fileTolerance, printTolerance, type OutputScale } from './tolerance';

const { ceil, cos, hypot, round, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/** The model every figure states. */
export const MODEL_NOTE =
  'One-electron hydrogen-like model (psi_nlm = R_nl Y_lm); many-electron orbitals differ. Lengths in Bohr radii (a0).';

/** The sign conventions every figure states (CLI help, API docs and exported metadata quote this text). */
export const CONVENTIONS_NOTE = ENGINE_CONVENTIONS;

/** Units of every number a result carries. */
export const RESULT_UNITS = {
  length: 'a0 (Bohr radius = 0.529177210903 Å)',
  isovalue: 'a0^-3/2 (|psi|)',
  density: 'a0^-3 (|psi|^2)',
  area: 'a0^2',
  volume: 'a0^3',
  fraction: 'probability, 0..1',
  time: 'ms',
} as const;

/**
 * Points per side the automatic grid starts from, and its ceilings. All odd: an automatic grid always has an odd
 * number of points per side (oddN), so the centred lattice holds the origin, the three axes and the coordinate
 * planes, where many states vanish exactly (see ringHoleHeld).
 */
export const AUTO_GRID = { base: 97, max: 257, maxComplex: 225, min: 25 } as const;

export type SurfaceRule = { rule: 'enclosed'; fraction: number } | { rule: 'psi'; value: number };

export interface UploadSource {
  kind: 'upload';
  sizes: readonly [number, number, number];
  spacing: readonly [number, number, number];
  origin: readonly [number, number, number];
  quantity: 'psi' | 'density';
}

/** The part of a recipe (structurally @psiform/contracts' Recipe) this function reads. */
export interface SurfaceRecipe {
  content: { Z: number; terms: readonly Term[] };
  grid: { n: number | 'auto'; extent?: 'auto' | number };
  surface: SurfaceRule;
  source?: { kind: 'computed' } | (UploadSource & Record<string, unknown>);
  stage?: { material?: { nodalOutline?: boolean } };
}

export type SurfaceStage = 'sampling' | 'threshold' | 'extracting' | 'refining' | 'statistics';

export interface SampledField {
  re: Float32Array;
  im: Float32Array | null;
}

export interface RefineContext {
  compiled: CompiledState;
  isovalue: number;
  surfaces: PhaseSurface[];
}

export interface SurfaceHooks {
  /** Samples psi on a cube grid (the state as given in the recipe; compile it the same way). Default: compiled.sampleGrid. */
  sample?: (state: OrbitalState, grid: CubeGrid, compiled: CompiledState) => SampledField | Promise<SampledField>;
  /** Called on entering each stage (the worker writes it to the job row). */
  onStage?: (stage: SurfaceStage) => void | Promise<void>;
  /** Replaces the identity refinement (issue "surfaces": projection onto the analytic level set). */
  refine?: (ctx: RefineContext) => PhaseSurface[] | Promise<PhaseSurface[]>;
  /** Upload recipes: the decoded cube (float32, x fastest). */
  cube?: Float32Array;
  /** Largest points per side an automatic grid may use (the preview passes a smaller one). */
  maxN?: number;
  /** Also extract the nodal surfaces (psi = 0) between the lobes (real states); default: recipe.stage.material.nodalOutline. */
  nodal?: boolean;
  /** Skip mesh statistics (timings_ms.statistics is then 0; topology is not compared). */
  stats?: boolean;
  /** Kept for older callers: normals are always analytic now (the refining stage writes -grad F at every vertex). */
  normals?: 'analytic' | 'field';
  /**
   * Largest distance (a0) the mesh may lie from the true surface (vertices, edge midpoints, triangle centroids);
   * 'file': the 3D-file default (tolerance.ts fileTolerance: exact for every raster export, within a triangle budget). Default: from `output` (a quarter pixel,
   * printTolerance), else none: the vertices are projected onto the surface and nothing is split (the preview).
   */
  tolerance?: number | 'file';
  /** The image the surfaces are drawn into (exports): sets the tolerance when `tolerance` is not given. */
  output?: OutputScale;
  /** Limit on triangles per surface while refining (default 4 M); reaching it is reported as a warning. */
  maxTriangles?: number;
  /**
   * Mesh a real state's upper half (quarter, eighth) and reflect it where its terms share a parity per axis
   * (sparse.ts, mirrorOf); default true. false meshes every block (the bench's and the tests' comparison).
   */
  symmetry?: boolean;
}

export type WarningCode = 'box-cuts-surface' | 'box-cuts-density' | 'feature-unresolved' | 'topology-mismatch' | 'topology-unverified' | 'measured-in-cube' | 'tolerance-unmet';

export interface SurfaceWarning {
  code: WarningCode;
  message: string;
  /** box-cuts-surface: the half-width (a0) that would hold the whole surface. */
  suggestedExtent?: number;
  /** feature-unresolved: the feature and the points per side that would resolve it. */
  feature?: { kind: string; size: number; description: string };
  suggestedN?: number;
}

export interface GridRegion {
  /** Points per side and half-width (a0) of this cube; spacing = 2 extent / (n - 1). */
  n: number;
  extent: number;
  spacing: number;
  /** Radial range this cube draws (node spheres); 0 and null (= infinity) for a single cube. */
  rMin: number;
  rMax: number | null;
}

export interface SurfacesResult {
  model: string;
  conventions: string;
  units: typeof RESULT_UNITS;
  rule: SurfaceRule;
  /** |psi| level of the surfaces, a0^-3/2. */
  isovalue: number;
  /** |psi|² level, a0^-3. */
  density: number;
  /**
   * Largest |psi| of the state (a0^-3/2) as the level solver found it over all space, independent of the grid: the
   * |psi| rule's upper limit. null for uploaded cubes (no analytic state).
   */
  maxAbsPsi: number | null;
  enclosed: {
    /** Probability inside the surface over all space (computed state), or inside the cube (upload). */
    fraction: number;
    /** Estimated absolute error of `fraction`. */
    error: number;
    /** The part of `fraction` inside the box: what the figure draws. Equal to fraction when the box holds the surface. */
    inBox: number;
    /** 'all space' (computed states) or 'inside the uploaded cube'. */
    over: 'all space' | 'inside the uploaded cube';
    method: string;
  };
  grid: {
    /** 'auto': chosen by the engine; 'fixed': as the recipe asked. */
    mode: 'auto' | 'fixed';
    n: number;
    extent: number;
    spacing: number;
    regions: GridRegion[];
  };
  box: { meetsSurface: boolean };
  surfaces: { phase: Phase; mesh: Mesh; stats: MeshStats | null }[];
  nodal?: Mesh | null;
  topology: {
    expected: Partial<Record<Phase, { components: number; euler: number }>> | null;
    found: Partial<Record<Phase, { components: number; euler: number }>> | null;
    matches: boolean | null;
  };
  features: { smallest: { kind: string; size: number; description: string } | null; radialNodes: number[][]; ring: boolean };
  warnings: SurfaceWarning[];
  /** How exact the surfaces are (computed states; null for uploaded cubes, which have no analytic field). */
  refinement: SurfaceRefinement | null;
  /** The analytic field the surfaces lie on (computed states; null for uploads): for checks and the screen GLB. */
  field: CompiledState | null;
  /** How psi was sampled: 'sparse' (coarse-to-fine, blocks the surface can cross) or 'dense' (every grid point). */
  sampling: { method: 'sparse' | 'dense'; points: number; densePoints: number; blocksActive: number; blocksTotal: number };
  timings_ms: Record<SurfaceStage | 'plan', number>;
}

export interface SurfaceRefinement {
  /** The distance (a0) asked for, and where it came from. */
  tolerance: number;
  toleranceFrom: 'caller' | 'print' | '3D file' | 'none';
  /** The surface's half-width (a0) the print and 3D-file tolerances scale with (tolerance.ts). */
  surfaceHalfWidth: number;
  /** Largest first-order distance |F| / |grad F| of vertices, edge midpoints and centroids from the surface (a0); NaN: not measured. */
  maxDeviation: number;
  /** Vertices projected, and those whose Newton iteration failed (left where marching cubes put them). */
  projected: number;
  projectionFailed: number;
  trianglesBefore: number;
  trianglesAfter: number;
  rounds: number;
  met: boolean;
}

/** A |psi| level at or above the state's largest |psi|: there is no surface. Carries the limit for the message. */
export class NoSurfaceError extends RangeError {
  constructor(
    readonly value: number,
    readonly maxAbsPsi: number,
  ) {
    super(`no surface: |psi| = ${value} is above the largest |psi| of this state (${fmt(maxAbsPsi)} a0^-3/2)`);
    this.name = 'NoSurfaceError';
  }
}

function fmt(x: number): string {
  return Number(x.toPrecision(4)).toString();
}

function pct(x: number): string {
  return `${(100 * x).toFixed(x > 0.9999 || x < 0.0001 ? 4 : 2)}%`;
}

function validate(recipe: SurfaceRecipe): void {
  if (!recipe || typeof recipe !== 'object') throw new RangeError('recipe must be an object');
  const n = recipe.grid?.n;
  if (n !== 'auto' && (!Number.isInteger(n) || (n as number) < 2)) throw new RangeError(`grid.n must be 'auto' or an integer >= 2 (got ${String(n)})`);
  const ext = recipe.grid.extent ?? 'auto';
  if (ext !== 'auto' && (!(ext > 0) || !Number.isFinite(ext))) throw new RangeError(`grid.extent must be 'auto' or a positive number (got ${String(ext)})`);
  const rule = recipe.surface;
  if (rule?.rule === 'enclosed') {
    if (!(rule.fraction > 0 && rule.fraction < 1)) throw new RangeError(`surface.fraction must be between 0 and 1 (got ${rule.fraction})`);
  } else if (rule?.rule === 'psi') {
    if (!(rule.value > 0) || !Number.isFinite(rule.value)) throw new RangeError(`surface.value must be a positive |psi| level (got ${rule.value})`);
  } else throw new RangeError(`surface.rule must be 'enclosed' or 'psi'`);
}

function stateOf(recipe: SurfaceRecipe): OrbitalState {
  return { Z: recipe.content.Z, terms: recipe.content.terms.map((t) => ({ n: t.n, l: t.l, m: t.m, basis: t.basis, re: t.re, im: t.im ?? 0 })) };
}

const defaultSample = (_state: OrbitalState, grid: CubeGrid, compiled: CompiledState): SampledField => {
  const N = grid.n ** 3;
  const re = new Float32Array(N);
  const im = compiled.isReal ? null : new Float32Array(N);
  compiled.sampleGrid({ n: grid.n, extent: grid.extent as never }, re, im);
  return { re, im };
};

/** Everything decided before sampling. */
export interface SurfacePlan {
  state: OrbitalState;
  compiled: CompiledState;
  solver: LevelSolver;
  level: { density: number; isovalue: number; fraction: number; error: number; method: string };
  analysis: SurfaceAnalysis | null;
  mode: 'auto' | 'fixed';
  extent: number;
  /** Half-width the whole surface needs (a0). */
  surfaceHalfWidth: number;
  regions: GridRegion[];
  cap: number;
  warnings: SurfaceWarning[];
}

/** The grid step a feature needs: two steps across it (a grid point inside every part and every gap). */
function stepFor(f: SurfaceFeature | null): number {
  return f ? f.size / 2 : Infinity;
}

/** The odd number nearest above n, or below when that passes the ceiling `hi` (hi is odd or gives way). */
function oddN(n: number, hi = Infinity): number {
  if (n % 2 === 1) return n;
  return n + 1 <= hi ? n + 1 : n - 1;
}

function nFor(extent: number, step: number, lo: number, hi: number): number {
  const n = ceil((2 * extent) / step) + 1;
  return oddN(Math.max(lo, Math.min(hi, Number.isFinite(n) ? n : lo)), hi);
}

/**
 * Whether a grid holds the hole of every ring open whatever its width. For a complex state of one m ≠ 0 every part
 * is a ring round the z axis (|psi| does not depend on φ), and psi = 0 on that axis exactly (Y_lm ∝ sin^|m| θ).
 * A centred cube with an odd number of points per side has the axis as a lattice line, so every grid point on it
 * reads 0, below every level: no marching-cubes surface crosses the axis and no ring can close into a ball,
 * however narrow its hole (the inner rings of np, m = ±1 are a few hundredths of a0 across). The ring's tube
 * (its thickness and width, the other features) still needs two steps across.
 */
function ringHoleHeld(a: SurfaceAnalysis, region: { n: number }): boolean {
  return a.ring && region.n % 2 === 1;
}

/** The features a grid must step across twice (the ring holes it holds open by the axis left out). */
function needsStep(a: SurfaceAnalysis, f: SurfaceFeature, region: { n: number }): boolean {
  return !(f.kind === 'ring-hole' && ringHoleHeld(a, region));
}

/** The smallest feature of radial lobe `lobe` a grid of this parity must resolve (null: none). */
function lobeSmallest(a: SurfaceAnalysis, lobe: number, region: { n: number }): SurfaceFeature | null {
  let best: SurfaceFeature | null = null;
  for (const f of a.features) if (f.lobe === lobe && needsStep(a, f, region) && (!best || f.size < best.size)) best = f;
  return best;
}

/** Stage 1: level over all space, features, box and grids. Synchronous and cheap next to sampling. */
export function planSurfaces(recipe: SurfaceRecipe, opts: { maxN?: number } = {}): SurfacePlan {
  validate(recipe);
  const state = stateOf(recipe);
  const compiled = compileState(state);
  const solver = levelSolver(compiled);
  const rule = recipe.surface;
  let level: SurfacePlan['level'];
  if (rule.rule === 'enclosed') {
    const L = solver.solve(rule.fraction);
    level = { ...L, method: solver.method };
  } else {
    const t = rule.value * rule.value;
    if (!(t < solver.maxDensity)) throw new NoSurfaceError(rule.value, sqrt(solver.maxDensity));
    const e = solver.fractionAt(t);
    level = { density: t, isovalue: rule.value, fraction: e.fraction, error: e.error, method: solver.method };
  }
  const analysis = analyseSurface(compiled, level.density);
  const halfWidth = Number(solver.halfWidth(level.density));
  const capIn = Math.max(AUTO_GRID.min, Math.min(opts.maxN ?? Infinity, compiled.isReal ? AUTO_GRID.max : AUTO_GRID.maxComplex));
  const cap = capIn % 2 === 1 ? capIn : capIn - 1; // automatic grids are odd (a caller's maxN may be even)
  const warnings: SurfaceWarning[] = [];
  const fixedN = recipe.grid.n === 'auto' ? null : (recipe.grid.n as number);
  const extentIn = recipe.grid.extent ?? 'auto';

  // The box: automatic = the surface's half-width + 5 % (directions are sampled) + 1.5 grid steps, so marching
  // cubes has a layer of outside points all round; the step comes from the grid chosen for it.
  const baseN = fixedN ?? Math.min(cap, AUTO_GRID.base);
  let extent: number;
  if (extentIn === 'auto') {
    const e0 = 1.05 * halfWidth;
    extent = e0 + (1.5 * 2 * e0) / (baseN - 1);
  } else extent = extentIn;

  let regions: GridRegion[];
  if (fixedN !== null) {
    regions = [{ n: fixedN, extent, spacing: (2 * extent) / (fixedN - 1), rMin: 0, rMax: null }];
  } else if (analysis) {
    regions = layeredRegions(analysis, extent, cap);
  } else {
    const n = Math.min(cap, AUTO_GRID.base);
    regions = [{ n, extent, spacing: (2 * extent) / (n - 1), rMin: 0, rMax: null }];
  }
  return {
    state,
    compiled,
    solver,
    level,
    analysis,
    mode: fixedN === null ? 'auto' : 'fixed',
    extent,
    surfaceHalfWidth: halfWidth,
    regions,
    cap,
    warnings,
  };
}

/**
 * Grids for a one-(n, l) state: from the outermost lobe inwards, a lobe joins the current cube while the cube can
 * resolve it within `cap` points per side; the first lobe that cannot starts a new, smaller cube whose half-width
 * is that lobe's outer node radius (every inner lobe lies inside it). Cubes meet at node spheres, where psi = 0
 * and no surface passes, so the meshes of different cubes never need stitching.
 */
function layeredRegions(a: SurfaceAnalysis, extent: number, cap: number): GridRegion[] {
  const present = a.layers.filter((l) => l.present);
  const groups: { E: number; step: number; lobes: typeof present }[] = [];
  const globalStep = (2 * extent) / (Math.min(cap, AUTO_GRID.base) - 1);
  // A cube grows past the base grid by at most a quarter before the finer lobes get a cube of their own: inner
  // cubes are small, so this costs fewer points than one fine cube for everything.
  const growCap = Math.min(cap, round(1.25 * AUTO_GRID.base));
  let cur = { E: extent, step: globalStep, lobes: [] as typeof present };
  // Automatic grids are odd (nFor), so ring holes are held open by the axis (ringHoleHeld).
  const auto = { n: AUTO_GRID.base };
  const lobeStep = (layer: (typeof present)[number]) => stepFor(lobeSmallest(a, layer.lobe, auto));
  for (let i = present.length - 1; i >= 0; i--) {
    const layer = present[i];
    const need = Math.min(cur.step, lobeStep(layer));
    if (cur.lobes.length === 0 || ceil((2 * cur.E) / need) + 1 <= (groups.length < 6 ? growCap : cap)) {
      cur.lobes.push(layer);
      cur.step = need;
      continue;
    }
    groups.push(cur);
    // A new cube holds every lobe from this one inwards (they lie inside this lobe's outer node sphere).
    cur = { E: Math.min(cur.E, layer.rHi), step: Math.min(globalStep, lobeStep(layer)), lobes: [layer] };
  }
  groups.push(cur);
  const regions: GridRegion[] = groups.map((g, k) => {
    const n = nFor(g.E, g.step, AUTO_GRID.min, cap);
    return { n, extent: g.E, spacing: (2 * g.E) / (n - 1), rMin: k === groups.length - 1 ? 0 : g.lobes[g.lobes.length - 1].rLo, rMax: null };
  });
  // Each cube draws from its innermost lobe's inner node out to where the next cube outwards begins.
  for (let k = 1; k < regions.length; k++) regions[k].rMax = regions[k - 1].rMin;
  return regions;
}

/**
 * The real field the surfaces are extracted from (see analyseSurface): psi for real states; for complex states
 * |psi| with the sign of R(r) (and of P_l^|m|(cos θ) for one-m states), so parts of opposite sign cannot merge.
 * Points outside the region's radial range are set to 0 (below every level): cubes meet at node spheres.
 * Written into `re` (its values are not needed afterwards).
 */
function extractionField(plan: SurfacePlan, region: GridRegion, field: SampledField): Float32Array {
  const { n, extent } = region;
  const h = (2 * extent) / (n - 1);
  const f = field.re;
  const im = field.im;
  const rule = extractionRule(plan, region);
  if (!rule) return f;
  for (let iz = 0, i = 0; iz < n; iz++) {
    const z = -extent + iz * h;
    for (let iy = 0; iy < n; iy++) {
      const y = -extent + iy * h;
      for (let ix = 0; ix < n; ix++, i++) f[i] = extractionValue(rule, -extent + ix * h, y, z, f[i], im ? im[i] : 0);
    }
  }
  return f;
}

/** What turns psi into the extraction field of a region (null: the field is psi itself). */
interface ExtractionRule {
  masked: boolean;
  rMin: number;
  rMax: number;
  real: boolean;
  signedRadial: boolean;
  nodes: readonly number[];
  cones: number[] | null;
}

function extractionRule(plan: SurfacePlan, region: GridRegion): ExtractionRule | null {
  const a = plan.analysis;
  const rMin = region.rMin;
  const rMax = region.rMax ?? Infinity;
  const masked = rMin > 0 || Number.isFinite(rMax);
  if (plan.compiled.isReal && !masked) return null;
  return {
    masked,
    rMin,
    rMax,
    real: plan.compiled.isReal,
    signedRadial: !plan.compiled.isReal && a !== null,
    nodes: a ? a.radialNodes : [],
    cones: a && a.field === 'signed' && !plan.compiled.isReal && a.nodalCones ? a.nodalCones.map(cos) : null,
  };
}

/** The extraction field at one point from psi there (see extractionField). */
function extractionValue(rule: ExtractionRule, x: number, y: number, z: number, re: number, im: number): number {
  const r = sqrt(x * x + (y * y + z * z));
  if (rule.masked && (r < rule.rMin || r > rule.rMax)) return 0;
  if (rule.real) return re;
  const mod = sqrt(re * re + im * im);
  if (!rule.signedRadial) return mod;
  let sign = 1;
  const nodes = rule.nodes;
  for (let k = 0; k < nodes.length && nodes[k] < r; k++) sign = -sign;
  const cones = rule.cones;
  if (cones) {
    const mu = r > 0 ? z / r : 1;
    for (let k = 0; k < cones.length; k++) if (cones[k] > mu) sign = -sign;
  }
  return sign * mod;
}

/**
 * The extraction field of a region as blocks (sparse.ts): safe enclosures from @psiform/orbitals fieldBound,
 * turned into enclosures of the extraction field, and exact samples at lattice points through sampleBox.
 */
function regionBlockField(plan: SurfacePlan, region: GridRegion, timer: { ms: number }): BlockField {
  const { n, extent } = region;
  const h = (2 * extent) / (n - 1);
  const compiled = plan.compiled;
  const fb = fieldBound(compiled);
  const rule = extractionRule(plan, region);
  const w = new Float64Array(4);
  const S = 1024;
  let re = new Float32Array(S);
  let im = compiled.isReal ? null : new Float32Array(S);
  const origin = [-extent, -extent, -extent] as const;
  return {
    bound(x0, x1, y0, y1, z0, z1, out) {
      const dx = x0 > 0 ? x0 : x1 < 0 ? -x1 : 0;
      const dy = y0 > 0 ? y0 : y1 < 0 ? -y1 : 0;
      const dz = z0 > 0 ? z0 : z1 < 0 ? -z1 : 0;
      const r0 = sqrt(dx * dx + dy * dy + dz * dz);
      const r1 = sqrt(Math.max(x0 * x0, x1 * x1) + Math.max(y0 * y0, y1 * y1) + Math.max(z0 * z0, z1 * z1));
      out[2] = 0;
      if (rule?.masked && (r1 < rule.rMin || r0 > rule.rMax)) {
        out[0] = out[1] = 0;
        return;
      }
      fb.box(x0, x1, y0, y1, z0, z1, w);
      if (compiled.isReal) {
        out[0] = w[0];
        out[1] = w[1];
      } else {
        const minAbs = (lo: number, hi: number) => (lo > 0 ? lo : hi < 0 ? -hi : 0);
        const maxAbs = (lo: number, hi: number) => Math.max(-lo, hi);
        const mlo = hypot(minAbs(w[0], w[1]), minAbs(w[2], w[3]));
        const mhi = hypot(maxAbs(w[0], w[1]), maxAbs(w[2], w[3]));
        if (rule?.signedRadial) {
          out[0] = -mhi;
          out[1] = mhi;
          out[2] = mlo;
        } else {
          out[0] = mlo;
          out[1] = mhi;
        }
      }
      if (rule?.masked && (r0 < rule.rMin || r1 > rule.rMax)) {
        // The box meets a cut: some of its points read 0.
        out[0] = Math.min(out[0], 0);
        out[1] = Math.max(out[1], 0);
        out[2] = 0;
      }
    },
    sample(start, size, out) {
      const t0 = performance.now();
      const N = size[0] * size[1] * size[2];
      if (re.length < N) {
        re = new Float32Array(N);
        if (im) im = new Float32Array(N);
      }
      if (!rule) compiled.sampleBox({ origin, spacing: h, start, size }, out, null);
      else {
        compiled.sampleBox({ origin, spacing: h, start, size }, re, im);
        for (let k = 0, i = 0; k < size[2]; k++) {
          const z = -extent + (start[2] + k) * h;
          for (let j = 0; j < size[1]; j++) {
            const y = -extent + (start[1] + j) * h;
            for (let q = 0; q < size[0]; q++, i++) out[i] = extractionValue(rule, -extent + (start[0] + q) * h, y, z, re[i], im ? im[i] : 0);
          }
        }
      }
      timer.ms += performance.now() - t0;
    },
  };
}

function countTopology(surfaces: { phase: Phase; stats: MeshStats | null }[]): Partial<Record<Phase, { components: number; euler: number }>> {
  const out: Partial<Record<Phase, { components: number; euler: number }>> = {};
  for (const s of surfaces) if (s.stats) out[s.phase] = { components: s.stats.components, euler: s.stats.euler };
  return out;
}

function sameTopology(a: Partial<Record<Phase, { components: number; euler: number }>>, b: Partial<Record<Phase, { components: number; euler: number }>>): boolean {
  for (const p of ['+', '-', 'complex'] as const) {
    const x = a[p] ?? { components: 0, euler: 0 };
    const y = b[p] ?? { components: 0, euler: 0 };
    if (x.components !== y.components || x.euler !== y.euler) return false;
  }
  return true;
}

/** Expected topology of the lobes a region draws (sum over its lobes). */
function expectedFor(plan: SurfacePlan, region: GridRegion): Partial<Record<Phase, { components: number; euler: number }>> | null {
  const a = plan.analysis;
  if (!a) return null;
  const rMax = region.rMax ?? Infinity;
  const plus = { components: 0, euler: 0 };
  const minus = { components: 0, euler: 0 };
  for (const l of a.layers) {
    if (l.rLo < region.rMin - 1e-12 || l.rLo >= rMax) continue;
    plus.components += l.plus.components;
    plus.euler += l.plus.euler;
    minus.components += l.minus.components;
    minus.euler += l.minus.euler;
  }
  return plan.compiled.isReal ? { '+': plus, '-': minus } : { complex: { components: plus.components + minus.components, euler: plus.euler + minus.euler } };
}

function describeTopology(t: Partial<Record<Phase, { components: number; euler: number }>>): string {
  return (['+', '-', 'complex'] as const)
    .filter((p) => t[p] && t[p]!.components > 0)
    .map((p) => `${p === 'complex' ? '' : `${p}: `}${t[p]!.components} part${t[p]!.components === 1 ? '' : 's'}, Euler ${t[p]!.euler}`)
    .join('; ');
}

interface RegionMesh {
  region: GridRegion;
  surfaces: PhaseSurface[];
  stats: Map<Phase, MeshStats>;
  /** The dense extraction field (null when sampled coarse-to-fine). */
  field: Float32Array | null;
  points: number;
  blocks: { active: number; total: number };
  ms: { sample: number; extract: number };
}

/**
 * Marching cubes on a region through the block extractor (sparse.ts), whatever sampled it: coarse-to-fine blocks,
 * or a dense field read block by block with exact block ranges. One extractor means one vertex and triangle
 * order, so the same grid gives bit-identical meshes on every path (worker, CLI, preview).
 */
function extractRegion(plan: SurfacePlan, region: GridRegion, field: BlockField, withStats: boolean, symmetry: boolean): { surfaces: PhaseSurface[]; stats: Map<Phase, MeshStats>; info: SparseInfo } {
  const info = {} as SparseInfo;
  const c = plan.level.isovalue;
  const [plus, minus] = extractSparse(field, { n: region.n, extent: region.extent }, [{ level: c, inside: 'above' }, { level: -c, inside: 'below' }], { mirror: symmetry ? mirrorOf(plan) : [0, 0, 0] }, info);
  const surfaces: PhaseSurface[] = plan.compiled.isReal
    ? [
        { phase: '+', mesh: plus },
        { phase: '-', mesh: minus },
      ]
    : [{ phase: 'complex', mesh: mergeMeshes([plus, minus]) }];
  const stats = new Map<Phase, MeshStats>();
  if (withStats) for (const s of surfaces) stats.set(s.phase, meshStats(s.mesh));
  return { surfaces, stats, info };
}

/**
 * Mirror symmetry of a real state's field about the coordinate planes, per axis: psi is a sum of R(r) x^a y^b z^c
 * terms, so when every term's power of x is even psi(-x, y, z) = psi (+1), when every one is odd it is -psi (-1),
 * otherwise neither is known (0). Radial masks and cuts keep it (they depend on r only). Complex states are meshed
 * from |psi| with signs from nodal cones, whose symmetry is not worked out here: none is used for them.
 */
function mirrorOf(plan: SurfacePlan): [number, number, number] {
  if (!plan.compiled.isReal) return [0, 0, 0];
  const out: [number, number, number] = [0, 0, 0];
  for (let axis = 0; axis < 3; axis++) {
    let parity = -1;
    let same = true;
    for (const block of plan.compiled.polynomials)
      for (const m of block) {
        if (m.re === 0) continue;
        const p = (axis === 0 ? m.a : axis === 1 ? m.b : m.c) & 1;
        if (parity === -1) parity = p;
        else if (p !== parity) same = false;
      }
    out[axis] = !same || parity === -1 ? 0 : parity === 0 ? 1 : -1;
  }
  return out;
}


async function meshRegion(plan: SurfacePlan, region: GridRegion, hooks: SurfaceHooks, withStats: boolean, sparse: boolean): Promise<RegionMesh> {
  const grid: CubeGrid = { n: region.n, extent: region.extent };
  if (sparse) {
    const timer = { ms: 0 };
    const t0 = performance.now();
    const { surfaces, stats, info } = extractRegion(plan, region, regionBlockField(plan, region, timer), withStats, hooks.symmetry !== false);
    const total = performance.now() - t0;
    return { region, surfaces, stats, field: null, points: info.pointsSampled, blocks: { active: info.blocksActive, total: info.blocksTotal }, ms: { sample: timer.ms, extract: total - timer.ms } };
  }
  const sample = hooks.sample ?? defaultSample;
  let t0 = performance.now();
  const field = await sample(plan.state, grid, plan.compiled);
  const N = region.n ** 3;
  if (field.re.length !== N || (!plan.compiled.isReal && field.im?.length !== N)) throw new RangeError('sampler returned arrays of the wrong length');
  const tSample = performance.now() - t0;
  t0 = performance.now();
  const f = extractionField(plan, region, field);
  const { surfaces, stats } = extractRegion(plan, region, denseBlockField(f, region.n), withStats, hooks.symmetry !== false);
  const nb = ceil((region.n - 1) / 8) ** 3;
  return { region, surfaces, stats, field: f, points: N, blocks: { active: nb, total: nb }, ms: { sample: tSample, extract: performance.now() - t0 } };
}

/** The one recipe → surfaces function (see the file comment). */
export async function recipeToSurfaces(recipe: SurfaceRecipe, hooks: SurfaceHooks = {}): Promise<SurfacesResult> {
  if (recipe?.source?.kind === 'upload') return cubeToSurfaces(recipe, hooks);
  const timings: SurfacesResult['timings_ms'] = { plan: 0, sampling: 0, threshold: 0, extracting: 0, refining: 0, statistics: 0 };
  let t0 = performance.now();
  await hooks.onStage?.('sampling');
  const plan = planSurfaces(recipe, { maxN: hooks.maxN });
  timings.plan = performance.now() - t0;
  const withStats = hooks.stats !== false;
  // A box that cuts the surface leaves it open: its topology cannot be the closed surface's, so it is not compared.
  const boxHoldsSurface = plan.surfaceHalfWidth * 1.0005 < plan.extent;
  const verify = withStats && plan.mode === 'auto' && boxHoldsSurface;

  // sampling + extracting, region by region (sampling dominates; timings are split accordingly)
  const meshes: RegionMesh[] = [];
  // Coarse-to-fine unless the caller samples (its own grid, e.g. the preview's kept one).
  const wantNodal = hooks.nodal ?? recipe.stage?.material?.nodalOutline === true;
  const sparse = !hooks.sample;
  const run = async (region: GridRegion) => {
    const m = await meshRegion(plan, region, hooks, verify, sparse);
    timings.sampling += m.ms.sample;
    timings.extracting += m.ms.extract;
    return m;
  };
  for (const region of plan.regions) meshes.push(await run(region));

  await hooks.onStage?.('threshold');
  t0 = performance.now();
  // The cube holds the whole surface when its half-width exceeds the surface's: then nothing lies outside.
  const outside = boxHoldsSurface ? { fraction: 0, error: 0 } : plan.solver.outsideBox(plan.level.density, plan.extent);
  timings.threshold = performance.now() - t0;

  await hooks.onStage?.('extracting');
  const warnings = plan.warnings;
  if (verify) {
    // Refine automatic grids until the mesh's topology is the surface's (or the ceiling is reached).
    for (let k = 0; k < meshes.length; k++) {
      const expected = expectedFor(plan, meshes[k].region);
      let found = countTopology(meshes[k].surfaces.map((s) => ({ phase: s.phase, stats: meshes[k].stats.get(s.phase) ?? null })));
      if (expected) {
        while (!sameTopology(found, expected) && meshes[k].region.n < plan.cap) {
          const r = meshes[k].region;
          const n = oddN(Math.min(plan.cap, ceil(r.n * 1.5)), plan.cap);
          meshes[k] = await run({ ...r, n, spacing: (2 * r.extent) / (n - 1) });
          plan.regions[k] = meshes[k].region;
          found = countTopology(meshes[k].surfaces.map((s) => ({ phase: s.phase, stats: meshes[k].stats.get(s.phase) ?? null })));
        }
      } else if (meshes.length === 1 && meshes[0].region.n < plan.cap) {
        // A superposition of several (n, l): no topology is known in advance; refine until two grids agree.
        let agreed = false;
        for (let it = 0; it < 4 && !agreed && meshes[0].region.n < plan.cap; it++) {
          const r = meshes[0].region;
          const n = oddN(Math.min(plan.cap, ceil(r.n * 1.5)), plan.cap);
          const next = await run({ ...r, n, spacing: (2 * r.extent) / (n - 1) });
          const nextFound = countTopology(next.surfaces.map((s) => ({ phase: s.phase, stats: next.stats.get(s.phase) ?? null })));
          agreed = sameTopology(found, nextFound);
          meshes[0] = next;
          plan.regions[0] = next.region;
          found = nextFound;
        }
        if (!agreed) {
          warnings.push({
            code: 'topology-unverified',
            message: `the surface's parts could not be confirmed: successive grids up to ${meshes[0].region.n} points per side gave different part counts; details thinner than ${fmt(meshes[0].region.spacing)} a0 may be missing or merged`,
          });
        }
      }
    }
  }
  let surfaces = mergeRegions(meshes, plan.compiled.isReal);
  t0 = performance.now();
  // The nodal surfaces come from the dense field of the first grid (sampled here when it was sampled coarse-to-fine).
  const nodalField = (): Float32Array => meshes[0].field ?? extractionField(plan, meshes[0].region, defaultSample(plan.state, { n: meshes[0].region.n, extent: meshes[0].region.extent }, plan.compiled));
  const nodal = wantNodal && plan.compiled.isReal ? extractNodalSurface(nodalField(), { n: meshes[0].region.n, extent: meshes[0].region.extent }, plan.level.isovalue) : wantNodal ? null : undefined;
  timings.extracting += performance.now() - t0;

  await hooks.onStage?.('refining');
  t0 = performance.now();
  let refinement: SurfaceRefinement | null = null;
  if (hooks.refine) surfaces = await hooks.refine({ compiled: plan.compiled, isovalue: plan.level.isovalue, surfaces });
  else {
    const r = exactSurfaces(plan, surfaces, hooks);
    surfaces = r.surfaces;
    refinement = r.refinement;
    if (!refinement.met) {
      plan.warnings.push({
        code: 'tolerance-unmet',
        message: `the mesh lies up to ${fmt(refinement.maxDeviation)} a0 from the true surface, more than the ${fmt(refinement.tolerance)} a0 the output needs: refinement stopped at its triangle limit or at a detail the grid does not resolve`,
      });
    }
  }
  timings.refining = performance.now() - t0;

  await hooks.onStage?.('statistics');
  t0 = performance.now();
  const withStatsList = surfaces.map((s) => ({ phase: s.phase, mesh: s.mesh, stats: withStats ? meshStats(s.mesh) : null }));
  const found = withStats ? countTopology(withStatsList) : null;
  const expected = plan.analysis ? plan.analysis.topology : null;
  const openEdges = withStatsList.some((s) => (s.stats?.boundaryEdges ?? 0) > 0);
  const meets = outside.fraction > 1e-9 || openEdges || !boxHoldsSurface;
  const matches = found && expected && !meets ? sameTopology(found, expected) : null;
  const inBox = Math.max(0, plan.level.fraction - outside.fraction);
  const g0 = plan.regions[0];
  if (meets) {
    const need = 1.05 * plan.surfaceHalfWidth + 2 * g0.spacing;
    warnings.unshift({
      code: 'box-cuts-surface',
      message:
        `the box (±${fmt(plan.extent)} a0) cuts the surface: it is open where it meets the box, and the part drawn encloses ${pct(inBox)} ` +
        `of the probability, not the ${pct(plan.level.fraction)} the whole surface encloses over all space; widen the box to ±${fmt(need)} a0 or more`,
      suggestedExtent: Number(need.toPrecision(4)),
    });
  }
  const smallest = plan.analysis?.smallest ?? null;
  if (plan.analysis && smallest) {
    // Each region must resolve the smallest feature of the lobes it draws.
    for (const r of plan.regions) {
      const f = smallestIn(plan.analysis, r);
      if (f && r.spacing > stepFor(f) * 1.0001) {
        const suggestedN = ceil((2 * r.extent) / stepFor(f)) + 1;
        warnings.push({
          code: 'feature-unresolved',
          message: `the grid step ${fmt(r.spacing)} a0 (${r.n} points over ±${fmt(r.extent)} a0) is coarser than half of ${f.description}: it may be missing or merged in the mesh; ${plan.mode === 'fixed' ? `use grid 'auto' or at least ${suggestedN} points per side` : `the finest grid allowed (${plan.cap} points per side) is not enough`}`,
          feature: { kind: f.kind, size: f.size, description: f.description },
          suggestedN,
        });
        break;
      }
    }
  }
  if (matches === false && found && expected) {
    warnings.push({
      code: 'topology-mismatch',
      message: `the mesh has ${describeTopology(found) || 'no parts'} where the surface has ${describeTopology(expected)}: the grid is too coarse for its smallest details${smallest ? ` (${smallest.description})` : ''}`,
    });
  }
  timings.statistics = performance.now() - t0;
  const a = plan.analysis;
  return {
    model: MODEL_NOTE,
    conventions: CONVENTIONS_NOTE,
    units: RESULT_UNITS,
    rule: recipe.surface,
    isovalue: plan.level.isovalue,
    density: plan.level.density,
    maxAbsPsi: sqrt(plan.solver.maxDensity),
    enclosed: {
      fraction: plan.level.fraction,
      error: plan.level.error,
      inBox: meets ? inBox : plan.level.fraction,
      over: 'all space',
      method: plan.level.method === 'rays' ? 'spherical quadrature over all space (Gauss–Legendre × trapezoid)' : 'radial lobes × angular quadrature over all space',
    },
    grid: { mode: plan.mode, n: g0.n, extent: g0.extent, spacing: g0.spacing, regions: plan.regions },
    box: { meetsSurface: meets },
    surfaces: withStatsList,
    ...(nodal !== undefined ? { nodal } : {}),
    topology: { expected: expected ?? null, found, matches },
    features: {
      smallest: smallest ? { kind: smallest.kind, size: smallest.size, description: smallest.description } : null,
      radialNodes: a ? [a.radialNodes] : plan.compiled.blocks.map(() => []),
      ring: a?.ring ?? false,
    },
    warnings,
    refinement,
    field: plan.compiled,
    sampling: {
      method: sparse ? 'sparse' : 'dense',
      points: meshes.reduce((s, m) => s + m.points, 0),
      densePoints: plan.regions.reduce((s, r) => s + r.n ** 3, 0),
      blocksActive: meshes.reduce((s, m) => s + m.blocks.active, 0),
      blocksTotal: meshes.reduce((s, m) => s + m.blocks.total, 0),
    },
    timings_ms: timings,
  };
}

/**
 * The refining stage: each surface's vertices projected onto its analytic level set, normals from the analytic
 * gradient, then edges split until the mesh lies within the tolerance (refine.ts).
 */
function exactSurfaces(plan: SurfacePlan, surfaces: PhaseSurface[], hooks: SurfaceHooks): { surfaces: PhaseSurface[]; refinement: SurfaceRefinement } {
  let tolerance: number;
  let toleranceFrom: SurfaceRefinement['toleranceFrom'];
  if (hooks.tolerance === 'file') {
    tolerance = NaN; // set below, from the projected meshes (tolerance.ts fileTolerance)
    toleranceFrom = '3D file';
  } else if (hooks.tolerance !== undefined) {
    if (!(hooks.tolerance > 0)) throw new RangeError(`tolerance must be a positive length in a0, 'file' or Infinity (got ${String(hooks.tolerance)})`);
    tolerance = hooks.tolerance;
    toleranceFrom = Number.isFinite(tolerance) ? 'caller' : 'none';
  } else if (hooks.output) {
    tolerance = printTolerance(hooks.output, plan.surfaceHalfWidth);
    toleranceFrom = 'print';
  } else {
    tolerance = Infinity;
    toleranceFrom = 'none';
  }
  const maxMove = Math.max(...plan.regions.map((r) => r.spacing));
  const minSpacing = Math.min(...plan.regions.map((r) => r.spacing));
  const c = plan.level.isovalue;
  const out: SurfaceRefinement = { tolerance, toleranceFrom, surfaceHalfWidth: plan.surfaceHalfWidth, maxDeviation: 0, projected: 0, projectionFailed: 0, trianglesBefore: 0, trianglesAfter: 0, rounds: 0, met: true };
  const pi: ProjectInfo = { maxDistance: 0, failed: 0 };
  // 1. Every vertex onto the analytic level set.
  const projected = surfaces.map((s) => {
    out.trianglesBefore += s.mesh.indices.length / 3;
    if (s.mesh.indices.length === 0) return { s, F: null };
    const F = levelFunction(plan.compiled, s.phase, c);
    projectMesh(s.mesh, F, maxMove, s.phase, pi);
    out.projected += s.mesh.positions.length / 3;
    out.projectionFailed += pi.failed;
    return { s, F };
  });
  if (toleranceFrom === '3D file') {
    // The 3D-file default needs the projected mesh's deviation (its triangle budget, tolerance.ts).
    const deviations = new Float64Array(out.trianglesBefore);
    let at = 0;
    for (const { s, F } of projected) {
      if (!F) continue;
      meshDeviation(s.mesh, F, deviations.subarray(at));
      at += s.mesh.indices.length / 3;
    }
    tolerance = fileTolerance(plan.surfaceHalfWidth, deviations);
    out.tolerance = tolerance;
  }
  // 2. Edges split until the mesh lies within the tolerance.
  const next = projected.map(({ s, F }) => {
    if (!F) return s;
    let mesh = s.mesh;
    if (Number.isFinite(tolerance)) {
      const ri = {} as RefineInfo;
      mesh = refineMesh(s.mesh, F, s.phase, { tolerance, maxTriangles: hooks.maxTriangles, minEdge: minSpacing / 256 }, ri);
      out.maxDeviation = Math.max(out.maxDeviation, ri.maxDeviation);
      out.rounds = Math.max(out.rounds, ri.rounds);
      if (ri.limited) out.met = false;
    } else if (hooks.stats !== false) out.maxDeviation = Math.max(out.maxDeviation, meshDeviation(mesh, F).max);
    else out.maxDeviation = NaN; // not measured (callers that skip statistics)
    out.maxDeviation = Math.max(out.maxDeviation, pi.maxDistance);
    out.trianglesAfter += mesh.indices.length / 3;
    return { phase: s.phase, mesh };
  });
  return { surfaces: next, refinement: out };
}

/** The smallest feature of the lobes a region draws that its grid must step across (ringHoleHeld). */
function smallestIn(a: SurfaceAnalysis, r: GridRegion): SurfaceFeature | null {
  const rMax = r.rMax ?? Infinity;
  let best: SurfaceFeature | null = null;
  for (const l of a.layers) {
    if (!l.present || l.rLo < r.rMin - 1e-12 || l.rLo >= rMax) continue;
    const f = lobeSmallest(a, l.lobe, r);
    if (f && (!best || f.size < best.size)) best = f;
  }
  return best;
}

function mergeRegions(meshes: RegionMesh[], isReal: boolean): PhaseSurface[] {
  const phases: Phase[] = isReal ? ['+', '-'] : ['complex'];
  return phases.map((phase) => {
    const parts = meshes.map((m) => m.surfaces.find((s) => s.phase === phase)?.mesh).filter((m): m is Mesh => !!m);
    return { phase, mesh: parts.length === 1 ? parts[0] : mergeMeshes(parts) };
  });
}

/**
 * Uploaded cubes: no analytic state, so the enclosed fraction can only be measured inside the cube (said in a
 * warning), on the samples (radix selection, @psiform/orbitals enclosedThreshold).
 */
async function cubeToSurfaces(recipe: SurfaceRecipe, hooks: SurfaceHooks): Promise<SurfacesResult> {
  validate(recipe);
  const src = recipe.source as UploadSource;
  const data = hooks.cube;
  const [nx, ny, nz] = src.sizes;
  if (!data || data.length !== nx * ny * nz) throw new RangeError(`the uploaded cube must hold ${nx}×${ny}×${nz} float32 values`);
  const timings: SurfacesResult['timings_ms'] = { plan: 0, sampling: 0, threshold: 0, extracting: 0, refining: 0, statistics: 0 };
  await hooks.onStage?.('sampling');
  await hooks.onStage?.('threshold');
  let t0 = performance.now();
  const density = src.quantity === 'density';
  let isovalue: number;
  let fraction: number;
  const rule = recipe.surface;
  if (density) {
    if (rule.rule === 'enclosed') {
      const t = enclosedThreshold(data, rule.fraction);
      fraction = enclosedFractionAt(data, t);
      isovalue = sqrt(levelBelow(data, t));
    } else {
      isovalue = rule.value;
      fraction = enclosedFractionAt(data, isovalue * isovalue);
    }
  } else {
    const sq = new Float32Array(data.length);
    for (let i = 0; i < data.length; i++) sq[i] = data[i] * data[i];
    if (rule.rule === 'enclosed') {
      const t = enclosedThreshold(sq, rule.fraction);
      fraction = enclosedFractionAt(sq, t);
      isovalue = sqrt(levelBelow(sq, t));
    } else {
      isovalue = rule.value;
      fraction = enclosedFractionAt(sq, isovalue * isovalue);
    }
  }
  timings.threshold = performance.now() - t0;
  await hooks.onStage?.('extracting');
  t0 = performance.now();
  const dims = { nx, ny, nz };
  const unit = { origin: [0, 0, 0] as [number, number, number], spacing: 1 };
  const toWorld = (mesh: Mesh): Mesh => {
    const P = mesh.positions;
    const Nn = mesh.normals;
    for (let v = 0; v < P.length / 3; v++) {
      let l = 0;
      for (let k = 0; k < 3; k++) {
        P[3 * v + k] = src.origin[k] + src.spacing[k] * P[3 * v + k];
        Nn[3 * v + k] /= src.spacing[k];
        l += Nn[3 * v + k] * Nn[3 * v + k];
      }
      l = sqrt(l) || 1;
      for (let k = 0; k < 3; k++) Nn[3 * v + k] /= l;
    }
    return mesh;
  };
  const opts = { closeAtBoundary: false } as const;
  const surfaces: PhaseSurface[] = density
    ? [{ phase: '+', mesh: toWorld(extractIsosurface(data, dims, unit, isovalue * isovalue, { ...opts, inside: 'above' })) }]
    : [
        { phase: '+', mesh: toWorld(extractIsosurface(data, dims, unit, isovalue, { ...opts, inside: 'above' })) },
        { phase: '-', mesh: toWorld(extractIsosurface(data, dims, unit, -isovalue, { ...opts, inside: 'below' })) },
      ];
  timings.extracting = performance.now() - t0;
  await hooks.onStage?.('refining');
  await hooks.onStage?.('statistics');
  t0 = performance.now();
  const list = surfaces.map((s) => ({ phase: s.phase, mesh: s.mesh, stats: hooks.stats === false ? null : meshStats(s.mesh) }));
  const meets = list.some((s) => (s.stats?.boundaryEdges ?? 0) > 0);
  const warnings: SurfaceWarning[] = [
    {
      code: 'measured-in-cube',
      message: `an uploaded cube has no analytic state: the enclosed fraction (${pct(fraction)}) is measured on its samples, inside the cube only, not over all space`,
    },
  ];
  if (meets) warnings.unshift({ code: 'box-cuts-surface', message: 'the surface reaches the faces of the uploaded cube and is open there: the cube does not hold the whole surface' });
  timings.statistics = performance.now() - t0;
  const ext = Math.max(...[0, 1, 2].map((k) => (src.sizes[k] - 1) * src.spacing[k])) / 2;
  return {
    model: MODEL_NOTE,
    conventions: CONVENTIONS_NOTE,
    units: RESULT_UNITS,
    rule,
    isovalue,
    density: isovalue * isovalue,
    maxAbsPsi: null,
    enclosed: { fraction, error: NaN, inBox: fraction, over: 'inside the uploaded cube', method: 'sum over the cube samples' },
    grid: { mode: 'fixed', n: Math.max(nx, ny, nz), extent: ext, spacing: Math.min(...src.spacing), regions: [] },
    box: { meetsSurface: meets },
    surfaces: list,
    topology: { expected: null, found: countTopology(list), matches: null },
    features: { smallest: null, radialNodes: [], ring: false },
    warnings,
    refinement: null,
    field: null,
    sampling: { method: 'dense', points: nx * ny * nz, densePoints: nx * ny * nz, blocksActive: 0, blocksTotal: 0 },
    timings_ms: timings,
  };
}

/** Halfway between the sample value t and the next lower sample value (no sample lies on the surface). */
function levelBelow(density: Float32Array, t: number): number {
  let below = 0;
  for (let i = 0; i < density.length; i++) {
    const d = density[i];
    if (d < t && d > below) below = d;
  }
  return 0.5 * (t + below);
}

/** The automatic box for a sampled cube that has no surface rule (NRRD exports): holds >= 99.9 % (see autoExtent). */
export function cubeExtentFor(recipe: SurfaceRecipe): number {
  const ext = recipe.grid.extent ?? 'auto';
  return ext === 'auto' ? Number(autoExtent(stateOf(recipe))) : ext;
}

/** What a sampled density cube (NRRD) holds of the state, over all space, and what it cannot show. */
export interface CubeReport {
  /** Probability inside the cube [-extent, extent]³ (of the normalised state over all space) and its estimated error. */
  inBox: number;
  outside: number;
  error: number;
  /** The half-width that holds >= 99.9 % (the automatic box). */
  autoExtent: number;
  warnings: SurfaceWarning[];
}

/**
 * The truth about a density cube of n points per side over ±extent: the share of the probability it holds (all-space
 * quadrature of the level solver with level 0, so every direction's ray is cut at the cube's face), a warning when
 * more than 0.1 % lies outside (the automatic box's promise), and a warning when the grid step is coarser than half
 * the thinnest radial shell (between consecutive radial nodes, or nucleus to first node): such shells are not
 * resolved in the samples.
 */
export function densityCubeReport(recipe: Pick<SurfaceRecipe, 'content'>, n: number, extent: number): CubeReport {
  if (!Number.isInteger(n) || n < 2) throw new RangeError(`grid.n must be an integer >= 2 (got ${n})`);
  if (!(extent > 0) || !Number.isFinite(extent)) throw new RangeError(`extent must be a positive length in a0 (got ${extent})`);
  const state = stateOf(recipe as SurfaceRecipe);
  const compiled = compileState(state);
  const out = levelSolver(compiled).outsideBox(0, extent);
  const auto = Number(autoExtent(state));
  const warnings: SurfaceWarning[] = [];
  const outside = Math.min(1, Math.max(0, out.fraction));
  const inBox = 1 - outside;
  if (outside > 1e-3) {
    const need = Math.max(auto, extent * 1.01);
    warnings.push({
      code: 'box-cuts-density',
      message: `the box (±${fmt(extent)} a0) holds ${pct(inBox)} of the probability over all space; ${pct(outside)} lies outside it and is not in the file; the automatic box ±${fmt(need)} a0 holds at least 99.9%`,
      suggestedExtent: Number(need.toPrecision(4)),
    });
  }
  const h = (2 * extent) / (n - 1);
  let thinnest: { size: number; description: string } | null = null;
  for (const b of compiled.blocks) {
    const nodes = radialNodes(b.n, b.l, state.Z).map(Number);
    const edges = [0, ...nodes];
    for (let k = 0; k + 1 < edges.length; k++) {
      const size = edges[k + 1] - edges[k];
      if (!thinnest || size < thinnest.size) {
        const name = `${b.n}${'spdfghiklmnoq'[b.l] ?? `(l=${b.l})`}`;
        thinnest = { size, description: `the ${k === 0 ? 'innermost radial shell' : `radial shell ${k + 1}`} of ${name} (r ${fmt(edges[k])} to ${fmt(edges[k + 1])} a0, ${fmt(size)} a0 thick)` };
      }
    }
  }
  if (thinnest && h > thinnest.size / 2) {
    const suggestedN = ceil((2 * extent) / (thinnest.size / 2)) + 1;
    warnings.push({
      code: 'feature-unresolved',
      message: `the grid step ${fmt(h)} a0 (${n} points over ±${fmt(extent)} a0) is coarser than half of ${thinnest.description}: the samples do not resolve it; use at least ${suggestedN} points per side`,
      feature: { kind: 'radial-shell', size: thinnest.size, description: thinnest.description },
      suggestedN,
    });
  }
  return { inBox, outside, error: out.error, autoExtent: auto, warnings };
}

export { cubeGeometry };

/** The state a recipe describes (terms as given; compileState normalises). */
export function recipeState(recipe: Pick<SurfaceRecipe, 'content'>): OrbitalState {
  return stateOf(recipe as SurfaceRecipe);
}

/** Mesh statistics as reported per surface: the contracts' MeshStatsDto with the open edges counted. */
export type SurfaceStatsSummary = MeshStatsDto & { boundaryEdges: number };

/**
 * The JSON summary of a result (no meshes): what the CLI prints with --json, what mesh assets and jobs store,
 * and what the Studio and the metadata sheet read. Flat numbers keep older readers working.
 */
export function summariseSurfaces(r: SurfacesResult) {
  return {
    model: r.model,
    conventions: r.conventions,
    units: r.units,
    surfaceRule: r.rule,
    isovalue: r.isovalue,
    density: r.density,
    enclosed: r.enclosed.fraction,
    enclosedError: r.enclosed.error,
    enclosedInBox: r.enclosed.inBox,
    enclosedOver: r.enclosed.over,
    enclosedMethod: r.enclosed.method,
    grid: { mode: r.grid.mode, n: r.grid.n, extent: r.grid.extent, spacing: r.grid.spacing, regions: r.grid.regions },
    box: r.box,
    topology: r.topology,
    features: r.features,
    warnings: r.warnings,
    refinement: r.refinement,
    sampling: r.sampling,
    surfaces: r.surfaces
      .filter((s) => s.mesh.indices.length > 0)
      .map(
        (s): SurfaceStatsSummary => ({
          phase: s.phase,
          vertices: s.stats?.vertices ?? s.mesh.positions.length / 3,
          triangles: s.stats?.triangles ?? s.mesh.indices.length / 3,
          area: s.stats?.area ?? NaN,
          volume: s.stats?.volume ?? NaN,
          components: s.stats?.components ?? NaN,
          euler: s.stats?.euler ?? NaN,
          watertight: s.stats?.watertight ?? false,
          boundaryEdges: s.stats?.boundaryEdges ?? NaN,
        }),
      ),
  };
}

export type SurfacesSummary = ReturnType<typeof summariseSurfaces>;
