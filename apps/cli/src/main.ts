import * as os from 'node:os';
import { RECIPE_LIMITS, quantumNumberError } from '@psiform/contracts';
import { parseCommandArgs, type OptionSpec } from './args';
import { UsageError, oneLine } from './errors';
import { COMMAND_HELP, CONVENTIONS, MAIN_HELP, MODEL_NOTE, UNITS } from './help';
import { parseIntOption, parseNumberOption } from './numbers';
import { checkOutPath, writeFileAtomic } from './output';
import { STATE_OPTION_SPEC, SURFACE_OPTION_SPEC, resolveRecipe, type StateOptions } from './source';
import { ensureGridFits, largestGridWithinBudget, radialFacts, stateOfRecipe } from './engine';
import { densityForRecipe, encodeDensityNrrd, encodeMeshFile, meshForRecipe } from './files';
import { formatMeshSummary, formatRadialSummary } from './format';

const MESH_EXTS = ['.glb', '.stl', '.ply', '.obj'] as const;
/** Points per side of a density cube when the recipe says 'auto' (no surface to resolve). */
const DEFAULT_SAMPLE_GRID = 96;

function threadsOption(raw: string | undefined): number {
  const cores = typeof os.availableParallelism === 'function' ? os.availableParallelism() : os.cpus().length;
  if (raw === undefined) return Math.max(1, cores);
  return parseIntOption('--threads', raw, { min: 1, max: 64 });
}

function print(text: string): void {
  process.stdout.write(text.endsWith('\n') ? text : text + '\n');
}

/** --tolerance: 'file' (the 3D-file default), 'none' (vertices projected, nothing split) or a length in a0. */
function toleranceOption(raw: string | undefined): number | 'file' {
  if (raw === undefined || raw === 'file') return 'file';
  if (raw === 'none') return Infinity;
  const x = parseNumberOption('--tolerance', raw);
  if (!(x > 0)) throw new UsageError(`--tolerance must be 'file', 'none' or a positive length in a0 (got ${raw})`);
  return x;
}

function spec(...parts: OptionSpec[]): OptionSpec {
  return Object.assign({ help: { type: 'boolean', short: 'h' } }, ...parts);
}

async function cmdMesh(argv: string[]): Promise<void> {
  const v = parseCommandArgs('mesh', argv, spec(STATE_OPTION_SPEC, SURFACE_OPTION_SPEC, { out: { type: 'string' }, json: { type: 'boolean' }, threads: { type: 'string' }, tolerance: { type: 'string' } }));
  if (v.help) return print(COMMAND_HELP.mesh);
  const tolerance = toleranceOption(v.tolerance as string | undefined);
  const threads = threadsOption(v.threads as string | undefined);
  const recipe = resolveRecipe(v as StateOptions, { withSurface: true });
  const ext = v.out !== undefined ? checkOutPath(v.out as string, MESH_EXTS) : undefined;
  const state = stateOfRecipe(recipe);
  if (recipe.grid.n !== 'auto') ensureGridFits(recipe.grid.n, !state.isReal);

  const report = await meshForRecipe(recipe, { threads, maxN: largestGridWithinBudget(!state.isReal), tolerance });
  let written: { file: string; bytes: number } | undefined;
  if (ext !== undefined) {
    const t0 = performance.now();
    const bytes = await encodeMeshFile(ext, report, recipe);
    report.timings_ms.encode = round(performance.now() - t0, 1);
    written = { file: v.out as string, bytes: writeFileAtomic(v.out as string, bytes) };
  }
  // What the figure cannot show truthfully goes to stderr as well as into the output (exit code stays 0).
  for (const w of report.summary.warnings) process.stderr.write(`psiform: warning: ${oneLine(w.message)}\n`);
  const json = { label: recipe.label ?? null, Z: recipe.content.Z, ...report.summary, timings_ms: report.timings_ms, out: written ?? null };
  print(v.json ? JSON.stringify(json, null, 2) : formatMeshSummary(json));
}

async function cmdSample(argv: string[]): Promise<void> {
  const v = parseCommandArgs('sample', argv, spec(STATE_OPTION_SPEC, { out: { type: 'string' }, json: { type: 'boolean' }, threads: { type: 'string' } }));
  if (v.help) return print(COMMAND_HELP.sample);
  const threads = threadsOption(v.threads as string | undefined);
  const recipe = resolveRecipe(v as StateOptions, { withSurface: false });
  if (v.out === undefined) throw new UsageError('sample needs --out FILE.nrrd');
  checkOutPath(v.out as string, ['.nrrd']);
  const state = stateOfRecipe(recipe);
  // A density cube has no surface to resolve: 'auto' means the default grid.
  const n = recipe.grid.n === 'auto' ? DEFAULT_SAMPLE_GRID : recipe.grid.n;
  ensureGridFits(n, !state.isReal);

  const t0 = performance.now();
  const cube = await densityForRecipe(recipe, state, { threads, n });
  const t1 = performance.now();
  const bytes = encodeDensityNrrd(cube, recipe);
  const written = writeFileAtomic(v.out as string, bytes);
  const t2 = performance.now();
  // What the cube cannot show truthfully (probability outside the box, shells finer than the grid), as mesh does.
  const report = cube.report;
  for (const w of report.warnings) process.stderr.write(`psiform: warning: ${oneLine(w.message)}\n`);
  const json = {
    label: recipe.label ?? null,
    Z: recipe.content.Z,
    model: MODEL_NOTE,
    conventions: CONVENTIONS,
    units: { ...UNITS, data: 'a0^-3 (|psi|^2 of the normalised state)', max_density: 'a0^-3', in_box: 'probability, 0..1', outside_box: 'probability, 0..1' },
    quantity: '|psi|^2 in a0^-3',
    grid: { n: cube.n, extent: cube.extent, spacing: cube.spacing },
    max_density: cube.max,
    // Probability of the normalised state inside the box, over all space (not a sum of the samples).
    in_box: report.inBox,
    in_box_error: report.error,
    outside_box: report.outside,
    warnings: report.warnings,
    out: { file: v.out as string, bytes: written },
    timings_ms: { sample: round(t1 - t0, 1), encode_write: round(t2 - t1, 1) },
  };
  print(
    v.json
      ? JSON.stringify(json, null, 2)
      : `${json.label ?? 'state'} (Z=${json.Z}): |psi|^2 on ${cube.n}^3 voxels over +/-${fmt(cube.extent)} a0 -> ${json.out.file} (${json.out.bytes} bytes)\n` +
          `in the box: ${(100 * report.inBox).toFixed(report.inBox > 0.9999 ? 4 : 2)}% of the probability over all space\nmodel: ${MODEL_NOTE}`,
  );
}

function cmdRadial(argv: string[]): void {
  const v = parseCommandArgs('radial', argv, spec({ n: { type: 'string' }, l: { type: 'string' }, Z: { type: 'string' }, outside: { type: 'string' }, json: { type: 'boolean' } }));
  if (v.help) return print(COMMAND_HELP.radial);
  if (v.n === undefined) throw new UsageError('radial needs --n N');
  if (v.l === undefined) throw new UsageError('radial needs --l L');
  const n = parseIntOption('--n', v.n as string);
  const l = parseIntOption('--l', v.l as string);
  const broken = quantumNumberError(n, l); // the one quantum-number rule (libs/contracts quantum.ts)
  if (broken) throw new UsageError(broken);
  const Z = v.Z === undefined ? 1 : parseIntOption('--Z', v.Z as string, { min: 1, max: RECIPE_LIMITS.zMax });
  let outside: number | null = null;
  if (v.outside !== undefined) {
    outside = parseNumberOption('--outside', v.outside as string);
    if (outside < 0) throw new UsageError(`--outside must be a radius >= 0 in a0 (got ${v.outside})`);
  }
  const facts = radialFacts(n, l, Z, outside);
  const json = { n, l, Z, units: { ...UNITS, prob_outside: 'probability, 0..1' }, model: MODEL_NOTE, conventions: CONVENTIONS, ...facts, outside_r: outside };
  print(v.json ? JSON.stringify(json, null, 2) : formatRadialSummary(json));
}

async function cmdRecipe(argv: string[]): Promise<void> {
  const v = parseCommandArgs('recipe', argv, spec(STATE_OPTION_SPEC, SURFACE_OPTION_SPEC));
  if (v.help) return print(COMMAND_HELP.recipe);
  const recipe = resolveRecipe(v as StateOptions, { withSurface: true });
  const state = stateOfRecipe(recipe);
  if (recipe.grid.n !== 'auto') ensureGridFits(recipe.grid.n, !state.isReal);
  print(JSON.stringify(recipe, null, 2));
}

export function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

function fmt(x: number): string {
  return Number(x.toPrecision(6)).toString();
}

const COMMANDS: Record<string, (argv: string[]) => void | Promise<void>> = {
  mesh: cmdMesh,
  radial: cmdRadial,
  sample: cmdSample,
  recipe: cmdRecipe,
};

/** Entry point used by bin/psiform.js. Sets process.exitCode: 0 ok, 2 bad arguments, 1 internal failure. */
export async function run(argv: string[]): Promise<void> {
  try {
    const [cmd, ...rest] = argv;
    if (cmd === undefined || cmd === '--help' || cmd === '-h' || cmd === 'help') {
      if (cmd === 'help' && rest[0] && COMMAND_HELP[rest[0]]) return print(COMMAND_HELP[rest[0]]);
      return print(MAIN_HELP);
    }
    if (cmd === '--version' || cmd === '-v') {
      // eslint-disable-next-line @typescript-eslint/no-require-imports
      return print(`psiform ${require('../package.json').version}`);
    }
    const handler = Object.prototype.hasOwnProperty.call(COMMANDS, cmd) ? COMMANDS[cmd] : undefined;
    if (!handler) {
      throw new UsageError(cmd.startsWith('-') ? `unknown option '${cmd}' (see psiform --help)` : `unknown command '${cmd}' (commands: ${Object.keys(COMMANDS).join(', ')})`);
    }
    await handler(rest);
    process.exitCode = 0;
  } catch (err) {
    if (err instanceof UsageError) {
      process.stderr.write(`psiform: ${oneLine(err.message)}\n`);
      process.exitCode = err.exitCode;
      return;
    }
    const e = err as Error;
    process.stderr.write(`psiform: internal error: ${oneLine(e?.message ?? String(err))}\n`);
    if (process.env.PSIFORM_DEBUG) process.stderr.write(`${e?.stack ?? ''}\n`);
    process.exitCode = 1;
  }
}
