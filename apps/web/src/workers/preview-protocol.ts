// Messages between the studio and the preview worker. The worker keeps the last sampled grid; surface requests
// (fraction slider) run @psiform/meshing's recipeToSurfaces, which reuses that grid when the plan asks for the same one.
import type { OrbitalState } from '@psiform/orbitals';
import type { SurfaceWarning } from '@psiform/meshing';
import type { SurfaceArrays } from '../scene/geometry';

export type PreviewRequest =
  | { type: 'sample'; seq: number; state: OrbitalState; n: number | 'auto'; extent: 'auto' | number }
  | {
      type: 'surface';
      seq: number;
      sampleSeq: number;
      rule: ({ rule: 'enclosed'; fraction: number } | { rule: 'psi'; value: number }) & { nodal?: boolean };
      /** Colours (the recipe's palette and phase mode); default: the recipe schema's palette, mode auto. */
      palette?: { positive: string; negative: string; wheel?: { lightness: number; chroma: number } | null };
      mode?: 'auto' | 'sign' | 'argument';
    };

export type PreviewResponse =
  | { type: 'sampled'; seq: number; n: number | 'auto'; extent: number | 'auto'; ms: number }
  | {
      type: 'surface';
      seq: number;
      sampleSeq: number;
      surfaces: SurfaceArrays[];
      isovalue: number;
      /** Probability inside the surface over all space, its estimated error, and the part inside the box. */
      enclosed: number;
      enclosedError?: number;
      enclosedInBox?: number;
      /** What the preview cannot show truthfully (box cuts the surface, grid too coarse); see SurfaceWarning. */
      warnings?: SurfaceWarning[];
      /** The grid the preview used (points per side and half-width of the outer cube, a0). */
      grid?: { n: number; extent: number };
      /** Largest |ψ| of the state over all space as the level solver found it (a0^-3/2), whatever the grid: no |ψ| surface exists above it. */
      maxAbs?: number | null;
      triangles: number;
      ms: { extract: number; total: number };
    }
  | { type: 'error'; seq: number; message: string; /** As on 'surface', when the error is a |ψ| level above it; null otherwise. */ maxAbs?: number | null };
