// Sample -> surface rule -> meshes -> encoded file, for the mesh and sample commands.
import { canonicalJson, type Recipe } from '@psiform/contracts';
import { buildOrbitalMesh, encodeGlb, encodeNrrd, encodeObj, encodePly, encodeStl, type OrbitalMeshResult, type Rgb } from '@psiform/meshing';
import { autoExtent, bohr, type CompiledState } from '@psiform/orbitals';
import { sampleGridParallel } from '@psiform/orbitals/node';
import { UsageError, oneLine } from './errors';
import type { MeshJsonSurface } from './format';

// eslint-disable-next-line @typescript-eslint/no-require-imports
const CLI_VERSION: string = require('../package.json').version;

const r1 = (x: number) => Math.round(x * 10) / 10;

export interface MeshReport {
  result: OrbitalMeshResult;
  /** Surfaces with at least one triangle (a 1s state has no '-' surface). */
  surfaces: OrbitalMeshResult['surfaces'];
  timings_ms: Record<string, number>;
  summary(): { isovalue: number; enclosed: number; grid: { n: number; extent: number }; surfaces: MeshJsonSurface[]; timings_ms: Record<string, number> };
}

function gridOf(recipe: Recipe, compiled: CompiledState): { n: number; extent: number } {
  const extent = recipe.grid.extent === 'auto' ? Number(autoExtent(compiled.state)) : recipe.grid.extent;
  return { n: recipe.grid.n, extent };
}

function wrapRange<T>(fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof RangeError) throw new UsageError(oneLine(err.message));
    throw err;
  }
}

export async function meshForRecipe(recipe: Recipe, compiled: CompiledState, opts: { threads: number }): Promise<MeshReport> {
  const grid = gridOf(recipe, compiled);
  const t0 = performance.now();
  // Sampling runs on worker threads; buildOrbitalMesh's sampler hook is synchronous, so hand it the result.
  const field = await sampleGridParallel(compiled.state, { n: grid.n, extent: bohr(grid.extent) }, { threads: opts.threads });
  const tSample = performance.now() - t0;
  const result = wrapRange(() => buildOrbitalMesh({ state: compiled.state, grid, surface: recipe.surface }, { sample: () => field }));
  const surfaces = result.surfaces.filter((s) => s.mesh.indices.length > 0);
  if (surfaces.length === 0) {
    throw new UsageError(
      recipe.surface.rule === 'psi'
        ? `no surface: --iso ${recipe.surface.value} is above the largest |psi| sampled on the grid`
        : 'no surface: the enclosed region is smaller than one grid cell (raise --grid or --enclose)',
    );
  }
  const timings_ms: Record<string, number> = {
    sample: r1(tSample),
    threshold: r1(result.timings_ms.threshold),
    extract: r1(result.timings_ms.extract),
    stats: r1(result.timings_ms.stats),
  };
  return {
    result,
    surfaces,
    timings_ms,
    summary() {
      return {
        isovalue: result.isovalue,
        enclosed: result.enclosed,
        grid: { n: result.grid.n, extent: result.grid.extent },
        surfaces: surfaces.map((s) => {
          const st = s.stats!;
          return { phase: s.phase, vertices: st.vertices, triangles: st.triangles, area: st.area, volume: st.volume, components: st.components, euler: st.euler, watertight: st.watertight };
        }),
        timings_ms,
      };
    },
  };
}

function hexToRgb(hex: string): Rgb {
  const v = parseInt(hex.slice(1), 16);
  return [((v >> 16) & 255) / 255, ((v >> 8) & 255) / 255, (v & 255) / 255];
}

/** arg psi -> sRGB on a hue circle (HSV, S 0.7, V 0.9; arg 0 at hue 0). Our own default colour wheel. */
export function phaseWheel(angle: number): Rgb {
  const h = (((angle / (2 * Math.PI)) % 1) + 1) % 1;
  const s = 0.7;
  const v = 0.9;
  const k = (n: number) => (n + h * 6) % 6;
  const f = (n: number) => v - v * s * Math.max(0, Math.min(k(n), 4 - k(n), 1));
  return [f(5), f(3), f(1)];
}

function describe(recipe: Recipe, report: MeshReport): string {
  const s = recipe.surface;
  const rule = s.rule === 'enclosed' ? `surface encloses ${s.fraction} of the probability` : `surface |psi| = ${s.value}`;
  return `${recipe.label ?? 'state'}; Z=${recipe.content.Z}; ${rule}; isovalue ${report.result.isovalue}; grid ${report.result.grid.n}^3 over +/-${report.result.grid.extent} a0`;
}

export async function encodeMeshFile(ext: string, report: MeshReport, recipe: Recipe): Promise<Uint8Array> {
  const colors = { '+': hexToRgb(recipe.palette.positive), '-': hexToRgb(recipe.palette.negative) };
  const surfaces = report.surfaces.map((s) => ({ phase: s.phase, mesh: s.mesh }));
  const note = `One-electron hydrogen-like model; many-electron orbitals differ; lengths in a0; ${describe(recipe, report)}`;
  switch (ext) {
    case '.glb':
      return encodeGlb(surfaces, {
        version: CLI_VERSION,
        colors,
        colorWheel: phaseWheel,
        extras: {
          label: recipe.label ?? null,
          content: recipe.content,
          surface: recipe.surface,
          isovalue: report.result.isovalue,
          enclosed: report.result.enclosed,
          grid: report.result.grid,
          units: 'a0',
          recipe: JSON.parse(canonicalJson(recipe)),
        },
      });
    case '.stl':
      return encodeStl(surfaces, `Psiform STL, hydrogen-like model, a0, ${recipe.label ?? ''}`.slice(0, 80));
    case '.ply':
      return encodePly(surfaces, { colors, colorWheel: phaseWheel, comment: note });
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
  /** |psi|^2 in a0^-3, x fastest. */
  data: Float32Array;
  max: number;
}

export async function densityForRecipe(recipe: Recipe, compiled: CompiledState, opts: { threads: number }): Promise<DensityCube> {
  const grid = gridOf(recipe, compiled);
  const field = await sampleGridParallel(compiled.state, { n: grid.n, extent: bohr(grid.extent) }, { threads: opts.threads });
  const re = field.re;
  const im = field.im;
  let max = 0;
  // |psi|^2 in place: no second n³ buffer.
  for (let i = 0; i < re.length; i++) {
    const d = im ? re[i] * re[i] + im[i] * im[i] : re[i] * re[i];
    re[i] = d;
    if (d > max) max = d;
  }
  return { n: grid.n, extent: grid.extent, spacing: (2 * grid.extent) / (grid.n - 1), data: re, max };
}

export function encodeDensityNrrd(cube: DensityCube, recipe: Recipe): Uint8Array {
  return encodeNrrd(cube.data, {
    sizes: [cube.n, cube.n, cube.n],
    spacing: cube.spacing,
    origin: [-cube.extent, -cube.extent, -cube.extent],
    comments: ['Psiform density cube: |psi|^2 in a0^-3 of a one-electron hydrogen-like model; many-electron orbitals differ'],
    keyValues: {
      'psiform.quantity': '|psi|^2 (a0^-3)',
      'psiform.model': 'one-electron hydrogen-like',
      'psiform.label': recipe.label ?? '',
      'psiform.content': JSON.stringify(recipe.content),
      'psiform.grid': `${cube.n}^3 points, -${cube.extent}..+${cube.extent} a0 inclusive`,
      'psiform.version': CLI_VERSION,
    },
  });
}
