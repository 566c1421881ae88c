import { describe, expect, it } from 'vitest';
import { meshStats } from '../src/stats';
import type { Mesh } from '../src/mesh';

// Unit right tetrahedron (0,0,0),(1,0,0),(0,1,0),(0,0,1), faces wound counter-clockwise from outside.
function tetra(): Mesh {
  const positions = new Float32Array([0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0, 1]);
  const indices = new Uint32Array([0, 2, 1, 0, 1, 3, 0, 3, 2, 1, 2, 3]);
  return { positions, normals: new Float32Array(12), indices };
}

describe('meshStats (hand-computed tetrahedron)', () => {
  it('V 4, E 6, F 4, Euler 2, volume 1/6, area 3/2 + sqrt(3)/2', () => {
    const s = meshStats(tetra());
    expect([s.vertices, s.edges, s.triangles, s.euler, s.components]).toEqual([4, 6, 4, 2, 1]);
    expect(s.watertight).toBe(true);
    expect(s.volume).toBeCloseTo(1 / 6, 12);
    expect(s.area).toBeCloseTo(1.5 + Math.sqrt(3) / 2, 6);
    expect(s.bbox).toEqual({ min: [0, 0, 0], max: [1, 1, 1] });
  });

  it('inward orientation gives negative volume (divergence theorem sign)', () => {
    const m = tetra();
    for (let f = 0; f < 4; f++) [m.indices[3 * f + 1], m.indices[3 * f + 2]] = [m.indices[3 * f + 2], m.indices[3 * f + 1]];
    const s = meshStats(m);
    expect(s.volume).toBeCloseTo(-1 / 6, 12);
    expect(s.watertight).toBe(true);
  });

  it('one flipped face: 3 misoriented edges, not watertight', () => {
    const m = tetra();
    [m.indices[1], m.indices[2]] = [m.indices[2], m.indices[1]];
    const s = meshStats(m);
    expect(s.misorientedEdges).toBe(3);
    expect(s.watertight).toBe(false);
  });

  it('one face removed: 3 boundary edges, Euler 1 (a disc)', () => {
    const m = tetra();
    m.indices = m.indices.slice(0, 9);
    const s = meshStats(m);
    expect(s.boundaryEdges).toBe(3);
    expect(s.euler).toBe(1);
    expect(s.watertight).toBe(false);
  });

  it('a fin (edge shared by three triangles) is non-manifold; two tetrahedra are two components', () => {
    const m = tetra();
    const fin = { ...m, positions: new Float32Array([...m.positions, 0.3, 0.3, -1]), indices: new Uint32Array([...m.indices, 0, 1, 4]) };
    expect(meshStats(fin).nonManifoldEdges).toBe(1);
    const two: Mesh = {
      positions: new Float32Array([...m.positions, ...m.positions.map((v) => v + 5)]),
      normals: new Float32Array(24),
      indices: new Uint32Array([...m.indices, ...m.indices.map((i) => i + 4)]),
    };
    const s = meshStats(two);
    expect(s.components).toBe(2);
    expect(s.euler).toBe(4);
    expect(s.volume).toBeCloseTo(2 / 6, 10);
  });
});
