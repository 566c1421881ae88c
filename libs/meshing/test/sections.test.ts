import { describe, expect, it } from 'vitest';
import { compileState, parseOrbitalLabel, stateFromNlm } from '@psiform/orbitals';
import { sectionContours, sectionPlane } from '../src/sections';

describe('sections', () => {
  it('2p_z on the xz plane: odd in z; + contours above, - below, nodal line z = 0', () => {
    const c = compileState(parseOrbitalLabel('2pz').state);
    const n = 61, extent = 12;
    const s = sectionPlane(c, { plane: 'xz', offset: 0, extent, n });
    expect(s.mode).toBe('real');
    // psi(x, 0, -z) = -psi(x, 0, z) for 2p_z (cos theta).
    for (let j = 0; j < n; j++) for (let i = 0; i < n; i++) expect(s.values[i + n * j]).toBeCloseTo(-s.values[i + n * (n - 1 - j)], 12);
    const level = 0.3 * Math.max(...s.values);
    const cs = sectionContours(s.values, n, [level], extent);
    const pts = (g: { coordinates: number[][][][] }) => g.coordinates.flat(2);
    expect(pts(cs.plus[0]).length).toBeGreaterThan(10);
    for (const [, z] of pts(cs.plus[0])) expect(z).toBeGreaterThan(0);
    for (const [, z] of pts(cs.minus[0])) expect(z).toBeLessThan(0);
    expect(cs.minus[0].value).toBeCloseTo(-level, 12);
    // The psi >= 0 region is the upper half: its lower edge runs along z = 0 (interpolated exactly,
    // the samples at z = 0 are 0). Points away from the box edges are the nodal line.
    const nodal = pts(cs.nodal).filter(([x]) => Math.abs(x) < extent - 1);
    const onLine = nodal.filter(([, z]) => Math.abs(z) < 1e-9);
    expect(onLine.length).toBeGreaterThan(10);
    for (const [, z] of nodal) expect(z).toBeGreaterThan(-1e-9);
  });

  it('hand-checkable 3x3 grid: a single + sample gives a diamond through the half-way points', () => {
    // Values 0 everywhere except the centre 2; contour at 1 cuts each edge from the centre halfway.
    // d3-contour puts sample i at i + 0.5 (grid units), so the centre sits at (1.5, 1.5).
    const v = [0, 0, 0, 0, 2, 0, 0, 0, 0];
    const cs = sectionContours(v, 3, [1]);
    const ring = cs.plus[0].coordinates[0][0];
    const uniq = new Set(ring.map(([x, y]) => `${x},${y}`));
    expect([...uniq].sort()).toEqual(['1,1.5', '1.5,1', '1.5,2', '2,1.5']);
    expect(cs.minus[0].coordinates).toEqual([]);
  });

  it('complex states: |psi| with the sign of Re psi', () => {
    const c = compileState(stateFromNlm(2, 1, 1, { complex: true }));
    const s = sectionPlane(c, { plane: 'xy', offset: 0, extent: 8, n: 21 });
    expect(s.mode).toBe('signed-modulus');
    const p = c.evaluate(-8 + 0.8 * 15, -8 + 0.8 * 4, 0);
    expect(s.values[15 + 21 * 4]).toBeCloseTo(Math.sign(p.re || 1) * Math.hypot(p.re, p.im), 12);
    expect(() => sectionPlane(c, { plane: 'ab' as never, offset: 0, extent: 8, n: 21 })).toThrow(/plane/);
  });
});
