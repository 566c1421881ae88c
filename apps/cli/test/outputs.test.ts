import { spawnSync } from 'node:child_process';
import * as fs from 'node:fs';
import * as path from 'node:path';
import { describe, expect, it } from 'vitest';

// Sources are named beside each check. The formulas are standard; the book equation and table numbers
// (Griffiths 2nd ed., Bethe & Salpeter) are cited from memory.
import { parseRecipe, canonicalJson, RECIPE_VERSION } from '@psiform/contracts';
import { psiform, psiformJson, tempDir } from './helpers';

// eslint-disable-next-line @typescript-eslint/no-require-imports
const validator = require('gltf-validator');

type Surface = { phase: string; vertices: number; triangles: number };
const total = (j: { surfaces: Surface[] }, k: 'vertices' | 'triangles') => j.surfaces.reduce((s, x) => s + x[k], 0);

/** NRRD header fields (Teem NRRD file format: "field: value" lines, "key:=value" lines, blank line, data). */
function readNrrd(file: string) {
  const buf = fs.readFileSync(file);
  const end = buf.indexOf('\n\n');
  const lines = buf.subarray(0, end).toString('latin1').split('\n');
  const fields: Record<string, string> = {};
  const kv: Record<string, string> = {};
  for (const l of lines.slice(1)) {
    if (l.startsWith('#')) continue;
    const i = l.indexOf(':=');
    if (i > 0) kv[l.slice(0, i)] = l.slice(i + 2);
    else {
      const j = l.indexOf(': ');
      fields[l.slice(0, j)] = l.slice(j + 2);
    }
  }
  const raw = buf.subarray(end + 2);
  const data = new Float32Array(raw.length / 4);
  const dv = new DataView(raw.buffer, raw.byteOffset, raw.byteLength);
  for (let i = 0; i < data.length; i++) data[i] = dv.getFloat32(4 * i, true);
  return { magic: lines[0], fields, kv, data };
}

describe('mesh --out', () => {
  it('GLB passes the Khronos glTF validator with no errors, one primitive per phase', async () => {
    const dir = tempDir();
    const out = path.join(dir, '2pz.glb');
    const j = psiformJson(['mesh', '--orbital', '2pz', '--grid', '40', '--out', out]);
    expect(j.out.file).toBe(out);
    const bytes = new Uint8Array(fs.readFileSync(out));
    expect(bytes.length).toBe(j.out.bytes);
    // Khronos glTF-Validator (gltf-validator npm package), glTF 2.0 spec §4.4 (GLB container).
    const report = await validator.validateBytes(bytes);
    expect(report.issues.numErrors).toBe(0);
    expect(report.info.totalTriangleCount).toBe(total(j, 'triangles'));
    expect(report.info.totalVertexCount).toBe(total(j, 'vertices'));
    expect(fs.readdirSync(dir)).toEqual(['2pz.glb']); // no temporary file left behind
  });

  it('GLB of a complex state (coloured by arg psi) validates too', async () => {
    const dir = tempDir();
    const out = path.join(dir, 'c.glb');
    psiformJson(['mesh', '--nlm', '3,2,1', '--complex', '--grid', '32', '--out', out]);
    const report = await validator.validateBytes(new Uint8Array(fs.readFileSync(out)));
    expect(report.issues.numErrors).toBe(0);
  });

  it('binary STL holds 84 + 50 bytes per triangle and every triangle of both phases', () => {
    const dir = tempDir();
    const out = path.join(dir, 'a.stl');
    const j = psiformJson(['mesh', '--orbital', '3dxy', '--grid', '32', '--out', out]);
    const b = fs.readFileSync(out);
    const F = total(j, 'triangles');
    expect(b.readUInt32LE(80)).toBe(F); // binary STL layout: 80-byte header, uint32 count (common practice)
    expect(b.length).toBe(84 + 50 * F);
  });

  it('PLY header counts match the mesh', () => {
    const dir = tempDir();
    const out = path.join(dir, 'a.ply');
    const j = psiformJson(['mesh', '--orbital', '2pz', '--grid', '32', '--out', out]);
    const head = fs.readFileSync(out).subarray(0, 2000).toString('latin1');
    expect(head.startsWith('ply\nformat binary_little_endian 1.0\n')).toBe(true);
    expect(Number(/element vertex (\d+)/.exec(head)![1])).toBe(total(j, 'vertices'));
    expect(Number(/element face (\d+)/.exec(head)![1])).toBe(total(j, 'triangles'));
  });

  it('OBJ has one v line per vertex and one f line per triangle, and names the model', () => {
    const dir = tempDir();
    const out = path.join(dir, 'a.obj');
    const j = psiformJson(['mesh', '--orbital', '2pz', '--grid', '32', '--out', out]);
    const lines = fs.readFileSync(out, 'utf8').split('\n');
    expect(lines.filter((l) => l.startsWith('v ')).length).toBe(total(j, 'vertices'));
    expect(lines.filter((l) => l.startsWith('f ')).length).toBe(total(j, 'triangles'));
    expect(lines.slice(0, 3).join('\n')).toMatch(/hydrogen-like/i);
  });
});

describe('sample --out FILE.nrrd', () => {
  it('writes |psi|^2 of 1s on the stated lattice: value at voxels = e^{-2r}/pi, and sum h^3 ≈ 1', () => {
    const dir = tempDir();
    const out = path.join(dir, '1s.nrrd');
    const j = psiformJson(['sample', '--orbital', '1s', '--grid', '33', '--extent', '8', '--out', out]);
    const { magic, fields, kv, data } = readNrrd(out);
    expect(magic).toMatch(/^NRRD000[4-5]$/);
    expect(fields.type).toBe('float');
    expect(fields.dimension).toBe('3');
    expect(fields.sizes).toBe('33 33 33');
    expect(fields.encoding).toBe('raw');
    expect(fields.endian).toBe('little');
    expect(kv['psiform.model']).toMatch(/hydrogen-like/);
    expect(data.length).toBe(33 ** 3);
    // space origin and directions give each voxel's position (NRRD format, "space directions").
    const origin = fields['space origin'].replace(/[()]/g, '').split(',').map(Number);
    const h = Number(/^\(([^,]+),/.exec(fields['space directions'])![1]);
    expect(h).toBeCloseTo(0.5, 12); // 16 a0 across 32 intervals
    expect(origin).toEqual([-8, -8, -8]);
    expect(j.grid.spacing).toBeCloseTo(0.5, 12);
    // psi_100 = e^{-r}/sqrt(pi) (Griffiths 2nd ed. eq. 4.80), so |psi|^2 = e^{-2r}/pi.
    for (const [i, k, l] of [[16, 16, 16], [20, 16, 16], [3, 25, 9], [0, 0, 0], [30, 2, 17]]) {
      const x = origin[0] + i * h, y = origin[1] + k * h, z = origin[2] + l * h;
      const r = Math.hypot(x, y, z);
      const v = data[i + 33 * (k + 33 * l)];
      expect(Math.abs(v - Math.exp(-2 * r) / Math.PI) / (Math.exp(-2 * r) / Math.PI)).toBeLessThan(1e-6);
    }
    expect(j.max_density).toBeCloseTo(1 / Math.PI, 6); // the nucleus is a grid point (odd n)
    // Riemann sum of |psi|^2 over the cube: ≈ 1 - P(r > 8) (tiny); the cusp at r = 0 costs about 1% at h = 0.5.
    let sum = 0;
    for (const v of data) sum += v;
    expect(Math.abs(sum * h ** 3 - 1)).toBeLessThan(0.03);
  });

  it('complex states write |psi|^2 = Re^2 + Im^2 (|Y_11|^2 ∝ sin^2 θ: zero on the z axis)', () => {
    const dir = tempDir();
    const out = path.join(dir, 'c.nrrd');
    psiformJson(['sample', '--nlm', '2,1,1', '--complex', '--grid', '17', '--extent', '8', '--out', out]);
    const { data } = readNrrd(out);
    const at = (i: number, k: number, l: number) => data[i + 17 * (k + 17 * l)];
    expect(at(8, 8, 12)).toBeLessThan(1e-12); // (0, 0, 4 a0): on the axis
    // ψ_211 = -(1/8√π) r e^{-r/2} sin θ e^{iφ} (Griffiths 2nd ed., Tables 4.3 and 4.7): |ψ|² at (4, 0, 0) a0 = 16 e^{-4}/(64 π).
    expect(Math.abs(at(12, 8, 8) - (16 * Math.exp(-4)) / (64 * Math.PI)) / ((16 * Math.exp(-4)) / (64 * Math.PI))).toBeLessThan(1e-5);
  });
});

describe('sample: what the box holds, over all space', () => {
  // Independent reference: SciPy's tplquad of |psi_1s|^2 = e^{-2r}/pi over the cube [-1, 1]^3 (8 octants).
  const scipyCube = (E: number) => {
    const py = `import numpy as np\nfrom scipy import integrate\nf=lambda z,y,x: np.exp(-2*np.sqrt(x*x+y*y+z*z))/np.pi\nv,_=integrate.tplquad(f,0,${E},0,${E},0,${E},epsabs=1e-11)\nprint(8*v)`;
    const r = spawnSync('/usr/bin/python3', ['-c', py], { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`python3-scipy is needed: ${r.stderr}`);
    return Number(r.stdout.trim());
  };

  it('a box narrower than the state: the in-box share (vs SciPy), what lies outside on stderr and in warnings', () => {
    const dir = tempDir();
    const out = path.join(dir, 'narrow.nrrd');
    const r = psiform(['sample', '--orbital', '1s', '--grid', '17', '--extent', '1', '--out', out, '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    const want = scipyCube(1); // 0.4391...
    expect(Math.abs(j.in_box - want)).toBeLessThan(2e-4);
    expect(j.in_box + j.outside_box).toBeCloseTo(1, 12);
    expect(j.units.in_box).toMatch(/probability/);
    expect(j.warnings.map((w: { code: string }) => w.code)).toContain('box-cuts-density');
    expect(r.stderr).toMatch(/psiform: warning: the box \(±1 a0\) holds 43\.9\d% of the probability over all space; 56\.0\d% lies outside/);
    expect(readNrrd(out).kv['psiform.in_box_probability']).toMatch(/^0\.439/);
  });

  it('the automatic box holds >= 99.9 % and says nothing; a grid coarser than the inner shell of 5s is named', () => {
    const dir = tempDir();
    const j = psiformJson(['sample', '--orbital', '2pz', '--grid', '33', '--out', path.join(dir, 'a.nrrd')]);
    expect(j.in_box).toBeGreaterThanOrEqual(0.999);
    expect(j.warnings).toEqual([]);
    const k = psiform(['sample', '--orbital', '5s', '--grid', '17', '--out', path.join(dir, 'b.nrrd'), '--json']);
    const w = JSON.parse(k.stdout).warnings.find((x: { code: string }) => x.code === 'feature-unresolved');
    // 5s radial nodes: roots of L_4^1(2r/5), i.e. SciPy roots_genlaguerre(4, 1) × 5/2; the first bounds the inner shell.
    const py = spawnSync('/usr/bin/python3', ['-c', 'from scipy.special import roots_genlaguerre; print(roots_genlaguerre(4, 1)[0][0] * 2.5)'], { encoding: 'utf8' });
    expect(w.feature.size).toBeCloseTo(Number(py.stdout.trim()), 6);
    expect(k.stderr).toMatch(/innermost radial shell of 5s/);
  });
});

describe('recipe', () => {
  it('prints a complete recipe that parseRecipe accepts unchanged (defaults filled)', () => {
    const r = psiform(['recipe', '--orbital', '3dz2', '--Z', '2', '--grid', '128', '--enclose', '0.85']);
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.stdout);
    expect(doc.version).toBe(RECIPE_VERSION);
    expect(doc.label).toBe('3d_z²'); // prettyLabel: the typeset form figures print
    expect(doc.content.Z).toBe(2);
    expect(doc.content.terms).toEqual([{ n: 3, l: 2, m: 0, basis: 'real', re: 1, im: 0 }]);
    expect(doc.grid).toEqual({ n: 128, extent: 'auto' });
    expect(doc.surface).toEqual({ rule: 'enclosed', fraction: 0.85 });
    for (const k of ['phase', 'palette', 'stage', 'annotations', 'canvas']) expect(doc).toHaveProperty(k);
    const parsed = parseRecipe(doc);
    expect(parsed.ok).toBe(true);
    if (parsed.ok) expect(canonicalJson(parsed.recipe)).toBe(canonicalJson(doc));
  });

  it('--nlm --complex and --iso give a complex-basis term and the psi rule', () => {
    const doc = JSON.parse(psiform(['recipe', '--nlm', '4,3,-2', '--complex', '--iso', '0.002', '--extent', '40']).stdout);
    expect(doc.content.terms).toEqual([{ n: 4, l: 3, m: -2, basis: 'complex', re: 1, im: 0 }]);
    expect(doc.surface).toEqual({ rule: 'psi', value: 0.002 });
    expect(doc.grid).toEqual({ n: 'auto', extent: 40 });
    expect(parseRecipe(doc).ok).toBe(true);
  });

  it('hybrid labels carry several real terms', () => {
    const doc = JSON.parse(psiform(['recipe', '--orbital', 'sp3']).stdout);
    expect(doc.content.terms.length).toBeGreaterThan(1);
    // Normalised hybrid: the squared coefficients sum to 1 (orthonormal real basis).
    const norm = doc.content.terms.reduce((s: number, t: { re: number; im: number }) => s + t.re ** 2 + t.im ** 2, 0);
    expect(norm).toBeCloseTo(1, 12);
  });

  it('--recipe FILE normalises a minimal file; command-line options override it', () => {
    const dir = tempDir();
    const f = path.join(dir, 'min.json');
    fs.writeFileSync(f, JSON.stringify({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 1, basis: 'real', re: 1 }] }, grid: { n: 48 }, surface: { rule: 'enclosed', fraction: 0.9 } }));
    const doc = JSON.parse(psiform(['recipe', '--recipe', f, '--grid', '64', '--Z', '3']).stdout);
    expect(doc.grid).toEqual({ n: 64, extent: 'auto' });
    expect(doc.content.Z).toBe(3);
    expect(doc.content.terms[0].im).toBe(0);
    expect(doc.canvas).toEqual({ widthMm: 89, heightMm: 60, dpi: 300 });
  });
});
