export const MODEL_NOTE =
  'one-electron hydrogen-like model (psi_nlm = R_nl(r) Y_lm); many-electron orbitals differ';

export const MAIN_HELP = `psiform - hydrogen-like orbital figures from a terminal
(${MODEL_NOTE}; all lengths in Bohr radii a0)

Usage: psiform <command> [options]

Commands:
  mesh     sample a state on a grid, extract its isosurfaces per phase, report the
           mesh statistics and optionally write .glb, .stl, .ply or .obj
  radial   radial nodes, most probable / mean / turning-point radii, tail probability
  sample   write the probability density |psi|^2 on a grid as an .nrrd volume
  recipe   print a complete figure recipe (JSON) that the Psiform API accepts

Run 'psiform <command> --help' for the options of a command.
Bad arguments print one line on stderr and exit with code 2; nothing is written.
`;

const STATE_HELP = `State (exactly one):
  --orbital LABEL   real orbital by label: 1s, 2pz, 3dxy, 3dz2, 3dx2-y2, 4fxyz, sp3 ...
  --nlm n,l,m       one eigenstate, real combination by default (m>0 cos-type, m<0 sin-type)
    --complex       use the complex Y_lm (Condon-Shortley phase) instead
  --recipe FILE     a recipe JSON file (other options given here override it)
  --Z z             nuclear charge, integer 1..118 (default 1)`;

const GRID_HELP = `Grid:
  --grid N          voxels per side, 16..384 (default 96)
  --extent L        half-width of the cube in a0 (default: automatic, holds >= 99.9%)
  --threads T       worker threads for sampling (default: number of cores)`;

const SURFACE_HELP = `Surface (one of):
  --enclose F       surface enclosing the fraction F of the probability, 0 < F < 1 (default 0.9)
  --iso V           surfaces psi = +V and psi = -V (|psi| = V for complex states), V in a0^-3/2`;

export const COMMAND_HELP: Record<string, string> = {
  mesh: `Usage: psiform mesh (--orbital LABEL | --nlm n,l,m [--complex] | --recipe FILE) [options]

Samples psi on a cube, extracts one isosurface per phase by marching cubes and prints
isovalue, enclosed probability, and per surface: vertices, triangles, area (a0^2),
volume (a0^3), connected components, Euler characteristic, watertightness.

${STATE_HELP}

${GRID_HELP}

${SURFACE_HELP}

Output:
  --out FILE        write the mesh: .glb (glTF 2.0 binary), .stl (binary), .ply, .obj
  --json            print JSON instead of a readable summary
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
`,
  sample: `Usage: psiform sample (--orbital LABEL | --nlm n,l,m [--complex] | --recipe FILE) --out FILE.nrrd [options]

Writes the probability density |psi|^2 (a0^-3) on the grid as a float32 NRRD volume
with its spacing and origin in a0.

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
  --grid N          voxels per side, 16..384 (default 96)
  --extent L        half-width of the cube in a0 (default: automatic)

${SURFACE_HELP}
`,
};
