// A small GLB reader for the end-to-end tests (no three.js in Node): the phase meshes as written by
// @psiform/meshing encodeGlb.
import assert from 'node:assert/strict';

/** Meshes of a GLB per phase: positions, indices, COLOR_0 (interleaving and offsets per glTF 2.0 §3.6). */
export function readGlb(bytes) {
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  assert.equal(dv.getUint32(0, true), 0x46546c67, 'GLB magic');
  const jsonLen = dv.getUint32(12, true);
  const json = JSON.parse(new TextDecoder().decode(bytes.subarray(20, 20 + jsonLen)));
  const bin = 20 + jsonLen + 8;
  const read = (index, comps) => {
    const acc = json.accessors[index];
    const view = json.bufferViews[acc.bufferView];
    const stride = view.byteStride ?? 4 * comps;
    const base = bin + (view.byteOffset ?? 0) + (acc.byteOffset ?? 0);
    const out = acc.componentType === 5125 ? new Uint32Array(acc.count * comps) : new Float32Array(acc.count * comps);
    for (let i = 0; i < acc.count; i++)
      for (let k = 0; k < comps; k++) out[i * comps + k] = acc.componentType === 5125 ? dv.getUint32(base + i * stride + 4 * k, true) : dv.getFloat32(base + i * stride + 4 * k, true);
    return out;
  };
  const out = {};
  for (const m of json.meshes) {
    if (!m.extras?.phase) continue;
    const p = m.primitives[0];
    out[m.extras.phase] = { positions: read(p.attributes.POSITION, 3), indices: read(p.indices, 1), colors: read(p.attributes.COLOR_0, 3) };
  }
  return out;
}
