import { describe, expect, it } from 'vitest';
import { parseOrbitalLabel, stateFromNlm } from '@psiform/orbitals';
import { WebIO } from '@gltf-transform/core';
import { EXTMeshoptCompression, KHRMeshQuantization } from '@gltf-transform/extensions';
import { MeshoptDecoder } from 'meshoptimizer';
import { recipeToSurfaces } from '../src/pipeline';
import { encodeGlb } from '../src/encoders';
import { encodeScreenGlb, screenTolerance, type ScreenGlbInfo } from '../src/optimise';
import { levelFunction, levelDistance } from '../src/refine';

// Khronos glTF-Validator (npm gltf-validator): the reference reader for glTF 2.0 and its extensions.
const validator = require('gltf-validator') as { validateBytes: (b: Uint8Array) => Promise<{ issues: { numErrors: number; messages: { code: string; message: string }[] } }> };

/** World-space vertex positions of every mesh named like a phase, decoded by gltf-transform + meshoptimizer's decoder. */
async function decodedPositions(glb: Uint8Array): Promise<Map<string, number[][]>> {
  await MeshoptDecoder.ready;
  const io = new WebIO().registerExtensions([EXTMeshoptCompression, KHRMeshQuantization]).registerDependencies({ 'meshopt.decoder': MeshoptDecoder });
  const doc = await io.readBinary(glb);
  const out = new Map<string, number[][]>();
  for (const node of doc.getRoot().listNodes()) {
    const mesh = node.getMesh();
    if (!mesh) continue;
    const M = node.getWorldMatrix();
    const pts: number[][] = [];
    for (const prim of mesh.listPrimitives()) {
      const acc = prim.getAttribute('POSITION')!;
      const e: number[] = [];
      for (let i = 0; i < acc.getCount(); i++) {
        acc.getElement(i, e);
        pts.push([0, 1, 2].map((r) => M[r] * e[0] + M[4 + r] * e[1] + M[8 + r] * e[2] + M[12 + r]));
      }
    }
    out.set(mesh.getName(), pts);
  }
  return out;
}

describe('the screen GLB beside the archival one', { timeout: 240000 }, () => {
  for (const [name, content] of [
    ['3d_z² (two phases)', parseOrbitalLabel('3dz2').state],
    ['complex 2p(m = 1) ring (50 %: a torus)', stateFromNlm(2, 1, 1, { complex: true })],
  ] as const) {
    const fraction = name.includes('50 %') ? 0.5 : 0.9;
    it(`${name}: valid (Khronos validator), EXT_meshopt_compression, much smaller, decoded vertices within the screen tolerance`, async () => {
      // The archival mesh at a third of the screen tolerance (the worker uses the finer 3D-file default).
      const plan = await recipeToSurfaces({ content, grid: { n: 48, extent: 'auto' }, surface: { rule: 'enclosed', fraction } }, { tolerance: Infinity, stats: false });
      const tol = screenTolerance(plan.grid.extent);
      const r = await recipeToSurfaces({ content, grid: { n: 48, extent: 'auto' }, surface: { rule: 'enclosed', fraction } }, { tolerance: tol / 3 });
      const surfaces = r.surfaces.filter((s) => s.mesh.indices.length > 0);
      const archival = await encodeGlb(surfaces, { version: 'test' });
      const info = {} as ScreenGlbInfo;
      const screen = await encodeScreenGlb(surfaces, { version: 'test', field: r.field!, isovalue: r.isovalue, tolerance: tol }, info);
      const report = await validator.validateBytes(screen);
      expect(report.issues.numErrors, JSON.stringify(report.issues.messages.slice(0, 3))).toBe(0);
      expect(screen.length).toBeLessThan(archival.length / 4);
      expect(info.trianglesAfter).toBeLessThan(info.trianglesBefore);
      expect(info.maxDeviation).toBeLessThanOrEqual(tol);
      const len = new DataView(screen.buffer, screen.byteOffset + 12, 4).getUint32(0, true);
      const json = JSON.parse(new TextDecoder().decode(screen.subarray(20, 20 + len)));
      expect(json.extensionsUsed).toEqual(expect.arrayContaining(['EXT_meshopt_compression', 'KHR_mesh_quantization']));
      expect(json.extras.psiform.screen.tolerance).toBeCloseTo(tol, 12);
      // Independent check: decode the file and measure every vertex against the analytic surface.
      const decoded = await decodedPositions(screen);
      for (const s of surfaces) {
        const F = levelFunction(r.field!, s.phase, r.isovalue);
        const pts = [...decoded.entries()].find(([k]) => k.includes(s.phase === 'complex' ? 'complex' : s.phase === '+' ? '+' : '\u2212'))![1];
        let worst = 0;
        for (const p of pts) worst = Math.max(worst, levelDistance(F, p[0], p[1], p[2]));
        expect(worst).toBeLessThanOrEqual(info.quantisation * 1.01 + 1e-6);
      }
    });
  }
});
