import { describe, expect, it } from 'vitest';

import { parseOrbitalLabel, stateFromNlm } from '@psiform/orbitals';
import { buildOrbitalMesh } from '../src/pipeline';
import { encodeGlb, encodeObj, encodePly, encodeStl, parseBinaryStl, srgbToLinear, type Rgb } from '../src/encoders';
import { meshStats } from '../src/stats';


const validator = require('gltf-validator') as { validateBytes: (b: Uint8Array) => Promise<{ issues: { numErrors: number; numWarnings: number; messages: { code: string; severity: number; message: string }[] } }> };

const real = buildOrbitalMesh({ state: parseOrbitalLabel('2pz').state, grid: { n: 40, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } });
const complex = buildOrbitalMesh({ state: stateFromNlm(2, 1, 1, { complex: true }), grid: { n: 40, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.5 } });
const wheel = (a: number): Rgb => [0.5 + 0.5 * Math.cos(a), 0.5 + 0.5 * Math.cos(a - 2.094), 0.5 + 0.5 * Math.cos(a + 2.094)];

function glbJson(glb: Uint8Array): any {
  // GLB container (glTF 2.0 spec, section 4.4): 12-byte header, then the JSON chunk.
  const dv = new DataView(glb.buffer, glb.byteOffset, glb.byteLength);
  expect(dv.getUint32(0, true)).toBe(0x46546c67); // 'glTF'
  expect(dv.getUint32(8, true)).toBe(glb.length);
  const len = dv.getUint32(12, true);
  return JSON.parse(new TextDecoder().decode(glb.subarray(20, 20 + len)));
}

describe('GLB', () => {
  it('real 2p_z: passes Khronos gltf-validator with 0 errors; materials, generator, extras', async () => {
    const glb = await encodeGlb(real.surfaces, { version: '0.1.0', extras: { surfaceRule: 'enclosed 0.9', isovalue: real.isovalue, grid: real.grid } });
    const report = await validator.validateBytes(glb);
    expect(report.issues.numErrors, JSON.stringify(report.issues.messages.slice(0, 3))).toBe(0);
    const json = glbJson(glb);
    expect(json.asset.generator).toBe('Psiform 0.1.0');
    expect(json.materials.map((m: { name: string }) => m.name)).toEqual(['phase +', 'phase \u2212']);
    expect(json.extras.psiform.model).toMatch(/one-electron hydrogen-like/i);
    expect(json.extras.psiform.surfaceRule).toBe('enclosed 0.9');
    const prim = json.meshes[0].primitives[0];
    expect(Object.keys(prim.attributes).sort()).toEqual(['COLOR_0', 'NORMAL', 'POSITION']);
    expect(json.accessors[prim.indices].count).toBe(real.surfaces[0].mesh.indices.length);
    // Base colour is linear (glTF 2.0, 3.9.2): default '+' sRGB 0.85 -> linear.
    expect(json.materials[0].pbrMetallicRoughness.baseColorFactor[0]).toBeCloseTo(srgbToLinear(0.85), 6);
  });

  it('complex 2p(+1): COLOR_0 from the colour wheel; validator 0 errors; wheel is required', async () => {
    const glb = await encodeGlb(complex.surfaces, { version: '0.1.0', colorWheel: wheel });
    const report = await validator.validateBytes(glb);
    expect(report.issues.numErrors).toBe(0);
    expect(glbJson(glb).materials[0].name).toBe('phase (complex)');
    await expect(encodeGlb(complex.surfaces, { version: '0.1.0' })).rejects.toThrow(/colorWheel/);
  });
});

describe('STL', () => {
  it('binary STL re-parses to a watertight outward mesh with the same facets', () => {
    const stl = encodeStl(real.surfaces);
    const F = real.surfaces[0].mesh.indices.length / 3 + real.surfaces[1].mesh.indices.length / 3;
    expect(stl.length).toBe(84 + 50 * F);
    const back = parseBinaryStl(stl);
    expect(back.header.startsWith('solid')).toBe(false);
    expect(back.header).toMatch(/^Psiform/);
    const s = meshStats(back);
    expect(s.triangles).toBe(F);
    expect(s.watertight).toBe(true);
    expect(s.components).toBe(2);
    expect(s.volume).toBeCloseTo(real.surfaces[0].stats!.volume + real.surfaces[1].stats!.volume, 3);
    // Facet normals are unit and agree with the winding.
    for (let f = 0; f < Math.min(F, 200); f++) expect(Math.hypot(back.facetNormals[3 * f], back.facetNormals[3 * f + 1], back.facetNormals[3 * f + 2])).toBeCloseTo(1, 5);
  });

  it('rejects a truncated file', () => {
    const stl = encodeStl(real.surfaces);
    expect(() => parseBinaryStl(stl.subarray(0, stl.length - 1))).toThrow(/does not match/);
  });
});

describe('PLY and OBJ', () => {
  it('PLY binary little endian: header counts, sizes and first vertex', () => {
    const ply = encodePly(real.surfaces);
    const text = new TextDecoder().decode(ply.subarray(0, 600));
    const headerEnd = text.indexOf('end_header\n') + 'end_header\n'.length;
    const nv = Number(/element vertex (\d+)/.exec(text)![1]);
    const nf = Number(/element face (\d+)/.exec(text)![1]);
    expect(text.startsWith('ply\nformat binary_little_endian 1.0\n')).toBe(true);
    expect(nv).toBe(real.surfaces.reduce((a, s) => a + s.mesh.positions.length / 3, 0));
    expect(nf).toBe(real.surfaces.reduce((a, s) => a + s.mesh.indices.length / 3, 0));
    expect(ply.length).toBe(headerEnd + nv * 27 + nf * 13);
    const dv = new DataView(ply.buffer, ply.byteOffset + headerEnd);
    expect(dv.getFloat32(0, true)).toBe(real.surfaces[0].mesh.positions[0]);
    expect(ply[headerEnd + 24]).toBe(Math.round(0.85 * 255)); // sRGB red of the '+' default
    expect(ply[headerEnd + nv * 27]).toBe(3);
  });

  it('OBJ: v / vn / f counts and 1-based offsets per phase', () => {
    const obj = encodeObj(real.surfaces);
    const lines = obj.split('\n');
    const nv = lines.filter((l) => l.startsWith('v ')).length;
    expect(nv).toBe(real.surfaces.reduce((a, s) => a + s.mesh.positions.length / 3, 0));
    expect(lines.filter((l) => l.startsWith('vn ')).length).toBe(nv);
    expect(lines.filter((l) => l.startsWith('o ')).map((l) => l.slice(2))).toEqual(['phase_plus', 'phase_minus']);
    let maxIdx = 0;
    for (const l of lines) if (l.startsWith('f ')) for (const t of l.slice(2).split(' ')) maxIdx = Math.max(maxIdx, Number(t.split('//')[0]));
    expect(maxIdx).toBe(nv);
  });
});
