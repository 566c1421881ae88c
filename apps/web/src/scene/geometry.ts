// Surfaces as three.js geometry: from typed arrays (the preview worker, the render request) or from a GLB.
import * as THREE from 'three';
import { GLTFLoader } from 'three/examples/jsm/loaders/GLTFLoader.js';

export type Phase = '+' | '-' | 'complex';
/** A lobe surface of one phase, or the nodal surfaces (psi = 0 between the lobes; drawn only as an ink outline). */
export type SurfaceKind = Phase | 'nodal';

/** One phase's surface as flat arrays (positions/normals xyz per vertex in a0; colors linear RGB per vertex). */
export interface SurfaceArrays {
  phase: SurfaceKind;
  positions: Float32Array;
  normals?: Float32Array | null;
  indices?: Uint32Array | null;
  colors?: Float32Array | null;
}

export interface PhaseGeometry {
  phase: SurfaceKind;
  geometry: THREE.BufferGeometry;
}

export function geometryFromArrays(s: SurfaceArrays): THREE.BufferGeometry {
  const g = new THREE.BufferGeometry();
  g.setAttribute('position', new THREE.BufferAttribute(s.positions, 3));
  if (s.normals && s.normals.length === s.positions.length) g.setAttribute('normal', new THREE.BufferAttribute(s.normals, 3));
  if (s.colors && s.colors.length === s.positions.length) g.setAttribute('color', new THREE.BufferAttribute(s.colors, 3));
  if (s.indices && s.indices.length > 0) g.setIndex(new THREE.BufferAttribute(s.indices, 1));
  if (!g.getAttribute('normal')) g.computeVertexNormals();
  g.computeBoundingSphere();
  return g;
}

/**
 * Which phase a GLB primitive is: the encoder writes extras {phase} on the mesh and names the material
 * "phase +", "phase −" (U+2212) or "phase (complex)"; both are accepted, plus an ASCII minus.
 */
export function phaseOf(mesh: THREE.Mesh): SurfaceKind | null {
  // The encoder's nodal mesh: extras {nodal: true}, mesh and material named "nodal".
  if (mesh.userData?.nodal === true) return 'nodal';
  const extra = mesh.userData?.phase;
  if (extra === '+' || extra === '-' || extra === 'complex') return extra;
  const mat = Array.isArray(mesh.material) ? mesh.material[0] : mesh.material;
  const name = (mat?.name ?? mesh.name ?? '').trim();
  if (/^phase\s*\+$/.test(name)) return '+';
  if (/^phase\s*[-\u2212]$/.test(name)) return '-';
  if (/^phase/.test(name)) return 'complex';
  if (name === 'nodal') return 'nodal';
  return null;
}

/** Loads a GLB and keeps only its geometry per phase (the file's materials are dropped; ours replace them). */
export async function loadGlbGeometries(url: string): Promise<PhaseGeometry[]> {
  return gltfGeometries(await new GLTFLoader().loadAsync(url));
}

/** As loadGlbGeometries, for GLB bytes already in memory. */
export async function parseGlbGeometries(bytes: ArrayBuffer): Promise<PhaseGeometry[]> {
  return gltfGeometries(await new GLTFLoader().parseAsync(bytes, ''));
}

function gltfGeometries(gltf: { scene: THREE.Object3D }): PhaseGeometry[] {
  const out: PhaseGeometry[] = [];
  gltf.scene.updateMatrixWorld(true);
  gltf.scene.traverse((o) => {
    const mesh = o as THREE.Mesh;
    if (!mesh.isMesh) return;
    const phase = phaseOf(mesh) ?? (mesh.geometry.getAttribute('color') ? 'complex' : '+');
    const geometry = mesh.geometry;
    if (!mesh.matrixWorld.equals(new THREE.Matrix4())) geometry.applyMatrix4(mesh.matrixWorld);
    // Real phases are coloured by our materials: a baked colour attribute would tint them twice.
    if (phase !== 'complex' && geometry.getAttribute('color')) geometry.deleteAttribute('color');
    out.push({ phase, geometry });
    const mats = Array.isArray(mesh.material) ? mesh.material : [mesh.material];
    for (const m of mats) m?.dispose();
  });
  return out;
}

export function disposeGeometries(list: readonly PhaseGeometry[]): void {
  for (const g of list) g.geometry.dispose();
}

/** Triangles of the lobe surfaces (the nodal outline is not counted). */
export function triangleCount(list: readonly PhaseGeometry[]): number {
  let n = 0;
  for (const { phase, geometry } of list) if (phase !== 'nodal') n += (geometry.index ? geometry.index.count : geometry.getAttribute('position').count) / 3;
  return n;
}

/** The lobe surfaces and the nodal surfaces (if any) of one list. */
export function splitNodal(list: readonly PhaseGeometry[]): { lobes: (PhaseGeometry & { phase: Phase })[]; nodal: THREE.BufferGeometry[] } {
  const lobes: (PhaseGeometry & { phase: Phase })[] = [];
  const nodal: THREE.BufferGeometry[] = [];
  for (const g of list) {
    if (g.phase === 'nodal') nodal.push(g.geometry);
    else lobes.push(g as PhaseGeometry & { phase: Phase });
  }
  return { lobes, nodal };
}

/**
 * Border of a triangle mesh: the edges used by exactly one triangle (where a clipped nodal surface ends at the
 * lobes), as pairs of positions for LineSegments. Vertices are matched by index (marching cubes shares them).
 */
export function boundaryEdges(geometry: THREE.BufferGeometry): Float32Array {
  const pos = geometry.getAttribute('position');
  const index = geometry.index;
  const tri = index ? index.count : pos.count;
  const idx = (i: number) => (index ? index.getX(i) : i);
  const count = new Map<string, number>();
  const key = (a: number, b: number) => (a < b ? `${a},${b}` : `${b},${a}`);
  for (let t = 0; t < tri; t += 3) {
    const v = [idx(t), idx(t + 1), idx(t + 2)];
    for (let e = 0; e < 3; e++) {
      const k = key(v[e], v[(e + 1) % 3]);
      count.set(k, (count.get(k) ?? 0) + 1);
    }
  }
  const out: number[] = [];
  for (const [k, c] of count) {
    if (c !== 1) continue;
    const [a, b] = k.split(',').map(Number);
    out.push(pos.getX(a), pos.getY(a), pos.getZ(a), pos.getX(b), pos.getY(b), pos.getZ(b));
  }
  return new Float32Array(out);
}
