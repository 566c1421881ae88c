/// <reference lib="webworker" />
// Live preview: @psiform/meshing's recipeToSurfaces (the function the worker's mesh jobs and the CLI call), with
// the preview's grid ceiling and a sampler that keeps the last sampled grid, so moving the fraction slider only
// re-samples when the plan asks for another grid. Colours: @psiform/colour's phase rule. Results go back as
// transferable typed arrays (no copies).
import { phaseColoursInto, resolvePhaseMode } from '@psiform/colour';
import { PSIFORM_PALETTE } from '@psiform/contracts';
import { NoSurfaceError, recipeToSurfaces, type SampledField } from '@psiform/meshing';
import type { CompiledState, OrbitalState } from '@psiform/orbitals';
import type { SurfaceArrays } from '../scene/geometry';
import type { PreviewRequest, PreviewResponse } from './preview-protocol';

/** Largest points per side the preview samples (about 1.4 M points; keeps the slider responsive). */
export const PREVIEW_GRID_CAP = 112;

interface Kept {
  key: string;
  re: Float32Array;
  im: Float32Array | null;
}

let current: { seq: number; state: OrbitalState; n: number | 'auto'; extent: 'auto' | number } | null = null;
let kept: Kept | null = null;

function post(msg: PreviewResponse, transfer: Transferable[] = []) {
  (self as unknown as DedicatedWorkerGlobalScope).postMessage(msg, transfer);
}

/** The sampler: reuses the kept grid for the same state and cube; the pipeline writes into what it gets, so copies. */
function sampler(state: OrbitalState, grid: { n: number; extent: number }, compiled: CompiledState): SampledField {
  const key = `${JSON.stringify(state)}|${grid.n}|${grid.extent}`;
  if (!kept || kept.key !== key) {
    const N = grid.n ** 3;
    const re = new Float32Array(N);
    const im = compiled.isReal ? null : new Float32Array(N);
    compiled.sampleGrid({ n: grid.n, extent: grid.extent as never }, re, im);
    kept = { key, re, im };
  }
  return { re: kept.re.slice(), im: kept.im ? kept.im.slice() : null };
}

export async function handle(req: PreviewRequest): Promise<void> {
  if (req.type === 'sample') {
    current = { seq: req.seq, state: req.state, n: req.n, extent: req.extent };
    post({ type: 'sampled', seq: req.seq, n: req.n, extent: req.extent, ms: 0 });
    return;
  }
  if (!current || current.seq !== req.sampleSeq) {
    post({ type: 'error', seq: req.seq, message: 'the preview grid was replaced before the surface was asked for' });
    return;
  }
  const t0 = performance.now();
  const { nodal, ...surface } = req.rule;
  const result = await recipeToSurfaces(
    { content: current.state, grid: { n: current.n, extent: current.extent }, surface },
    // Nodal surfaces only while the Stage's outline switch is on: they cost 15-70 ms an update at 112³.
    { sample: sampler, maxN: PREVIEW_GRID_CAP, nodal: nodal === true, stats: false },
  );
  const palette = req.palette ?? { positive: PSIFORM_PALETTE.positive, negative: PSIFORM_PALETTE.negative, wheel: null };
  const isReal = result.surfaces.every((s) => s.phase !== 'complex');
  const mode = resolvePhaseMode(req.mode, isReal);
  const surfaces: SurfaceArrays[] = [];
  const transfer: Transferable[] = [];
  let triangles = 0;
  for (const s of result.surfaces) {
    // three.js wants linear-light vertex colours; the same rule the GLB files bake in.
    const colors = phaseColoursInto(palette, mode, s.phase, s.mesh.phaseAngle, new Float32Array(s.mesh.positions.length), { linear: true });
    transfer.push(colors.buffer);
    surfaces.push({ phase: s.phase, positions: s.mesh.positions, normals: s.mesh.normals, indices: s.mesh.indices, colors });
    transfer.push(s.mesh.positions.buffer, s.mesh.normals.buffer, s.mesh.indices.buffer);
    triangles += s.mesh.indices.length / 3;
  }
  if (result.nodal) {
    const m = result.nodal;
    surfaces.push({ phase: 'nodal', positions: m.positions, normals: m.normals, indices: m.indices });
    transfer.push(m.positions.buffer, m.normals.buffer, m.indices.buffer);
  }
  const t = result.timings_ms;
  post(
    {
      type: 'surface',
      seq: req.seq,
      sampleSeq: req.sampleSeq,
      surfaces,
      isovalue: result.isovalue,
      enclosed: result.enclosed.fraction,
      enclosedError: result.enclosed.error,
      enclosedInBox: result.enclosed.inBox,
      warnings: result.warnings,
      grid: { n: result.grid.n, extent: result.grid.extent },
      maxAbs: result.maxAbsPsi,
      triangles,
      ms: { extract: t.threshold + t.extracting, total: performance.now() - t0 },
    },
    [...new Set(transfer)],
  );
}

self.onmessage = (ev: MessageEvent<PreviewRequest>) => {
  handle(ev.data).catch((err) => {
    // A level above the state's largest |ψ| carries that limit (over all space, not one grid's samples), so the
    // message can name it whatever grid the preview last used.
    const maxAbs = err instanceof NoSurfaceError ? err.maxAbsPsi : null;
    post({ type: 'error', seq: ev.data?.seq ?? -1, message: err instanceof Error ? err.message : String(err), maxAbs });
  });
};
