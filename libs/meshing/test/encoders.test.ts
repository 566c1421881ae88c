import { beforeAll, describe, expect, it } from 'vitest';

import { parseOrbitalLabel, stateFromNlm } from '@psiform/orbitals';
import { recipeToSurfaces } from '../src/pipeline';
import { phaseColoursInto, srgbToLinear } from '@psiform/colour';
import { encodeGlb, encodeObj, encodePly, encodeStl, parseBinaryStl } from '../src/encoders';
import { meshStats } from '../src/stats';


const validator = require('gltf-validator') as { validateBytes: (b: Uint8Array) => Promise<{ issues: { numErrors: number; numWarnings: number; messages: { code: string; severity: number; message: string }[] } }> };

let real: Awaited<ReturnType<typeof recipeToSurfaces>>;
let complex: Awaited<ReturnType<typeof recipeToSurfaces>>;
beforeAll(async () => {
  real = await recipeToSurfaces({ content: parseOrbitalLabel('2pz').state, grid: { n: 40, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } });
  complex = await recipeToSurfaces({ content: stateFromNlm(2, 1, 1, { complex: true }), grid: { n: 40, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.5 } });
});

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
    // Base colour is linear (glTF 2.0, 3.9.2): the default '+' colour #c8553d, red 0xc8/255 in sRGB.
    expect(json.materials[0].pbrMetallicRoughness.baseColorFactor[0]).toBeCloseTo(srgbToLinear(0xc8 / 255), 6);
  });

  it('complex 2p(+1): COLOR_0 is @psiform/colour phaseColoursInto of arg psi on the palette wheel (linear); validator 0 errors', async () => {
    const palette = { positive: '#c8553d', negative: '#2f6690', wheel: { lightness: 0.65, chroma: 0.12 } };
    const glb = await encodeGlb(complex.surfaces, { version: '0.1.0', colouring: { palette, mode: 'auto' } });
    const report = await validator.validateBytes(glb);
    expect(report.issues.numErrors).toBe(0);
    const json = glbJson(glb);
    expect(json.materials[0].name).toBe('phase (complex)');
    const m = complex.surfaces[0].mesh;
    const want = phaseColoursInto(palette, 'argument', 'complex', m.phaseAngle, new Float32Array(m.positions.length), { linear: true });
    const acc = json.accessors[json.meshes[0].primitives[0].attributes.COLOR_0];
    const view = json.bufferViews[acc.bufferView];
    const dv = new DataView(glb.buffer, glb.byteOffset, glb.byteLength);
    const binStart = 20 + dv.getUint32(12, true) + 8;
    // Vertex attributes may be interleaved (bufferView.byteStride, glTF 2.0 section 3.6.2.1).
    const stride = view.byteStride ?? 12;
    const base = binStart + (view.byteOffset ?? 0) + (acc.byteOffset ?? 0);
    const got = new Float32Array(want.length);
    for (let v = 0; v < want.length / 3; v++) for (let k = 0; k < 3; k++) got[3 * v + k] = dv.getFloat32(base + v * stride + 4 * k, true);
    let worst = 0;
    for (let i = 0; i < want.length; i++) worst = Math.max(worst, Math.abs(got[i] - want[i]));
    expect(worst).toBe(0);
  });
});

describe('STL', () => {
  it('binary STL re-parses to a watertight outward mesh with the same facets', async () => {
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

  it('rejects a truncated file', async () => {
    const stl = encodeStl(real.surfaces);
    expect(() => parseBinaryStl(stl.subarray(0, stl.length - 1))).toThrow(/does not match/);
  });
});

describe('PLY and OBJ', () => {
  it('PLY binary little endian: header counts, sizes and first vertex', async () => {
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
    expect(ply[headerEnd + 24]).toBe(0xc8); // sRGB red of the '+' default #c8553d
    expect(ply[headerEnd + nv * 27]).toBe(3);
  });

  it('OBJ: v / vn / f counts and 1-based offsets per phase', async () => {
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
