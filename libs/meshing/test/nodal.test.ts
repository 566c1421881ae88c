import { describe, expect, it } from 'vitest';

import { compileState, parseOrbitalLabel } from '@psiform/orbitals';
import { recipeToSurfaces } from '../src/pipeline';
import { encodeGlb } from '../src/encoders';
import { extractNodalSurface } from '../src/nodal';

const validator = require('gltf-validator') as { validateBytes: (b: Uint8Array) => Promise<{ issues: { numErrors: number; messages: unknown[] } }> };

const maxRadius = (P: Float32Array): number => {
  let r = 0;
  for (let v = 0; v < P.length / 3; v++) r = Math.max(r, Math.hypot(P[3 * v], P[3 * v + 1], P[3 * v + 2]));
  return r;
};

// 2p_z = R_21(r) Y_10 ∝ z e^{-Zr/2}: its only node is the plane z = 0 (Griffiths, Introduction to Quantum
// Mechanics, 2nd ed., sec. 4.2, Table 4.3 for Y_10 ∝ cos θ; table numbers from memory); 1s ∝ e^{-Zr} has none.
describe('nodal surfaces', () => {
  for (const n of [24, 25]) {
    it(`2p_z (n = ${n}): the nodal output lies in z = 0 and inside the lobes' radial extent`, async () => {
      const r = await recipeToSurfaces({ content: parseOrbitalLabel('2pz').state, grid: { n, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } }, { nodal: true });
      expect(r.surfaces.map((s) => s.phase)).toEqual(['+', '-']);
      const nodal = r.nodal!;
      expect(nodal).not.toBeNull();
      expect(nodal.indices.length).toBeGreaterThan(0);
      const h = (2 * r.grid.extent) / (n - 1);
      const P = nodal.positions;
      let zMax = 0;
      let rhoMax = 0;
      for (let v = 0; v < P.length / 3; v++) {
        zMax = Math.max(zMax, Math.abs(P[3 * v + 2]));
        rhoMax = Math.max(rhoMax, Math.hypot(P[3 * v], P[3 * v + 1]));
      }
      expect(zMax).toBeLessThan(h / 2);
      const lobes = Math.max(...r.surfaces.map((s) => maxRadius(s.mesh.positions)));
      expect(maxRadius(P)).toBeLessThanOrEqual(lobes + h);
      // Clipped: the nodal disc stops well inside the box (the unclipped plane reaches the box corners' ring).
      expect(rhoMax).toBeLessThan(0.8 * r.grid.extent);
      // Not a sliver: the disc reaches out about as far as the lobes are wide (more than 2 grid spacings).
      expect(rhoMax).toBeGreaterThan(2 * h);
    });
  }

  // R_20 ∝ (2 - Zr) e^{-Zr/2} (Griffiths, sec. 4.2.2, Table 4.7; table number from memory): one radial node, the sphere r = 2/Z a0.
  it('2s: the nodal output is the sphere r = 2 a0 (within half a grid spacing)', async () => {
    const n = 40;
    const r = await recipeToSurfaces({ content: parseOrbitalLabel('2s').state, grid: { n, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } }, { nodal: true });
    const h = (2 * r.grid.extent) / (n - 1);
    const P = r.nodal!.positions;
    expect(P.length).toBeGreaterThan(0);
    for (let v = 0; v < P.length / 3; v++) expect(Math.abs(Math.hypot(P[3 * v], P[3 * v + 1], P[3 * v + 2]) - 2)).toBeLessThan(h / 2);
  });

  it('1s has no nodal output; without the option there is no nodal key; surfaces and stats are unchanged', async () => {
    const req = { content: parseOrbitalLabel('1s').state, grid: { n: 24, extent: 'auto' as const }, surface: { rule: 'enclosed' as const, fraction: 0.9 } };
    const withNodal = await recipeToSurfaces(req, { nodal: true });
    expect(withNodal.nodal).toBeNull();
    const plain = await recipeToSurfaces(req);
    expect('nodal' in plain).toBe(false);
    expect(withNodal.surfaces.map((s) => s.stats)).toEqual(plain.surfaces.map((s) => s.stats));
  });

  it('unclipped by a tiny fraction the 2p_z plane reaches further out than with the default', async () => {
    const r = await recipeToSurfaces({ content: parseOrbitalLabel('2pz').state, grid: { n: 24, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } });
    const wide = extractNodalSurface(sample2pz(24, r.grid.extent), { n: 24, extent: r.grid.extent }, r.isovalue, { fraction: 1e-6 })!;
    const tight = extractNodalSurface(sample2pz(24, r.grid.extent), { n: 24, extent: r.grid.extent }, r.isovalue)!;
    expect(maxRadius(wide.positions)).toBeGreaterThan(maxRadius(tight.positions));
    expect(() => extractNodalSurface(new Float32Array(8), { n: 2, extent: 1 }, 0)).toThrow(/isovalue/);
  });

  it('a GLB with the nodal primitive passes Khronos gltf-validator with 0 errors; it is written only when given', async () => {
    const r = await recipeToSurfaces({ content: parseOrbitalLabel('2pz').state, grid: { n: 24, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } }, { nodal: true });
    const glb = await encodeGlb(r.surfaces, { version: '0.1.0', nodal: r.nodal });
    const report = await validator.validateBytes(glb);
    expect(report.issues.numErrors, JSON.stringify(report.issues.messages.slice(0, 3))).toBe(0);
    const json = readJson(glb);
    expect(json.meshes.map((m: { name: string }) => m.name)).toEqual(['phase +', 'phase \u2212', 'nodal']);
    expect(json.meshes[2].extras).toEqual({ nodal: true });
    expect(json.accessors[json.meshes[2].primitives[0].indices].count).toBe(r.nodal!.indices.length);
    const without = readJson(await encodeGlb(r.surfaces, { version: '0.1.0' }));
    expect(without.meshes.map((m: { name: string }) => m.name)).toEqual(['phase +', 'phase \u2212']);
  });
});

function sample2pz(n: number, extent: number): Float32Array {
  const c = compileState(parseOrbitalLabel('2pz').state);
  const re = new Float32Array(n ** 3);
  c.sampleGrid({ n, extent: extent as never }, re, null);
  return re;
}

function readJson(glb: Uint8Array): any {
  // GLB container (glTF 2.0 spec, section 4.4): 12-byte header, then the JSON chunk.
  const dv = new DataView(glb.buffer, glb.byteOffset, glb.byteLength);
  const len = dv.getUint32(12, true);
  return JSON.parse(new TextDecoder().decode(glb.subarray(20, 20 + len)));
}
