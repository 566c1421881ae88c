// Files the CLI writes. The computation is @psiform/meshing's recipeToSurfaces (the one recipe → surfaces
// function the worker and the Studio preview call too); this module only runs it with the Node samplers and
// encodes what it returns.
import { canonicalJson, type Recipe } from '@psiform/contracts';
import {
  CONVENTIONS_NOTE,
  cubeExtentFor,
  densityCubeReport,
  type CubeReport,
  encodeGlb,
  encodeNrrd,
  encodeObj,
  encodePly,
  encodeStl,
  recipeToSurfaces,
  summariseSurfaces,
  type SurfacesResult,
  type SurfacesSummary,
} from '@psiform/meshing';
import { bohr, type CompiledState } from '@psiform/orbitals';
import { sampleGridParallel } from '@psiform/orbitals/node';
import { UsageError, oneLine } from './errors';

// eslint-disable-next-line @typescript-eslint/no-require-imports
const CLI_VERSION: string = require('../package.json').version;

const r1 = (x: number) => Math.round(x * 10) / 10;

export interface MeshReport {
  result: SurfacesResult;
  summary: SurfacesSummary;
  timings_ms: Record<string, number>;
}

export async function meshForRecipe(recipe: Recipe, opts: { threads: number; maxN?: number; tolerance?: number | 'file' }): Promise<MeshReport> {
  let result: SurfacesResult;
  try {
    // Coarse-to-fine sampling (the pipeline's own: only blocks the surface can cross, so no dense grid in memory)
    // and the 3D-file tolerance (libs/meshing tolerance.ts).
    result = await recipeToSurfaces(recipe, { maxN: opts.maxN, tolerance: opts.tolerance ?? 'file' });
  } catch (err) {
    if (err instanceof RangeError) throw new UsageError(oneLine(err.message));
    throw err;
  }
  if (result.surfaces.every((s) => s.mesh.indices.length === 0)) {
    throw new UsageError(
      recipe.surface.rule === 'psi'
        ? `no surface: --iso ${recipe.surface.value} leaves nothing the grid can draw (raise --grid or lower --iso)`
        : 'no surface: the enclosed region is smaller than one grid cell (raise --grid or --enclose)',
    );
  }
  const t = result.timings_ms;
  const timings_ms: Record<string, number> = {
    plan: r1(t.plan),
    sample: r1(t.sampling),
    threshold: r1(t.threshold),
    extract: r1(t.extracting),
    refine: r1(t.refining),
    stats: r1(t.statistics),
  };
  return { result, summary: summariseSurfaces(result), timings_ms };
}

function describe(recipe: Recipe, report: MeshReport): string {
  const s = recipe.surface;
  const rule = s.rule === 'enclosed' ? `surface encloses ${s.fraction} of the probability over all space` : `surface |psi| = ${s.value}`;
  return `${recipe.label ?? 'state'}; Z=${recipe.content.Z}; ${rule}; isovalue ${report.result.isovalue}; grid ${report.result.grid.n}^3 over +/-${report.result.grid.extent} a0`;
}

export async function encodeMeshFile(ext: string, report: MeshReport, recipe: Recipe): Promise<Uint8Array> {
  const colouring = { palette: recipe.palette, mode: recipe.phase?.mode };
  const surfaces = report.result.surfaces.filter((s) => s.mesh.indices.length > 0).map((s) => ({ phase: s.phase, mesh: s.mesh }));
  const warn = report.summary.warnings.length ? `; WARNINGS: ${report.summary.warnings.map((w) => w.message).join(' | ')}` : '';
  const note = `One-electron hydrogen-like model; many-electron orbitals differ; lengths in a0; ${describe(recipe, report)}; ${report.summary.conventions}${warn}`;
  switch (ext) {
    case '.glb':
      return encodeGlb(surfaces, {
        version: CLI_VERSION,
        colouring,
        extras: { label: recipe.label ?? null, content: recipe.content, ...report.summary, recipe: JSON.parse(canonicalJson(recipe)) },
      });
    case '.stl':
      return encodeStl(surfaces, `Psiform STL, hydrogen-like model, a0, ${recipe.label ?? ''}${report.summary.warnings.length ? ', SEE WARNINGS' : ''}`.slice(0, 80));
    case '.ply':
      return encodePly(surfaces, { colouring, comment: note });
    case '.obj':
      return new TextEncoder().encode(encodeObj(surfaces, note));
    default:
      throw new UsageError(`cannot write '${ext}' files`);
  }
}

export interface DensityCube {
  n: number;
  extent: number;
  spacing: number;
  /** |psi|^2 in a0^-3, x fastest (of the normalised state). */
  data: Float32Array;
  max: number;
  /** What the cube holds of the state over all space, and what it cannot show (@psiform/meshing densityCubeReport). */
  report: CubeReport;
}

/** |psi|² on the recipe's grid (extent 'auto': a box holding >= 99.9 % of the probability). */
export async function densityForRecipe(recipe: Recipe, compiled: CompiledState, opts: { threads: number; n: number }): Promise<DensityCube> {
  const extent = cubeExtentFor(recipe);
  const n = opts.n;
  const field = await sampleGridParallel({ Z: recipe.content.Z, terms: recipe.content.terms.map((t) => ({ ...t })) }, { n, extent: bohr(extent) }, { threads: opts.threads });
  void compiled;
  const re = field.re;
  const im = field.im;
  let max = 0;
  // |psi|^2 in place: no second n³ buffer.
  for (let i = 0; i < re.length; i++) {
    const d = im ? re[i] * re[i] + im[i] * im[i] : re[i] * re[i];
    re[i] = d;
    if (d > max) max = d;
  }
  return { n, extent, spacing: (2 * extent) / (n - 1), data: re, max, report: densityCubeReport(recipe, n, extent) };
}

export function encodeDensityNrrd(cube: DensityCube, recipe: Recipe): Uint8Array {
  return encodeNrrd(cube.data, {
    sizes: [cube.n, cube.n, cube.n],
    spacing: cube.spacing,
    origin: [-cube.extent, -cube.extent, -cube.extent],
    comments: ['Psiform density cube: |psi|^2 in a0^-3 of a one-electron hydrogen-like model (coefficients normalised); many-electron orbitals differ'],
    keyValues: {
      'psiform.quantity': '|psi|^2 (a0^-3)',
      'psiform.model': 'one-electron hydrogen-like',
      'psiform.label': recipe.label ?? '',
      'psiform.content': JSON.stringify(recipe.content),
      'psiform.grid': `${cube.n}^3 points, -${cube.extent}..+${cube.extent} a0 inclusive`,
      'psiform.version': CLI_VERSION,
      'psiform.conventions': CONVENTIONS_NOTE,
      'psiform.in_box_probability': `${cube.report.inBox} (+/- ${cube.report.error.toExponential(1)}) of the state over all space`,
      'psiform.warnings': cube.report.warnings.map((w) => oneLine(w.message)).join(' | ') || 'none',
    },
  });
}
