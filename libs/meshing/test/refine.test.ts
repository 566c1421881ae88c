import { describe, expect, it } from 'vitest';
import { compileState, parseOrbitalLabel } from '@psiform/orbitals';
import { fillMissingNormals, levelFunction, meshDeviation, projectMesh, projectPoint, refineMesh, type AnalyticField, type RefineInfo } from '../src/refine';
import { RASTER_LIMITS } from '@psiform/contracts';
import { FILE_TRIANGLE_BUDGET, REFINE_OVERHEAD, fileTolerance, printTolerance, refinedTriangles } from '../src/tolerance';
import { meshStats } from '../src/stats';
import type { Mesh } from '../src/mesh';

// 1s (Z = 1): psi = e^{-r} / sqrt(pi) (Griffiths Table 4.7 × Y_00), so the surface psi = c is the sphere
// r = R with c = e^{-R} / sqrt(pi), and the first-order distance |F| / |grad F| of a point at radius r is
// |e^{-r} - e^{-R}| / e^{-r} = |1 - e^{r - R}|: every number below follows from that by hand.
const oneS = compileState(parseOrbitalLabel('1s').state);
const R = 2;
const c = Math.exp(-R) / Math.sqrt(Math.PI);
const F1s = levelFunction(oneS, '+', c);
const firstOrder = (r: number) => Math.abs(1 - Math.exp(r - R));

/** Regular octahedron with vertices at radius a on the axes, outward (counter-clockwise) triangles. */
function octahedron(a: number): Mesh {
  const positions = new Float32Array([a, 0, 0, -a, 0, 0, 0, a, 0, 0, -a, 0, 0, 0, a, 0, 0, -a]);
  const indices = new Uint32Array([0, 2, 4, 2, 1, 4, 1, 3, 4, 3, 0, 4, 2, 0, 5, 1, 2, 5, 3, 1, 5, 0, 3, 5]);
  return { positions, normals: new Float32Array(18), indices };
}

const radius = (m: Mesh, v: number) => Math.hypot(m.positions[3 * v], m.positions[3 * v + 1], m.positions[3 * v + 2]);

describe('projection onto the analytic level set (safeguarded Newton)', () => {
  it('an octahedron at radius 2.6 lands on the 1s sphere r = 2 to 1e-6 a0, normals radial (outward)', () => {
    const m = octahedron(2.6);
    const info = { maxDistance: 0, failed: 0 };
    projectMesh(m, F1s, 1, '+', info);
    expect(info.failed).toBe(0);
    for (let v = 0; v < 6; v++) {
      expect(Math.abs(radius(m, v) - R)).toBeLessThan(1e-6);
      for (let k = 0; k < 3; k++) expect(m.normals[3 * v + k]).toBeCloseTo(m.positions[3 * v + k] / R, 6);
    }
  });

  it('never moves a point farther than allowed; a point where the gradient vanishes (the nucleus) stays put', () => {
    const p = new Float64Array([3.5, 0, 0]);
    const d = projectPoint(F1s, p, 0.5);
    expect(Math.hypot(p[0], p[1], p[2])).toBeGreaterThanOrEqual(3 - 1e-12); // moved at most 0.5
    expect(d).toBeCloseTo(firstOrder(p[0]), 9);
    const o = new Float64Array([0, 0, 0]);
    expect(projectPoint(F1s, o, 1)).toBe(Infinity);
    expect([...o]).toEqual([0, 0, 0]);
  });

  it('a vertex where the gradient vanishes gets the unit normal of its triangles (glTF needs unit normals)', () => {
    const m = octahedron(1);
    m.normals.fill(0);
    fillMissingNormals(m);
    // vertex 4 (0, 0, 1): the four upper faces' normals sum to +z
    expect([m.normals[12], m.normals[13], m.normals[14]].map((x) => Math.round(x * 1e9) / 1e9)).toEqual([0, 0, 1]);
    for (let v = 0; v < 6; v++) expect(Math.hypot(m.normals[3 * v], m.normals[3 * v + 1], m.normals[3 * v + 2])).toBeCloseTo(1, 12);
  });

  it('the minus phase and complex surfaces: 2p_z lobe below the plane, 2p(m = 1) ring |psi| = c', () => {
    const pz = compileState(parseOrbitalLabel('2pz').state);
    const Fm = levelFunction(pz, '-', 0.05);
    const p = new Float64Array([0.3, 0.2, -3.9]); // the lobe's surface crosses the z axis near z = -4.3
    expect(projectPoint(Fm, p, 1)).toBeLessThan(1e-9);
    expect(pz.evaluate(p[0], p[1], p[2]).re).toBeCloseTo(-0.05, 10);
    const ring = compileState({ Z: 1, terms: [{ n: 2, l: 1, m: 1, basis: 'complex', re: 1, im: 0 }] });
    const Fc = levelFunction(ring, 'complex', 0.03);
    const q = new Float64Array([1.5, 1.1, 0.4]);
    expect(projectPoint(Fc, q, 2)).toBeLessThan(1e-9);
    const v = ring.evaluate(q[0], q[1], q[2]);
    expect(Math.hypot(v.re, v.im)).toBeCloseTo(0.03, 10);
  });
});

describe('refinement to a tolerance (conforming red-green splitting)', () => {
  it('octahedron on the 1s sphere, tolerance 0.312 (refined to 0.99 of it): one round, every edge split once → 18 vertices, 32 triangles; worst left = centre-triangle centroid 1 − e^{R(0.8165−1)}', () => {
    const m = projectMesh(octahedron(R), F1s, 1, '+');
    // Round 1: edge midpoints at R/√2 (first-order distance 0.443 > 0.31) and face centroids at R/√3 (0.571).
    expect(firstOrder(R / Math.SQRT2)).toBeGreaterThan(0.312);
    const info = {} as RefineInfo;
    const r = refineMesh(m, F1s, '+', { tolerance: 0.312 }, info);
    expect(info.rounds).toBe(1);
    expect(r.positions.length / 3).toBe(18);
    expect(r.indices.length / 3).toBe(32);
    // Round 2 checks: vertex–midpoint chords (45°: R cos 22.5°), midpoint–midpoint chords (60°: R cos 30°), corner
    // triangle centroids (0.871 R) and centre triangle centroids (2/√6 R = 0.8165 R, the worst).
    const centre = firstOrder((2 / Math.sqrt(6)) * R);
    expect(centre).toBeCloseTo(0.30722, 4);
    expect(info.maxDeviation).toBeCloseTo(centre, 5);
    expect(meshDeviation(r, F1s).max).toBeCloseTo(centre, 5);
    for (let v = 0; v < 18; v++) expect(Math.abs(radius(r, v) - R)).toBeLessThan(1e-6);
    const st = meshStats(r);
    expect([st.components, st.euler, st.watertight, st.boundaryEdges]).toEqual([1, 2, true, 0]);
    expect(st.volume).toBeGreaterThan(0); // still outward
  });

  it('a tight tolerance on the sphere: every chord midpoint and centroid within it, watertight, volume → 4/3 π R³', () => {
    const info = {} as RefineInfo;
    const r = refineMesh(projectMesh(octahedron(R), F1s, 1, '+'), F1s, '+', { tolerance: 1e-3 }, info);
    expect(info.limited).toBe(false);
    const dev = meshDeviation(r, F1s);
    expect(dev.max).toBeLessThanOrEqual(1e-3);
    expect(dev.vertices).toBeLessThan(1e-6);
    const st = meshStats(r);
    expect([st.components, st.euler, st.watertight]).toEqual([1, 2, true]);
    // A polyhedron inscribed in the sphere, chords within 1e-3 of it: volume within 3 × 1e-3 / R relative.
    expect(Math.abs(st.volume / ((4 / 3) * Math.PI * R ** 3) - 1)).toBeLessThan(3e-3);
  });

  it('splits only where the surface curves: a quad on the parabolic cylinder z = 0.4 x² gets its x-chords split (2 + 2 split edges → 6 triangles, 7 vertices), y-chords left', () => {
    // psi = 1 + 0.4 x² − z, level 1: F = 0.4 x² − z on the '+' side. A chord from x0 to x1 on the surface lies
    // 0.4 (x1 − x0)² / 4 below it at its midpoint (0.1 for the unit quad's x-chords, 0.025 after one split).
    const field: AnalyticField = {
      isReal: true,
      gradient(x, _y, z, out) {
        out.fill(0);
        out[0] = 0.8 * x;
        out[2] = -1;
        out[6] = 1 + 0.4 * x * x - z;
      },
    };
    const F = levelFunction(field, '+', 1);
    const quad: Mesh = {
      positions: new Float32Array([0, 0, 0, 1, 0, 0.4, 1, 1, 0.4, 0, 1, 0]),
      normals: new Float32Array(12),
      indices: new Uint32Array([0, 1, 2, 0, 2, 3]),
    };
    const info = {} as RefineInfo;
    const r = refineMesh(quad, F, '+', { tolerance: 0.05 }, info);
    expect(info.rounds).toBe(1);
    expect(r.indices.length / 3).toBe(6);
    expect(r.positions.length / 3).toBe(7); // the shared diagonal's midpoint is one vertex
    for (let v = 4; v < 7; v++) {
      const [x, , z] = [r.positions[3 * v], r.positions[3 * v + 1], r.positions[3 * v + 2]];
      expect(Math.abs(0.4 * x * x - z)).toBeLessThan(1e-6);
    }
    expect(meshDeviation(r, F).max).toBeLessThan(0.05);
    // Orientation kept: every triangle's normal points the way the quad's did (+z side up to the slope).
    for (let t = 0; t < 6; t++) {
      const [a, b, cc] = [0, 1, 2].map((k) => r.indices[3 * t + k]);
      const P = (i: number) => [r.positions[3 * i], r.positions[3 * i + 1], r.positions[3 * i + 2]];
      const [pa, pb, pc] = [P(a), P(b), P(cc)];
      const u = pb.map((x, k) => x - pa[k]);
      const w = pc.map((x, k) => x - pa[k]);
      expect(u[0] * w[1] - u[1] * w[0]).toBeGreaterThan(0);
    }
  });

  it('stops at the triangle limit and says so', () => {
    const info = {} as RefineInfo;
    refineMesh(projectMesh(octahedron(R), F1s, 1, '+'), F1s, '+', { tolerance: 1e-5, maxTriangles: 200 }, info);
    expect(info.limited).toBe(true);
    expect(info.maxDeviation).toBeGreaterThan(1e-5);
    expect(() => refineMesh(octahedron(R), F1s, '+', { tolerance: 0 })).toThrow(/tolerance/);
  });
});

describe('tolerances from the output', () => {
  it('a quarter pixel: 180 mm at 1200 dpi is 8504 px; orthographic, half-width 10 a0 → 0.25 × 20 / 8504 a0', () => {
    expect(printTolerance({ widthPx: 8504, heightPx: 8504, camera: { projection: 'orthographic' } }, 10)).toBeCloseTo((0.25 * 20) / 8504, 12);
    // zoom 2 halves it; perspective 35° shrinks it by 1 − sin 17.5°; the narrower side counts
    expect(printTolerance({ widthPx: 8504, heightPx: 4000, camera: { projection: 'orthographic', zoom: 2 } }, 10)).toBeCloseTo((0.25 * 20) / 4000 / 2, 12);
    expect(printTolerance({ widthPx: 1000, heightPx: 1000, camera: { projection: 'perspective', fovDeg: 35 } }, 10)).toBeCloseTo(0.005 * (1 - Math.sin((17.5 * Math.PI) / 180)), 12);
    expect(() => printTolerance({ widthPx: 0, heightPx: 10 }, 1)).toThrow(/whole pixels/);
  });

  it('3D files: 3.5e-5 of the half-width, finer than the quarter pixel of the largest raster export; 1s within 1e-4 a0', () => {
    // 1s at 90 %: R solves 1 − e^{-2R}(1 + 2R + 2R²) = 0.9 (R = 2.6612 a0), so the tolerance is 9.31e-5 a0.
    expect(fileTolerance(2.6612)).toBeCloseTo(9.314e-5, 8);
    expect(fileTolerance(2.6612)).toBeLessThanOrEqual(1e-4);
    // The largest raster: 64 megapixels, so at most 8000 px on its shorter side (RASTER_LIMITS, common practice for
    // the default camera: perspective 35°, zoom 1): its quarter pixel is 0.25 × 2 / 8000 × (1 − sin 17.5°) = 4.37e-5 R.
    const side = Math.floor(Math.sqrt(RASTER_LIMITS.megapixelsMax * 1e6));
    expect(side).toBe(8000);
    const largest = printTolerance({ widthPx: side, heightPx: side, camera: { projection: 'perspective', fovDeg: 35, zoom: 1 } }, 1);
    expect(largest).toBeCloseTo(0.25 * (2 / 8000) * (1 - Math.sin((17.5 * Math.PI) / 180)), 12);
    expect(fileTolerance(1)).toBeLessThan(largest);
    expect(() => fileTolerance(-1)).toThrow(/half-width/);
  });

  it('3D files: coarser only when the projected mesh would pass the triangle budget, to where it meets the budget', () => {
    // 1000 triangles 0.01 a0 off (half-width 1): at 3.5e-5 they would become 1000 × 1.4 × 0.01 / 3.5e-5 = 4e5 > 3e5
    // triangles, so the tolerance is where 1000 × 1.4 × 0.01 / tol = 3e5: tol = 14 / 3e5 = 4.667e-5 a0 (bisection, 1 %).
    expect(FILE_TRIANGLE_BUDGET).toBe(300_000);
    expect(REFINE_OVERHEAD).toBe(1.4);
    const far = new Float64Array(1000).fill(0.01);
    expect(refinedTriangles(far, 3.5e-5)).toBeCloseTo(4e5, 6);
    const tol = fileTolerance(1, far);
    expect(tol / (14 / 3e5)).toBeGreaterThanOrEqual(1);
    expect(tol / (14 / 3e5)).toBeLessThan(1.01);
    // 100 such triangles make 4e4 < 3e5: the exact default stands; a triangle within the tolerance stays one.
    expect(fileTolerance(1, far.subarray(0, 100))).toBe(3.5e-5);
    expect(refinedTriangles([1e-9, 1e-9], 1e-4)).toBe(2);
  });
});
