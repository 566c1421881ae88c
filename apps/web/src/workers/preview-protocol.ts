// Messages between the studio and the preview worker. The worker samples ψ once per state/grid and keeps the
// grid; surface requests (fraction slider) re-extract on the kept grid.
import type { OrbitalState } from '@psiform/orbitals';
import type { SurfaceArrays } from '../scene/geometry';

export type PreviewRequest =
  | { type: 'sample'; seq: number; state: OrbitalState; n: number; extent: 'auto' | number }
  | {
      type: 'surface';
      seq: number;
      sampleSeq: number;
      rule: ({ rule: 'enclosed'; fraction: number } | { rule: 'psi'; value: number }) & { nodal?: boolean };
    };

export type PreviewResponse =
  | { type: 'sampled'; seq: number; n: number; extent: number; ms: number; /** Largest |ψ| on the grid, a0^-3/2. */ maxAbs: number }
  | {
      type: 'surface';
      seq: number;
      sampleSeq: number;
      surfaces: SurfaceArrays[];
      isovalue: number;
      enclosed: number;
      triangles: number;
      ms: { extract: number; total: number };
    }
  | { type: 'error'; seq: number; message: string };
