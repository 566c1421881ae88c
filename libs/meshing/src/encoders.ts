// Mesh encoders: pure functions from meshes to bytes / text (no file I/O).

import { Document, WebIO } from '@gltf-transform/core';
import type { Mesh } from './mesh';
import { mergeMeshes } from './mesh';
import type { Phase } from './orbital-surfaces';
import { MODEL_NOTE } from './pipeline';

import { phaseColoursInto, resolvePhaseMode, srgbToLinear, type PhaseMode, type PhasePalette } from '@psiform/colour';

const { hypot, max, min, round, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export interface EncodeSurface {
  phase: Phase;
  mesh: Mesh;
}

/** How surfaces are coloured: the swatchbook's colours and wheel, and the phase mode (see @psiform/colour). */
export interface Colouring {
  palette: PhasePalette;
  mode?: PhaseMode;
}

/** Our neutral default (the recipe schema's palette defaults). */
export const DEFAULT_COLOURING: Colouring = { palette: { positive: '#c8553d', negative: '#2f6690', wheel: null }, mode: 'auto' };

export function materialName(phase: Phase): string {
  return phase === '+' ? 'phase +' : phase === '-' ? 'phase \u2212' : 'phase (complex)';
}

export interface GlbOptions {
  /** Engine version, written as asset.generator "Psiform <version>". */
  version: string;
  /** Model note written to the root extras (surface rule, level, grid, ...). */
  extras?: Record<string, unknown>;
  /** Colours (default DEFAULT_COLOURING); the one phase-colouring rule of @psiform/colour. */
  colouring?: Colouring;
  /** Nodal surfaces (psi = 0): written as an extra mesh and node named "nodal" (material "nodal", translucent ink,
   * extras {nodal: true}) only when given and not empty. Readers that do not know it see one more mesh. */
  nodal?: Mesh | null;
}

/** Ink of the nodal outline (our house ink #1f1d1a), sRGB. */
export const NODAL_INK = [0x1f / 255, 0x1d / 255, 0x1a / 255] as const;
export const NODAL_NAME = 'nodal';

/** Per-vertex colours of every surface of a figure (sRGB 0..1, or linear light), by @psiform/colour's rule. */
export function surfaceColours(surfaces: readonly EncodeSurface[], colouring: Colouring = DEFAULT_COLOURING, linear = false): Float32Array[] {
  const isReal = surfaces.every((s) => s.phase !== 'complex');
  const mode = resolvePhaseMode(colouring.mode, isReal);
  return surfaces.map((s) => phaseColoursInto(colouring.palette, mode, s.phase, s.mesh.phaseAngle, new Float32Array(s.mesh.positions.length), { linear }));
}

/** Binary glTF 2.0 (GLB): one mesh primitive per phase with POSITION, NORMAL, COLOR_0, indices. */
export async function encodeGlb(surfaces: readonly EncodeSurface[], opts: GlbOptions): Promise<Uint8Array> {
  if (!opts || typeof opts.version !== 'string' || opts.version === '') throw new RangeError('opts.version is required');
  const doc = new Document();
  const root = doc.getRoot();
  root.getAsset().generator = `Psiform ${opts.version}`;
  root.setExtras({ psiform: { model: MODEL_NOTE, ...(opts.extras ?? {}) } });
  const buffer = doc.createBuffer();
  const scene = doc.createScene('orbital');
  const colours = surfaceColours(surfaces, opts.colouring, true);
  for (let si = 0; si < surfaces.length; si++) {
    const s = surfaces[si];
    const m = s.mesh;
    if (m.indices.length === 0) continue; // glTF accessors must not be empty
    const mat = doc.createMaterial(materialName(s.phase)).setDoubleSided(false).setRoughnessFactor(0.5).setMetallicFactor(0);
    const col = colours[si];
    // One colour per real phase: the material carries it too (readers that ignore COLOR_0 still show it).
    if (s.phase !== 'complex' && col.length >= 3) mat.setBaseColorFactor([col[0], col[1], col[2], 1]);
    const prim = doc
      .createPrimitive()
      .setAttribute('POSITION', doc.createAccessor().setType('VEC3').setArray(m.positions).setBuffer(buffer))
      .setAttribute('NORMAL', doc.createAccessor().setType('VEC3').setArray(m.normals).setBuffer(buffer))
      .setAttribute('COLOR_0', doc.createAccessor().setType('VEC3').setArray(col).setBuffer(buffer))
      .setIndices(doc.createAccessor().setType('SCALAR').setArray(m.indices).setBuffer(buffer))
      .setMaterial(mat);
    const mesh = doc.createMesh(materialName(s.phase)).addPrimitive(prim);
    mesh.setExtras({ phase: s.phase });
    scene.addChild(doc.createNode(materialName(s.phase)).setMesh(mesh));
  }
  const nodal = opts.nodal;
  if (nodal && nodal.indices.length > 0) {
    const mat = doc
      .createMaterial(NODAL_NAME)
      .setDoubleSided(true)
      .setAlphaMode('BLEND')
      .setBaseColorFactor([srgbToLinear(NODAL_INK[0]), srgbToLinear(NODAL_INK[1]), srgbToLinear(NODAL_INK[2]), 0.35])
      .setRoughnessFactor(1)
      .setMetallicFactor(0);
    const prim = doc
      .createPrimitive()
      .setAttribute('POSITION', doc.createAccessor().setType('VEC3').setArray(nodal.positions).setBuffer(buffer))
      .setAttribute('NORMAL', doc.createAccessor().setType('VEC3').setArray(nodal.normals).setBuffer(buffer))
      .setIndices(doc.createAccessor().setType('SCALAR').setArray(nodal.indices).setBuffer(buffer))
      .setMaterial(mat);
    const mesh = doc.createMesh(NODAL_NAME).addPrimitive(prim);
    mesh.setExtras({ nodal: true });
    scene.addChild(doc.createNode(NODAL_NAME).setMesh(mesh));
  }
  root.setDefaultScene(scene);
  return new WebIO().writeBinary(doc);
}

function facetNormal(P: Float32Array, a: number, b: number, c: number, out: Float32Array): void {
  const ux = P[3 * b] - P[3 * a], uy = P[3 * b + 1] - P[3 * a + 1], uz = P[3 * b + 2] - P[3 * a + 2];
  const vx = P[3 * c] - P[3 * a], vy = P[3 * c + 1] - P[3 * a + 1], vz = P[3 * c + 2] - P[3 * a + 2];
  let nx = uy * vz - uz * vy;
  let ny = uz * vx - ux * vz;
  let nz = ux * vy - uy * vx;
  const l = sqrt(nx * nx + ny * ny + nz * nz);
  if (l > 0) {
    nx /= l;
    ny /= l;
    nz /= l;
  }
  out[0] = nx;
  out[1] = ny;
  out[2] = nz;
}

const STL_HEADER = 'Psiform binary STL; one-electron hydrogen-like model; units a0';

/**
 * Binary STL: 80-byte header (ours; not starting with "solid", common practice so readers do not
 * take it for ASCII STL), uint32 facet count, then per facet normal + 3 vertices (float32 LE) and
 * a zero uint16. Facet normals by the right-hand rule (outward for our meshes).
 */
export function encodeStl(surfaces: readonly EncodeSurface[] | Mesh, header: string = STL_HEADER): Uint8Array {
  const mesh = 'positions' in surfaces ? surfaces : mergeMeshes(surfaces.map((s) => s.mesh));
  const P = mesh.positions;
  const I = mesh.indices;
  const F = I.length / 3;
  const out = new Uint8Array(84 + 50 * F);
  const dv = new DataView(out.buffer);
  const h = new TextEncoder().encode(header.slice(0, 80));
  out.set(h.subarray(0, 80), 0);
  for (let i = h.length; i < 80; i++) out[i] = 0x20;
  dv.setUint32(80, F, true);
  const n = new Float32Array(3);
  let o = 84;
  for (let f = 0; f < F; f++) {
    const a = I[3 * f], b = I[3 * f + 1], c = I[3 * f + 2];
    facetNormal(P, a, b, c, n);
    dv.setFloat32(o, n[0], true);
    dv.setFloat32(o + 4, n[1], true);
    dv.setFloat32(o + 8, n[2], true);
    o += 12;
    for (const v of [a, b, c]) {
      dv.setFloat32(o, P[3 * v], true);
      dv.setFloat32(o + 4, P[3 * v + 1], true);
      dv.setFloat32(o + 8, P[3 * v + 2], true);
      o += 12;
    }
    dv.setUint16(o, 0, true);
    o += 2;
  }
  return out;
}

/**
 * Parse binary STL back into an indexed mesh, welding vertices with bit-identical coordinates
 * (used to check exported files are watertight). Normals are the facet normals averaged per vertex.
 */
export function parseBinaryStl(bytes: Uint8Array): Mesh & { header: string; facetNormals: Float32Array } {
  if (bytes.length < 84) throw new RangeError(`STL too short: ${bytes.length} bytes`);
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const F = dv.getUint32(80, true);
  if (bytes.length !== 84 + 50 * F) throw new RangeError(`STL size ${bytes.length} does not match ${F} facets (${84 + 50 * F} bytes)`);
  const header = new TextDecoder().decode(bytes.subarray(0, 80)).replace(/[\s\0]+$/, '');
  const map = new Map<string, number>();
  const pos: number[] = [];
  const indices = new Uint32Array(3 * F);
  const facetNormals = new Float32Array(3 * F);
  for (let f = 0; f < F; f++) {
    const o = 84 + 50 * f;
    for (let d = 0; d < 3; d++) facetNormals[3 * f + d] = dv.getFloat32(o + 4 * d, true);
    for (let k = 0; k < 3; k++) {
      const vo = o + 12 + 12 * k;
      const x = dv.getFloat32(vo, true), y = dv.getFloat32(vo + 4, true), z = dv.getFloat32(vo + 8, true);
      const key = `${x},${y},${z}`;
      let id = map.get(key);
      if (id === undefined) {
        id = pos.length / 3;
        map.set(key, id);
        pos.push(x, y, z);
      }
      indices[3 * f + k] = id;
    }
  }
  const positions = new Float32Array(pos);
  const normals = new Float32Array(positions.length);
  for (let f = 0; f < F; f++) {
    for (let k = 0; k < 3; k++) {
      const v = indices[3 * f + k];
      for (let d = 0; d < 3; d++) normals[3 * v + d] += facetNormals[3 * f + d];
    }
  }
  for (let v = 0; v < normals.length / 3; v++) {
    const l = hypot(normals[3 * v], normals[3 * v + 1], normals[3 * v + 2]) || 1;
    for (let d = 0; d < 3; d++) normals[3 * v + d] /= l;
  }
  return { positions, normals, indices, header, facetNormals };
}

function to8(c: number): number {
  return max(0, min(255, round(c * 255)));
}

/**
 * PLY (binary_little_endian 1.0): x y z nx ny nz (float), red green blue (uchar, sRGB),
 * faces as uchar-count lists of uint indices (PLY format by G. Turk, 1994).
 */
export function encodePly(surfaces: readonly EncodeSurface[], opts: { colouring?: Colouring; comment?: string } = {}): Uint8Array {
  const merged = mergeMeshes(surfaces.map((s) => s.mesh));
  const cols = surfaceColours(surfaces, opts.colouring, false);
  const nv = merged.positions.length / 3;
  const F = merged.indices.length / 3;
  const comment = (opts.comment ?? MODEL_NOTE).replace(/[\r\n]+/g, ' ');
  const header =
    'ply\nformat binary_little_endian 1.0\n' +
    `comment Psiform: ${comment}\n` +
    `element vertex ${nv}\n` +
    'property float x\nproperty float y\nproperty float z\n' +
    'property float nx\nproperty float ny\nproperty float nz\n' +
    'property uchar red\nproperty uchar green\nproperty uchar blue\n' +
    `element face ${F}\nproperty list uchar uint vertex_indices\nend_header\n`;
  const hb = new TextEncoder().encode(header);
  const out = new Uint8Array(hb.length + nv * 27 + F * 13);
  out.set(hb, 0);
  const dv = new DataView(out.buffer);
  let o = hb.length;
  let v = 0;
  for (let si = 0; si < surfaces.length; si++) {
    const c = cols[si];
    for (let k = 0; k < c.length / 3; k++, v++) {
      for (let d = 0; d < 3; d++) dv.setFloat32(o + 4 * d, merged.positions[3 * v + d], true);
      for (let d = 0; d < 3; d++) dv.setFloat32(o + 12 + 4 * d, merged.normals[3 * v + d], true);
      out[o + 24] = to8(c[3 * k]);
      out[o + 25] = to8(c[3 * k + 1]);
      out[o + 26] = to8(c[3 * k + 2]);
      o += 27;
    }
  }
  for (let f = 0; f < F; f++) {
    out[o] = 3;
    dv.setUint32(o + 1, merged.indices[3 * f], true);
    dv.setUint32(o + 5, merged.indices[3 * f + 1], true);
    dv.setUint32(o + 9, merged.indices[3 * f + 2], true);
    o += 13;
  }
  return out;
}

/** Wavefront OBJ text: one object per phase, v / vn / f a//a b//b c//c (1-based). */
export function encodeObj(surfaces: readonly EncodeSurface[], comment: string = MODEL_NOTE): string {
  const parts: string[] = [`# Psiform OBJ export`, `# ${comment.replace(/[\r\n]+/g, ' ')}`];
  let base = 1;
  for (const s of surfaces) {
    const P = s.mesh.positions;
    const N = s.mesh.normals;
    const I = s.mesh.indices;
    parts.push(`o ${s.phase === '+' ? 'phase_plus' : s.phase === '-' ? 'phase_minus' : 'phase_complex'}`);
    const lines: string[] = [];
    for (let v = 0; v < P.length / 3; v++) lines.push(`v ${P[3 * v]} ${P[3 * v + 1]} ${P[3 * v + 2]}`);
    for (let v = 0; v < N.length / 3; v++) lines.push(`vn ${N[3 * v]} ${N[3 * v + 1]} ${N[3 * v + 2]}`);
    for (let f = 0; f < I.length / 3; f++) {
      const a = I[3 * f] + base, b = I[3 * f + 1] + base, c = I[3 * f + 2] + base;
      lines.push(`f ${a}//${a} ${b}//${b} ${c}//${c}`);
    }
    parts.push(lines.join('\n'));
    base += P.length / 3;
  }
  return parts.join('\n') + '\n';
}
