import { describe, expect, it } from 'vitest';
import * as THREE from 'three';
import { parseOrbitalLabel } from '@psiform/orbitals';
import { encodeGlb, recipeToSurfaces } from '@psiform/meshing';
import { boundaryEdges, parseGlbGeometries, splitNodal, triangleCount } from './geometry';

const toBuffer = (u: Uint8Array): ArrayBuffer => u.buffer.slice(u.byteOffset, u.byteOffset + u.byteLength) as ArrayBuffer;

describe('nodal outline geometry', () => {
  it('a GLB with the encoder\'s "nodal" mesh loads as one nodal entry beside the two phases; triangles count lobes only', async () => {
    const r = await recipeToSurfaces({ content: parseOrbitalLabel('2pz').state, grid: { n: 24, extent: 'auto' }, surface: { rule: 'enclosed', fraction: 0.9 } }, { nodal: true });
    const list = await parseGlbGeometries(toBuffer(await encodeGlb(r.surfaces, { version: 'test', nodal: r.nodal })));
    expect(list.map((g) => g.phase)).toEqual(['+', '-', 'nodal']);
    const { lobes, nodal } = splitNodal(list);
    expect(lobes.map((g) => g.phase)).toEqual(['+', '-']);
    expect(nodal).toHaveLength(1);
    expect(nodal[0].index!.count).toBe(r.nodal!.indices.length);
    expect(triangleCount(list)).toBe(r.surfaces.reduce((n, s) => n + s.mesh.indices.length / 3, 0));
    // Without the option the file has no nodal entry.
    const plain = await parseGlbGeometries(toBuffer(await encodeGlb(r.surfaces, { version: 'test' })));
    expect(plain.map((g) => g.phase)).toEqual(['+', '-']);
  });

  it('boundaryEdges: a square of two triangles has its four sides as border, not the shared diagonal', () => {
    const g = new THREE.BufferGeometry();
    g.setAttribute('position', new THREE.BufferAttribute(new Float32Array([0, 0, 0, 1, 0, 0, 1, 1, 0, 0, 1, 0]), 3));
    g.setIndex([0, 1, 2, 0, 2, 3]);
    const e = boundaryEdges(g);
    expect(e.length).toBe(4 * 6);
    for (let i = 0; i < e.length; i += 6) {
      const len = Math.hypot(e[i + 3] - e[i], e[i + 4] - e[i + 1], e[i + 5] - e[i + 2]);
      expect(len).toBeCloseTo(1, 6); // the diagonal would be √2
    }
  });
});
