import { describe, expect, it } from 'vitest';

import { EDGE_CORNERS, TRI_TABLE } from '../src/mc-tables';
import { blockMinMax, extractIsosurface } from '../src/marching-cubes';
import { meshStats } from '../src/stats';
import { extractCube, sampleField, triNormal } from './helpers';



describe('marching cubes tables', () => {
  // Lorensen & Cline 1987 / Bourke tables: a shared face is triangulated from both sides alike only
  // if each face's boundary segments depend on that face's 4 corner bits alone. Exhaustive check.
  it('face segments depend only on the face corners (watertight when every cell uses the table)', () => {
    const faces = [[0, 1, 2, 3], [4, 5, 6, 7], [0, 1, 5, 4], [3, 2, 6, 7], [1, 2, 6, 5], [0, 3, 7, 4]];
    const onFace = (e: number, f: number[]) => f.includes(EDGE_CORNERS[e][0]) && f.includes(EDGE_CORNERS[e][1]);
    const seen = new Map<string, string>();
    for (let c = 0; c < 256; c++) {
      const count = new Map<string, number>();
      for (let q = c * 16; TRI_TABLE[q] >= 0 && q < c * 16 + 15; q += 3) {
        for (let k = 0; k < 3; k++) {
          const a = TRI_TABLE[q + k], b = TRI_TABLE[q + ((k + 1) % 3)];
          const key = a < b ? `${a},${b}` : `${b},${a}`;
          count.set(key, (count.get(key) ?? 0) + 1);
        }
      }
      faces.forEach((f, fi) => {
        const bits = f.map((q) => (c >> q) & 1).join('');
        const local = [...count]
          .filter(([k, m]) => m === 1 && k.split(',').map(Number).every((e) => onFace(e, f)))
          .map(([k]) => k.split(',').map(Number).map((e) => [f.indexOf(EDGE_CORNERS[e][0]), f.indexOf(EDGE_CORNERS[e][1])].sort().join('')).sort().join('-'))
          .sort()
          .join('|');
        // Opposite faces (0,1), (2,3), (4,5) list corresponding corners in the same order.
        const key = `${fi >> 1}:${bits}`;
        const prev = seen.get(key);
        if (prev !== undefined) expect(local, `config ${c} face ${fi}`).toBe(prev);
        seen.set(key, local);
      });
      // Every boundary edge of a cell's patch lies on a face.
      for (const [k, m] of count) {
        if (m !== 1) continue;
        const [a, b] = k.split(',').map(Number);
        expect(faces.some((f) => onFace(a, f) && onFace(b, f)), `config ${c} edge ${k}`).toBe(true);
      }
    }
  });
});

describe('extractIsosurface: hand-checkable 2x2x2 cells', () => {
  const h = 2;
  it('one corner inside -> one triangle through the three edge midpoints, area sqrt(3) h²/8', () => {
    // Corner (0,0,0) = +1, the other seven = -1; level 0, inside above. Crossings at t = 1/2.
    const f = new Float32Array(8).fill(-1);
    f[0] = 1;
    const m = extractCube(f, 2, 0, h, 0, { inside: 'above', closeAtBoundary: false });
    expect(m.indices.length).toBe(3);
    const pts = [0, 1, 2].map((v) => Array.from(m.positions.subarray(3 * v, 3 * v + 3)));
    expect(pts.map((p) => p.join(',')).sort()).toEqual(['0,0,1', '0,1,0', '1,0,0']);
    const s = meshStats(m);
    // Equilateral triangle of side h/sqrt(2): area = sqrt(3)/4 * h²/2.
    expect(s.area).toBeCloseTo((Math.sqrt(3) / 8) * h * h, 6);
    expect(s.watertight).toBe(false);
    expect(s.boundaryEdges).toBe(3);
    // Outward = away from the inside corner: +(1,1,1) by winding and by vertex normals.
    const n = triNormal(m.positions, m.indices, 0);
    expect(n[0]).toBeGreaterThan(0);
    expect(n[1]).toBeCloseTo(n[0], 6);
    expect(n[2]).toBeCloseTo(n[0], 6);
    for (let v = 0; v < 3; v++) {
      const dot = (m.normals[3 * v] + m.normals[3 * v + 1] + m.normals[3 * v + 2]) / Math.sqrt(3);
      expect(dot).toBeGreaterThan(0.5);
    }
  });

  it('linear interpolation: corner 3, others -1 -> crossings at t = 3/4 of the edge', () => {
    const f = new Float32Array(8).fill(-1);
    f[0] = 3;
    const m = extractCube(f, 2, 0, h, 0, { inside: 'above', closeAtBoundary: false });
    const pts = [0, 1, 2].map((v) => Array.from(m.positions.subarray(3 * v, 3 * v + 3)).join(','));
    expect(pts.sort()).toEqual(['0,0,1.5', '0,1.5,0', '1.5,0,0']);
  });

  it('inside "below": the same corner as a minus lobe gives the same triangle, still outward', () => {
    const f = new Float32Array(8).fill(1);
    f[0] = -1;
    const m = extractCube(f, 2, 0, h, 0, { inside: 'below', closeAtBoundary: false });
    expect(m.indices.length).toBe(3);
    expect(triNormal(m.positions, m.indices, 0)[0]).toBeGreaterThan(0);
  });

  it('padding closes a corner piece into a tetrahedron of volume (h/2)³/6', () => {
    const f = new Float32Array(8).fill(-1);
    f[0] = 1;
    const m = extractCube(f, 2, 0, h, 0, { inside: 'above' });
    const s = meshStats(m);
    expect(s.watertight).toBe(true);
    expect(s.euler).toBe(2);
    expect(s.volume).toBeCloseTo((h / 2) ** 3 / 6, 6);
    // Tetrahedron: 3 right triangles of legs h/2 plus the slanted face.
    expect(s.area).toBeCloseTo(3 * (h / 2) ** 2 / 2 + (Math.sqrt(3) / 8) * h * h, 6);
  });

  it('a half-space clipped by the box is a closed box: volume and area by hand', () => {
    // 5³ grid on [-1,1]³, field = z + 0.25 (linear, so interpolation is exact): region z > -0.25.
    const f = sampleField(5, -1, 0.5, (_x, _y, z) => z + 0.25);
    const s = meshStats(extractCube(f, 5, -1, 0.5, 0, { inside: 'above' }));
    expect(s.watertight).toBe(true);
    expect(s.components).toBe(1);
    expect(s.euler).toBe(2);
    expect(s.volume).toBeCloseTo(2 * 2 * 1.25, 5);
    expect(s.area).toBeCloseTo(2 * 4 + 4 * (2 * 1.25), 5);
  });
});

describe('extractIsosurface: sampled shapes', () => {
  it('sphere R = 1.3 (field R - r, h = 0.1): closed, genus 0, outward, area/volume within 0.5%', () => {
    // Sphere area 4 pi R², volume 4/3 pi R³ (elementary geometry). MC chords cut slightly inside.
    const R = 1.3, n = 41, o = -2, h = 0.1;
    const f = sampleField(n, o, h, (x, y, z) => R - Math.hypot(x, y, z));
    const s = meshStats(extractCube(f, n, o, h, 0, { inside: 'above' }));
    expect(s.watertight).toBe(true);
    expect(s.euler).toBe(2);
    expect(s.components).toBe(1);
    expect(s.volume).toBeGreaterThan(0);
    expect(Math.abs(s.area / (4 * Math.PI * R * R) - 1)).toBeLessThan(0.005);
    expect(Math.abs(s.volume / ((4 / 3) * Math.PI * R ** 3) - 1)).toBeLessThan(0.005);
    expect(s.bbox!.max[0]).toBeCloseTo(R, 3);
  });

  it('outside of a sphere inside the box: two shells (box + sphere), volume = box - ball', () => {
    const R = 1.3, n = 21, o = -2, h = 0.2;
    const f = sampleField(n, o, h, (x, y, z) => R - Math.hypot(x, y, z));
    const inner = meshStats(extractCube(f, n, o, h, 0, { inside: 'above' }));
    const outer = meshStats(extractCube(f, n, o, h, 0, { inside: 'below' }));
    expect(outer.watertight).toBe(true);
    expect(outer.components).toBe(2);
    expect(outer.euler).toBe(4);
    expect(outer.volume).toBeCloseTo(64 - inner.volume, 4);
    expect(outer.area).toBeCloseTo(96 + inner.area, 3);
  });

  it('torus (R = 1.2, r = 0.45): Euler characteristic 0, one component, outward', () => {
    // Torus volume 2 pi² R r², area 4 pi² R r (Pappus); checked loosely (h = 0.08).
    const Rt = 1.2, rt = 0.45, n = 46, o = -1.8, h = 0.08;
    const f = sampleField(n, o, h, (x, y, z) => rt - Math.hypot(Math.hypot(x, y) - Rt, z));
    const s = meshStats(extractCube(f, n, o, h, 0, { inside: 'above' }));
    expect(s.watertight).toBe(true);
    expect(s.euler).toBe(0);
    expect(s.components).toBe(1);
    expect(Math.abs(s.volume / (2 * Math.PI ** 2 * Rt * rt * rt) - 1)).toBeLessThan(0.02);
    expect(Math.abs(s.area / (4 * Math.PI ** 2 * Rt * rt) - 1)).toBeLessThan(0.02);
  });

  it('two separate balls: 2 components, Euler 4', () => {
    const n = 30, o = -3, h = 0.2;
    const f = sampleField(n, o, h, (x, y, z) => Math.max(1 - Math.hypot(x - 1.5, y, z), 1 - Math.hypot(x + 1.5, y, z)));
    const s = meshStats(extractCube(f, n, o, h, 0, { inside: 'above' }));
    expect(s.components).toBe(2);
    expect(s.euler).toBe(4);
    expect(s.watertight).toBe(true);
  });

  it('noisy field full of ambiguous cells stays watertight and consistently oriented', () => {
    // Deterministic pseudo-random values (LCG, common practice): many saddle faces.
    let seed = 12345;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648) - 0.5;
    const n = 18;
    const f = new Float32Array(n ** 3).map(() => rnd());
    for (const inside of ['above', 'below'] as const) {
      const s = meshStats(extractCube(f, n, 0, 1, 0.05, { inside }));
      expect(s.triangles).toBeGreaterThan(1000);
      expect(s.watertight).toBe(true);
      expect(s.volume).toBeGreaterThan(0);
    }
  });

  it('block skipping gives exactly the same mesh as no skipping', () => {
    let seed = 7;
    const rnd = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648) - 0.5;
    const n = 40, o = -2, h = 0.1;
    const fields = [
      sampleField(n, o, h, (x, y, z) => 1.3 - Math.hypot(x, y, z)),
      sampleField(n, o, h, (x, y, z) => 0.4 - Math.hypot(Math.hypot(x, y) - 1.1, z) + 0.05 * rnd()),
      sampleField(n, o, h, (x, y, z) => z + 0.3 * x), // plane through the box
    ];
    for (const f of fields) {
      for (const blockSize of [3, 8]) {
        for (const pad of [true, false]) {
          const opts = { inside: 'above' as const, blockSize, closeAtBoundary: pad };
          const a = extractCube(f, n, o, h, 0.01, { ...opts, skipEmpty: true });
          const b = extractCube(f, n, o, h, 0.01, { ...opts, skipEmpty: false });
          expect(a.indices.length).toBeGreaterThan(0);
          expect(Buffer.from(a.positions.buffer).equals(Buffer.from(b.positions.buffer))).toBe(true);
          expect(Buffer.from(a.normals.buffer).equals(Buffer.from(b.normals.buffer))).toBe(true);
          expect(Buffer.from(a.indices.buffer).equals(Buffer.from(b.indices.buffer))).toBe(true);
        }
      }
    }
  });

  it('same triangle count and area as the isosurface package (Bourke tables, level 0)', () => {
    // Reference: npm `isosurface` 1.0.0 marchingCubes (port of Bourke's polygoniser). Its level is
    // fixed at 0 and it ignores differences under 1e-6, so it gets 1e3 * (field - level).
    const n = 32, o = -1.6, h = 0.1, level = 0.2;
    const fn = (x: number, y: number, z: number) =>
      Math.exp(-((x - 0.4) ** 2 + y * y + z * z) * 2) + Math.exp(-((x + 0.5) ** 2 + (y - 0.2) ** 2 + z * z) * 3) - 0.3 * Math.exp(-(x * x + y * y + (z - 0.8) ** 2) * 4);
    const f = sampleField(n, o, h, fn);
    const ours = meshStats(extractCube(f, n, o, h, level, { inside: 'above', closeAtBoundary: false }));
    const iso = require('isosurface') as { marchingCubes: (d: number[], p: (x: number, y: number, z: number) => number, b: number[][]) => { positions: number[][]; cells: number[][] } };
    const at = (x: number, y: number, z: number) => {
      const i = Math.round((x - o) / h), j = Math.round((y - o) / h), k = Math.round((z - o) / h);
      return 1e3 * (f[i + n * (j + n * k)] - level);
    };
    // The package's spacing is (b1 - b0) / dims, so b1 = o + n h reproduces our grid.
    const ref = iso.marchingCubes([n, n, n], at, [[o, o, o], [o + n * h, o + n * h, o + n * h]]);
    let area = 0;
    for (const [a, b, c] of ref.cells) {
      const A = ref.positions[a], B = ref.positions[b], C = ref.positions[c];
      const u = [B[0] - A[0], B[1] - A[1], B[2] - A[2]], v = [C[0] - A[0], C[1] - A[1], C[2] - A[2]];
      area += 0.5 * Math.hypot(u[1] * v[2] - u[2] * v[1], u[2] * v[0] - u[0] * v[2], u[0] * v[1] - u[1] * v[0]);
    }
    expect(ours.triangles).toBeGreaterThan(500);
    expect(ours.triangles).toBe(ref.cells.length);
    expect(Math.abs(ours.area / area - 1)).toBeLessThan(1e-4);
    // Shared vertices: the package emits one vertex per crossed edge per cell.
    expect(ours.vertices).toBeLessThan(ref.positions.length / 2);
  });

  it('uses the supplied outward normal; falls back to central differences where it is zero', () => {
    const R = 1, n = 21, o = -1.5, h = 0.15;
    const f = sampleField(n, o, h, (x, y, z) => R - Math.hypot(x, y, z));
    const m = extractCube(f, n, o, h, 0, {
      inside: 'above',
      normal: (x, y, z, out) => {
        if (z > 0) {
          const r = Math.hypot(x, y, z);
          out[0] = x / r; out[1] = y / r; out[2] = z / r;
        } // z <= 0: leave zero -> fallback
      },
    });
    for (let v = 0; v < m.positions.length / 3; v++) {
      const p = m.positions.subarray(3 * v, 3 * v + 3);
      const r = Math.hypot(p[0], p[1], p[2]);
      const dot = (p[0] * m.normals[3 * v] + p[1] * m.normals[3 * v + 1] + p[2] * m.normals[3 * v + 2]) / r;
      expect(Math.hypot(m.normals[3 * v], m.normals[3 * v + 1], m.normals[3 * v + 2])).toBeCloseTo(1, 5);
      expect(dot).toBeGreaterThan(p[2] > 0 ? 0.99999 : 0.98);
    }
  });

  it('rejects bad input with messages naming the field', () => {
    const f = new Float32Array(27);
    expect(() => extractIsosurface(f, { nx: 3, ny: 3, nz: 2 }, { origin: [0, 0, 0], spacing: 1 }, 0, { inside: 'above' })).toThrow(/field length/);
    expect(() => extractIsosurface(f, { nx: 3, ny: 3, nz: 3 }, { origin: [0, 0, 0], spacing: 0 }, 0, { inside: 'above' })).toThrow(/geom.spacing/);
    expect(() => extractIsosurface(f, { nx: 3, ny: 3, nz: 3 }, { origin: [0, 0, 0], spacing: 1 }, NaN, { inside: 'above' })).toThrow(/level/);
    expect(() => extractIsosurface(f, { nx: 3, ny: 3, nz: 3 }, { origin: [0, 0, 0], spacing: 1 }, 0, { inside: 'up' as never })).toThrow(/opts.inside/);
    const g = new Float32Array(27);
    g[13] = NaN;
    expect(() => blockMinMax(g, { nx: 3, ny: 3, nz: 3 })).toThrow(/non-finite/);
  });
});
