/// <reference lib="webworker" />
// Live preview: samples the state once per state/grid change and re-extracts surfaces on that grid as the
// surface rule moves. Results go back as transferable typed arrays (no copies).
import { buildOrbitalMesh } from '@psiform/meshing';
import { autoExtent, compileState, type CompiledState } from '@psiform/orbitals';
import { phaseWheelLinear, type SurfaceArrays } from '../scene/geometry';
import type { PreviewRequest, PreviewResponse } from './preview-protocol';

interface Sampled {
  seq: number;
  compiled: CompiledState;
  n: number;
  extent: number;
  re: Float32Array;
  im: Float32Array | null;
}

let current: Sampled | null = null;

function post(msg: PreviewResponse, transfer: Transferable[] = []) {
  (self as unknown as DedicatedWorkerGlobalScope).postMessage(msg, transfer);
}

function handle(req: PreviewRequest): void {
  if (req.type === 'sample') {
    const t0 = performance.now();
    const compiled = compileState(req.state);
    const extent = req.extent === 'auto' ? Number(autoExtent(req.state)) : req.extent;
    const N = req.n ** 3;
    const re = new Float32Array(N);
    const im = compiled.isReal ? null : new Float32Array(N);
    compiled.sampleGrid({ n: req.n, extent: extent as never }, re, im);
    current = { seq: req.seq, compiled, n: req.n, extent, re, im };
    // The |ψ| rule's upper limit: above it there is no surface.
    let max2 = 0;
    for (let i = 0; i < N; i++) {
      const a = re[i] * re[i] + (im ? im[i] * im[i] : 0);
      if (a > max2) max2 = a;
    }
    post({ type: 'sampled', seq: req.seq, n: req.n, extent, ms: performance.now() - t0, maxAbs: Math.sqrt(max2) });
    return;
  }
  if (!current || current.seq !== req.sampleSeq) {
    post({ type: 'error', seq: req.seq, message: 'the preview grid was replaced before the surface was asked for' });
    return;
  }
  const t0 = performance.now();
  const grid = current;
  // The kept grid stands in for sampling (buildOrbitalMesh squares a real field in place and restores it exactly).
  const { nodal, ...surface } = req.rule;
  const result = buildOrbitalMesh(
    { state: grid.compiled.state, grid: { n: grid.n, extent: grid.extent }, surface },
    // Nodal surfaces only while the Stage's outline switch is on: they cost 15-70 ms an update at 112³.
    { sample: () => ({ re: grid.re, im: grid.im }), stats: false, nodal: nodal === true },
  );
  const surfaces: SurfaceArrays[] = [];
  const transfer: Transferable[] = [];
  let triangles = 0;
  for (const s of result.surfaces) {
    let colors: Float32Array | null = null;
    if (s.phase === 'complex' && s.mesh.phaseAngle) {
      const a = s.mesh.phaseAngle;
      colors = new Float32Array(a.length * 3);
      for (let v = 0; v < a.length; v++) colors.set(phaseWheelLinear(a[v]), 3 * v);
      transfer.push(colors.buffer);
    }
    surfaces.push({ phase: s.phase, positions: s.mesh.positions, normals: s.mesh.normals, indices: s.mesh.indices, colors });
    transfer.push(s.mesh.positions.buffer, s.mesh.normals.buffer, s.mesh.indices.buffer);
    triangles += s.mesh.indices.length / 3;
  }
  if (result.nodal) {
    const m = result.nodal;
    surfaces.push({ phase: 'nodal', positions: m.positions, normals: m.normals, indices: m.indices });
    transfer.push(m.positions.buffer, m.normals.buffer, m.indices.buffer);
  }
  post(
    {
      type: 'surface',
      seq: req.seq,
      sampleSeq: req.sampleSeq,
      surfaces,
      isovalue: result.isovalue,
      enclosed: result.enclosed,
      triangles,
      ms: { extract: result.timings_ms.threshold + result.timings_ms.extract, total: performance.now() - t0 },
    },
    [...new Set(transfer)],
  );
}

self.onmessage = (ev: MessageEvent<PreviewRequest>) => {
  try {
    handle(ev.data);
  } catch (err) {
    post({ type: 'error', seq: ev.data?.seq ?? -1, message: err instanceof Error ? err.message : String(err) });
  }
};
