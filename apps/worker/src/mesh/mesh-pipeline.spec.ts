import { parseRecipe, type Recipe } from '@psiform/contracts';
import { buildOrbitalMesh, meshStats } from '@psiform/meshing';
import { autoExtent } from '@psiform/orbitals';
import { closeParallelSampler } from '@psiform/orbitals/node';
import { cubeFromNrrd, encode, extract, gridLabel, nodalSurface, phaseWheel, sampleComputed, stateOf, threshold, type Field } from './mesh-pipeline';
import { nrrdHeaderFor } from '@psiform/server';

const recipe = (over: Record<string, unknown>): Recipe => {
  const r = parseRecipe({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 24 }, surface: { rule: 'enclosed', fraction: 0.9 }, ...over });
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.recipe;
};

afterAll(() => closeParallelSampler());

/** The staged pipeline must give what @psiform/meshing's one-call buildOrbitalMesh gives (same steps). */
describe('staged mesh pipeline vs buildOrbitalMesh', () => {
  const cases: Array<[string, Recipe]> = [
    ['real 2p_z, enclosed 90%', recipe({})],
    ['real 3d_z2 (Z = 2), psi = 0.01', recipe({ content: { Z: 2, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1 }] }, surface: { rule: 'psi', value: 0.01 } })],
    ['complex 2p(m = +1), enclosed 80%', recipe({ content: { Z: 1, terms: [{ n: 2, l: 1, m: 1, basis: 'complex', re: 1 }] }, surface: { rule: 'enclosed', fraction: 0.8 } })],
  ];
  it.each(cases)('%s', async (_name, r) => {
    const field = await sampleComputed(r, { threads: 2 });
    const t = threshold(field, r.surface);
    const surfaces = extract(field, t);
    const ref = buildOrbitalMesh({ state: stateOf(r), grid: { n: r.grid.n, extent: r.grid.extent }, surface: r.surface });
    expect(t.isovalue).toBe(ref.isovalue);
    expect(t.enclosed).toBe(ref.enclosed);
    expect(surfaces.map((s) => s.phase)).toEqual(ref.surfaces.map((s) => s.phase));
    surfaces.forEach((s, i) => {
      expect(Array.from(s.mesh.indices)).toEqual(Array.from(ref.surfaces[i].mesh.indices));
      expect(Array.from(s.mesh.positions)).toEqual(Array.from(ref.surfaces[i].mesh.positions));
    });
  });
});

describe('nodal outline (stage.material.nodalOutline)', () => {
  it('only when the recipe asks: the same psi = 0 mesh as buildOrbitalMesh, written into the GLB as a "nodal" mesh', async () => {
    const on = recipe({ stage: { material: { nodalOutline: true } } });
    const field = await sampleComputed(on, { threads: 2 });
    const t = threshold(field, on.surface);
    const surfaces = extract(field, t);
    expect(nodalSurface(field, t, recipe({}))).toBeNull();
    const nodal = nodalSurface(field, t, on)!;
    const ref = buildOrbitalMesh({ state: stateOf(on), grid: { n: on.grid.n, extent: on.grid.extent }, surface: on.surface }, { nodal: true });
    expect(Array.from(nodal.positions)).toEqual(Array.from(ref.nodal!.positions));
    const names = async (glb: Uint8Array) => {
      const len = new DataView(glb.buffer, glb.byteOffset).getUint32(12, true); // GLB JSON chunk (glTF 2.0, 4.4)
      return JSON.parse(new TextDecoder().decode(glb.subarray(20, 20 + len))).meshes.map((m: { name: string }) => m.name);
    };
    expect(await names((await encode(surfaces, on, {}, 'test', nodal)).glb)).toEqual(['phase +', 'phase \u2212', 'nodal']);
    expect(await names((await encode(surfaces, on, {}, 'test')).glb)).toEqual(['phase +', 'phase \u2212']);
  });
});

describe('uploaded cubes', () => {
  it('a psi cube read back from NRRD meshes like the computed grid it came from (same level, same triangles)', async () => {
    const r = recipe({ grid: { n: 25 } });
    const computed = (await sampleComputed(r)) as Extract<Field, { kind: 'orbital' }>;
    const extent = Number(autoExtent(stateOf(r)));
    expect(computed.grid.extent).toBe(extent);
    const h = (2 * extent) / 24;
    const data = Buffer.from(computed.re.buffer.slice(0));
    const file = Buffer.concat([nrrdHeaderFor({ sizes: [25, 25, 25], spacing: [h, h, h], origin: [-extent, -extent, -extent] }), data]);
    const source = { kind: 'upload' as const, assetId: '00000000-0000-4000-8000-000000000000', sha256: 'a'.repeat(64), sizes: [25, 25, 25] as [number, number, number], spacing: [h, h, h] as [number, number, number], origin: [-extent, -extent, -extent] as [number, number, number], quantity: 'psi' as const };
    const cube = cubeFromNrrd(file, source);
    const tc = threshold(cube, r.surface);
    const to = threshold(computed, r.surface);
    expect(tc.isovalue).toBe(to.isovalue);
    expect(tc.enclosed).toBe(to.enclosed);
    const sc = extract(cube, tc);
    const so = extract(computed, to);
    for (let i = 0; i < 2; i++) {
      expect(sc[i].phase).toBe(so[i].phase);
      expect(sc[i].mesh.indices.length).toBe(so[i].mesh.indices.length);
      // Same marching-cubes vertices; positions differ only by float rounding of origin + i·h.
      const a = meshStats(sc[i].mesh);
      const b = meshStats(so[i].mesh);
      expect(a.area).toBeCloseTo(b.area, 3);
      expect(a.watertight).toBe(true);
    }
    expect(gridLabel({ ...r, source })).toBe('25x25x25');
    expect(gridLabel(r)).toBe('25');
  });

  it('anisotropic spacing scales positions per axis', () => {
    // A ball of "density" 1 inside radius 1.5 voxels of a 7³ index grid, spacing (1, 2, 3) a0.
    const n = 7;
    const data = new Float32Array(n ** 3);
    for (let z = 0; z < n; z++) for (let y = 0; y < n; y++) for (let x = 0; x < n; x++) data[x + n * (y + n * z)] = Math.hypot(x - 3, y - 3, z - 3) < 1.5 ? 1 : 0;
    const source = { kind: 'upload' as const, assetId: '00000000-0000-4000-8000-000000000000', sha256: 'a'.repeat(64), sizes: [n, n, n] as [number, number, number], spacing: [1, 2, 3] as [number, number, number], origin: [10, 20, 30] as [number, number, number], quantity: 'density' as const };
    const [s] = extract({ kind: 'cube', data, source }, { isovalue: Math.sqrt(0.5), enclosed: 1 });
    const st = meshStats(s.mesh);
    expect(s.phase).toBe('+');
    expect(st.watertight).toBe(true);
    // Level 0.5 lies halfway between samples: extremes at index 3 ± 1.5 on each axis.
    expect(st.bbox!.min).toEqual([10 + 1.5 * 1, 20 + 1.5 * 2, 30 + 1.5 * 3]);
    expect(st.bbox!.max).toEqual([10 + 4.5 * 1, 20 + 4.5 * 2, 30 + 4.5 * 3]);
  });
});

it('phaseWheel gives sRGB components in 0..1 and distinct colours for opposite phases', () => {
  for (let a = -Math.PI; a <= Math.PI; a += 0.1) for (const c of phaseWheel(a)) expect(c >= 0 && c <= 1).toBe(true);
  expect(phaseWheel(0)).not.toEqual(phaseWheel(Math.PI - 1e-9));
});
