import { ENGINE_CONVENTION_LINES } from '@psiform/contracts';
import { CONVENTIONS_NOTE, MODEL_NOTE as ENGINE_MODEL_NOTE, RESULT_UNITS, TOLERANCE_3D_RELATIVE, FILE_TRIANGLE_BUDGET } from '@psiform/meshing';

/** The model every output states: the engine's own text (@psiform/meshing MODEL_NOTE). */
export const MODEL_NOTE = ENGINE_MODEL_NOTE;

/** Sign conventions and the normalisation rule (the engine's own text, also in every JSON output and file). */
export const CONVENTIONS = CONVENTIONS_NOTE;

/** Units of every number in the JSON outputs. */
export const UNITS = RESULT_UNITS;

/** Words of `text` in lines of at most `width` characters, each indented by `indent`. */
function wrap(text: string, indent: string, width = 100): string[] {
  const lines: string[] = [];
  let cur = '';
  for (const w of text.split(/\s+/)) {
    if (cur && indent.length + cur.length + 1 + w.length > width) {
      lines.push(indent + cur);
      cur = w;
    } else cur = cur ? `${cur} ${w}` : w;
  }
  if (cur) lines.push(indent + cur);
  return lines;
}

// Generated from the engine's texts (one source: @psiform/contracts ENGINE_CONVENTION_LINES, @psiform/meshing
// RESULT_UNITS), so the help cannot drift from what the outputs and files state.
const CONVENTIONS_HELP = [
  'Conventions:',
  ...ENGINE_CONVENTION_LINES.flatMap((line) => wrap(line, '  ')),
  ...wrap(`Units: ${Object.entries(RESULT_UNITS).map(([k, v]) => `${k} ${v}`).join('; ')}; every JSON output carries a "units" field.`, '  '),
].join('\n');

export const MAIN_HELP = `psiform - hydrogen-like orbital figures from a terminal
(${MODEL_NOTE})

Usage: psiform <command> [options]

Commands:
  mesh     sample a state on a grid, extract its isosurfaces per phase, report the
           mesh statistics and optionally write .glb, .stl, .ply or .obj
  radial   radial nodes, most probable / mean / turning-point radii, tail probability
  sample   write the probability density |psi|^2 on a grid as an .nrrd volume
  recipe   print a complete figure recipe (JSON) that the Psiform API accepts

Run 'psiform <command> --help' for the options of a command.
Bad arguments print one line on stderr and exit with code 2; nothing is written.
What a figure cannot show truthfully (a box that cuts the surface, a grid too coarse for a
detail) is printed as 'psiform: warning: ...' on stderr and listed under "warnings" in --json.

${CONVENTIONS_HELP}
`;

const STATE_HELP = `State (exactly one):
  --orbital LABEL   real orbital by label: 1s, 2pz, 3dxy, 3dz2, 3dx2-y2, 4fxyz, sp3 ...
  --nlm n,l,m       one eigenstate, real combination by default (m>0 cos-type, m<0 sin-type)
    --complex       use the complex Y_lm (Condon-Shortley phase) instead
  --recipe FILE     a recipe JSON file (other options given here override it)
  --Z z             nuclear charge, integer 1..118 (default 1)`;

const GRID_HELP = `Grid:
  --grid N|auto     points per side, 16..384, or auto (default): the engine picks the grid that
                    resolves the surface's smallest detail (shell thickness, lobe width, the hole
                    of a ring, the gap at the nucleus), with finer cubes for inner radial lobes
  --extent L        half-width of the cube in a0 (default: automatic; mesh: holds the whole
                    surface with a margin; sample: holds >= 99.9% of the probability)
  --threads T       worker threads for sampling (default: number of cores)`;

const SURFACE_HELP = `Surface (one of):
  --enclose F       surface enclosing the fraction F of the probability over ALL space (not just
                    inside the box), 0 < F < 1 (default 0.9)
  --iso V           surfaces psi = +V and psi = -V (|psi| = V for complex states), V in a0^-3/2`;

export const COMMAND_HELP: Record<string, string> = {
  mesh: `Usage: psiform mesh (--orbital LABEL | --nlm n,l,m [--complex] | --recipe FILE) [options]

Solves the surface level over all space, samples psi on the grid(s), extracts one
isosurface per phase by marching cubes and prints the isovalue, the probability the
surface encloses over all space (with its estimated error) and the part inside the box,
the grid(s), the expected and found topology, warnings, and per surface: vertices,
triangles, area (a0^2), volume (a0^3), connected components, Euler characteristic,
watertightness (false where the box cuts the surface open).

${STATE_HELP}

${GRID_HELP}

${SURFACE_HELP}

Output:
  --out FILE        write the mesh: .glb (glTF 2.0 binary), .stl (binary), .ply, .obj
  --tolerance T     how far (a0) the mesh may lie from the true surface: 'file' (default: ${TOLERANCE_3D_RELATIVE} of the
                    surface's half-width, finer than the largest raster export, 64 MP, needs, or coarser where that
                    would pass ${FILE_TRIANGLE_BUDGET} triangles; the summary states the tolerance met), 'none'
                    (vertices on the surface, chords unchecked) or a length in a0
  --json            print JSON instead of a readable summary

${CONVENTIONS_HELP}
`,
  radial: `Usage: psiform radial --n N --l L [--Z z] [--outside R] [--json]

Facts about the radial function R_nl of a hydrogen-like atom (lengths in a0):
radial nodes, most probable radius (maximum of r^2 R^2), mean radius <r>,
classical turning point, and the probability of finding the electron beyond R.

  --n N             principal quantum number, 1..12
  --l L             orbital angular momentum, 0..n-1
  --Z z             nuclear charge, integer 1..118 (default 1)
  --outside R       radius R in a0 for prob_outside (null when not given)
  --json            print JSON instead of a readable summary

R_nl > 0 near the nucleus (the sign convention of every Psiform figure).
`,
  sample: `Usage: psiform sample (--orbital LABEL | --nlm n,l,m [--complex] | --recipe FILE) --out FILE.nrrd [options]

Writes the probability density |psi|^2 (a0^-3) of the normalised state on the grid as
a float32 NRRD volume with its spacing and origin in a0 (--grid auto: 96 points per side).

${STATE_HELP}

${GRID_HELP}

Output:
  --out FILE.nrrd   the volume to write (required)
  --json            print a JSON summary instead of a readable one
`,
  recipe: `Usage: psiform recipe (--orbital LABEL | --nlm n,l,m [--complex] | --recipe FILE) [options]

Prints a complete, validated figure recipe (all defaults filled in) as JSON. The Psiform
API accepts exactly this document. With --recipe FILE it checks and normalises a file.

${STATE_HELP}

Grid:
  --grid N|auto     points per side, 16..384, or auto (default)
  --extent L        half-width of the cube in a0 (default: automatic)

${SURFACE_HELP}

${CONVENTIONS_HELP}
`,
};
