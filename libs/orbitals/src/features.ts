// What a surface {|psi| = c} of a state is made of, and the smallest lengths a grid must resolve to draw it right.
//
// For one (n, l) block psi = R(r) H(Ω). The pipeline extracts the real field f = R(r) h(Ω), |f| = |psi|, where h
// is H for real states, sign(P_l^|m|(cos θ)) |H| for a complex state with one m (|Y_lm| ∝ |P_l^|m||), and |H|
// otherwise. f changes sign at every radial node and (for the first two kinds) at every nodal cone or plane, so
// surfaces of opposite sign can never be merged by a coarse grid; only parts of the SAME sign need grid points
// between them.
// Within radial lobe k (between nodes, one maximum `peak_k` of |R|, radial-lobes.ts) the set {f > c} is
//     {(r, Ω): σ_k h(Ω) > c / peak_k,  r in [a_k(Ω), b_k(Ω)]},   σ_k = sign of R in the lobe,
// so its topology is that of the angular region D = {σ_k h > c/peak_k} on the sphere: a component C of D whose
// boundary is b circles bounds a solid whose surface has Euler characteristic 2 χ(C) = 2 (2 - b) (the surface is
// the graph of a over C glued to the graph of b along ∂C); C = the whole sphere gives a spherical shell (two
// spheres, χ 4) or, when a = 0 (the first lobe of an s state), a ball (χ 2). χ(C) is counted on a pixel grid over
// the sphere (4-neighbour pixels, filled 2×2 squares, pole fans), so the expected topology comes from a 2D count,
// independent of any 3D mesher.
// Lengths (all in a0): a component's radial thickness b - a where it is thickest, its width across (angular
// inradius × radius of the lobe's peak), the hole of a ring (torus) component, and the gap at the nucleus between
// two same-sign parts of the first lobe. States of several (n, l) blocks get no expected topology here; the
// pipeline checks them by refinement instead.

import type { CompiledState } from './compile';
import { assocLegendre } from './harmonics';
import { lobeInterval, radialLobes, type RadialLobe, type RadialLobes } from './radial-lobes';

const { PI, abs, cos, hypot, max, min, round, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export type FeatureKind = 'shell' | 'lobe' | 'ring-hole' | 'nucleus-gap';

export interface SurfaceFeature {
  kind: FeatureKind;
  /** The length a grid must resolve (a0): thickness, width, hole diameter or gap. */
  size: number;
  /** Radial lobe (1 = innermost) the feature belongs to. */
  lobe: number;
  /** Sign of f on the part (for complex states the surfaces of both signs make one |psi| surface). */
  sign: 1 | -1;
  /** Words for warnings: "inner shell 2 (r 1.9 to 6.6 a0), 0.84 a0 thick". */
  description: string;
}

export interface TopologyCount {
  components: number;
  euler: number;
}

export interface SurfaceLayer {
  /** Radial lobe index. */
  lobe: number;
  /** The node radii bounding the lobe (rHi = Infinity for the outermost). */
  rLo: number;
  rHi: number;
  /** Whether the surface has a part in this lobe. */
  present: boolean;
  /** Topology of the parts of each sign in this lobe. */
  plus: TopologyCount;
  minus: TopologyCount;
  /** Smallest feature in this lobe, or null. */
  smallest: SurfaceFeature | null;
}

export interface SurfaceAnalysis {
  /** 'signed': f as above (real states and one-m complex states); 'radial-sign': sign(R)|psi| (complex, several m of one l). */
  field: 'signed' | 'radial-sign';
  n: number;
  l: number;
  radialNodes: number[];
  /** Polar angles (radians) of nodal cones and planes θ = const of an axial state; null when H depends on φ. */
  nodalCones: number[] | null;
  /** The surface winds round the z axis (complex state with m ≠ 0): every part is a ring. */
  ring: boolean;
  layers: SurfaceLayer[];
  features: SurfaceFeature[];
  smallest: SurfaceFeature | null;
  /** Expected counts per extracted phase: '+'/'-' for real states, 'complex' (both signs together) otherwise. */
  topology: Partial<Record<'+' | '-' | 'complex', TopologyCount>>;
}

/** Pixel grid over the sphere: cell centres θ_i = (i + ½)π/Nθ, φ_j = (j + ½)2π/Nφ, plus the two poles. */
interface SphereGrid {
  nT: number;
  nP: number;
  h: Float64Array; // nT * nP, then north pole at nT*nP, south pole at nT*nP + 1
  ux: Float64Array;
  uy: Float64Array;
  uz: Float64Array;
}

/**
 * Pixels per row: 2 nT, or for an axial state (one m in the complex basis: |H| and the sign rule depend on θ only)
 * 8 with every row set to its first pixel's value. Every count below then comes out the same as on 2 nT columns
 * (a row is all in or all out, so components, χ, chamfer distances along θ and the ring-hole angle are those of
 * the finer grid) at a 38th of the pixels: the plan of a 3d_z² surface took longer than sampling it.
 */
function pixelsPerRow(nT: number, axial: boolean): number {
  return axial ? 8 : 2 * nT;
}

function sphereGrid(compiled: CompiledState, field: 'signed' | 'radial-sign', nT: number, axial: boolean): SphereGrid {
  const nP = pixelsPerRow(nT, axial);
  const N = nT * nP + 2;
  const h = new Float64Array(N);
  const ux = new Float64Array(N);
  const uy = new Float64Array(N);
  const uz = new Float64Array(N);
  const cx = compiled.state;
  const single = new Set(cx.terms.map((t) => t.m)).size === 1;
  const m = abs(cx.terms[0].m);
  const l = compiled.blocks[0].l;
  for (let i = 0; i < nT; i++) {
    const th = ((i + 0.5) * PI) / nT;
    const st = Math.sin(th);
    const ct = cos(th);
    for (let j = 0; j < nP; j++) {
      const ph = ((j + 0.5) * 2 * PI) / nP;
      const p = i * nP + j;
      ux[p] = st * cos(ph);
      uy[p] = st * Math.sin(ph);
      uz[p] = ct;
    }
  }
  uz[N - 2] = 1;
  uz[N - 1] = -1;
  const dirs = new Float64Array(3 * N);
  for (let p = 0; p < N; p++) {
    dirs[3 * p] = ux[p];
    dirs[3 * p + 1] = uy[p];
    dirs[3 * p + 2] = uz[p];
  }
  const im = new Float64Array(N);
  compiled.angularInto(0, dirs, h, im);
  for (let p = 0; p < N; p++) {
    if (compiled.isReal) continue;
    const mod = hypot(h[p], im[p]);
    h[p] = field === 'signed' && single ? Math.sign(assocLegendre(l, m, uz[p])) * mod || 0 : mod;
  }
  // Axial: rows exactly uniform (no rounding differences along φ).
  if (axial) for (let i = 0; i < nT; i++) for (let j = 1; j < nP; j++) h[i * nP + j] = h[i * nP];
  return { nT, nP, h, ux, uy, uz };
}

interface Component {
  pixels: number[];
  /** Euler characteristic of the region on the sphere. */
  chi: number;
  hMax: number;
  /** Angular inradius (radians). */
  inradius: number;
}

/** Components of {sign * h > level} on the sphere with their Euler characteristics (typed arrays, no maps). */
function components(g: SphereGrid, sign: number, level: number, dist: Float64Array | null): Component[] {
  const { nT, nP, h } = g;
  const N = nT * nP;
  const north = N;
  const south = N + 1;
  const T = N + 2;
  const inSet = new Uint8Array(T);
  let any = false;
  for (let p = 0; p < T; p++) {
    if (sign * h[p] > level) {
      inSet[p] = 1;
      any = true;
    }
  }
  if (!any) return [];
  const parent = new Int32Array(T);
  for (let p = 0; p < T; p++) parent[p] = inSet[p] ? p : -1;
  const find = (x: number): number => {
    let r = x;
    while (parent[r] !== r) r = parent[r];
    while (parent[x] !== r) {
      const nx = parent[x];
      parent[x] = r;
      x = nx;
    }
    return r;
  };
  const union = (a: number, b: number) => {
    const ra = find(a);
    const rb = find(b);
    if (ra !== rb) parent[rb] = ra;
  };
  for (let i = 0; i < nT; i++) {
    const row = i * nP;
    for (let j = 0; j < nP; j++) {
      const p = row + j;
      if (!inSet[p]) continue;
      const q = row + (j + 1 === nP ? 0 : j + 1);
      if (inSet[q]) union(p, q);
      if (i + 1 < nT && inSet[p + nP]) union(p, p + nP);
    }
  }
  for (let j = 0; j < nP; j++) {
    if (inSet[north] && inSet[j]) union(north, j);
    const s = (nT - 1) * nP + j;
    if (inSet[south] && inSet[s]) union(south, s);
  }
  // Component index per root, then V - E + F per component on the pixel complex.
  const index = new Int32Array(T).fill(-1);
  let C = 0;
  const comp = new Int32Array(T).fill(-1);
  for (let p = 0; p < T; p++) {
    if (!inSet[p]) continue;
    const r = find(p);
    if (index[r] < 0) index[r] = C++;
    comp[p] = index[r];
  }
  const chi = new Float64Array(C);
  const hMax = new Float64Array(C);
  const count = new Int32Array(C);
  const inr = new Float64Array(C);
  for (let p = 0; p < T; p++) {
    const k = comp[p];
    if (k < 0) continue;
    chi[k] += 1;
    count[k]++;
    const a = abs(h[p]);
    if (a > hMax[k]) hMax[k] = a;
    if (dist && p < N && dist[p] > inr[k]) inr[k] = dist[p];
  }
  for (let i = 0; i < nT; i++) {
    const row = i * nP;
    for (let j = 0; j < nP; j++) {
      const p = row + j;
      const k = comp[p];
      if (k < 0) continue;
      const q = row + (j + 1 === nP ? 0 : j + 1);
      if (inSet[q]) chi[k] -= 1;
      if (i + 1 < nT) {
        const d = p + nP;
        if (inSet[d]) chi[k] -= 1;
        if (inSet[q] && inSet[d] && inSet[d - j + (j + 1 === nP ? 0 : j + 1)]) chi[k] += 1;
      }
    }
  }
  for (let j = 0; j < nP; j++) {
    const jn = j + 1 === nP ? 0 : j + 1;
    if (inSet[north] && inSet[j]) chi[comp[north]] -= 1;
    if (inSet[north] && inSet[j] && inSet[jn]) chi[comp[north]] += 1;
    const s = (nT - 1) * nP + j;
    const sn = (nT - 1) * nP + jn;
    if (inSet[south] && inSet[s]) chi[comp[south]] -= 1;
    if (inSet[south] && inSet[s] && inSet[sn]) chi[comp[south]] += 1;
  }
  const pixels: number[][] = Array.from({ length: C }, () => []);
  for (let p = 0; p < T; p++) if (comp[p] >= 0) pixels[comp[p]].push(p);
  const out: Component[] = [];
  for (let k = 0; k < C; k++) out.push({ pixels: pixels[k], chi: chi[k], hMax: hMax[k], inradius: dist ? inr[k] : 0 });
  return out;
}

/**
 * Angular distance from each pixel to the nearest source pixel (0 at sources): a chamfer transform on the (θ, φ)
 * pixel grid with steps Δθ and sin θ Δφ, φ periodic, the rows next to a pole joined through it; three
 * forward/backward sweeps. No source at all gives Infinity everywhere. Approximate (a few per cent), which is all a
 * feature width needs.
 */
function chamfer(g: SphereGrid, isSource: (p: number) => boolean): Float64Array {
  const { nT, nP } = g;
  const N = nT * nP;
  const dist = new Float64Array(N);
  let any = false;
  for (let p = 0; p < N; p++) {
    if (isSource(p)) any = true;
    else dist[p] = Infinity;
  }
  if (!any) return dist;
  const dT = PI / nT;
  const dP = new Float64Array(nT);
  for (let i = 0; i < nT; i++) dP[i] = Math.sin(((i + 0.5) * PI) / nT) * ((2 * PI) / nP);
  for (let pass = 0; pass < 3; pass++) {
    for (let i = 0; i < nT; i++) {
      const row = i * nP;
      for (let j = 0; j < nP; j++) {
        const p = row + j;
        let d = dist[p];
        if (d === 0) continue;
        if (i > 0 && dist[p - nP] + dT < d) d = dist[p - nP] + dT;
        const left = j > 0 ? p - 1 : row + nP - 1;
        if (dist[left] + dP[i] < d) d = dist[left] + dP[i];
        dist[p] = d;
      }
    }
    for (let i = nT - 1; i >= 0; i--) {
      const row = i * nP;
      for (let j = nP - 1; j >= 0; j--) {
        const p = row + j;
        let d = dist[p];
        if (d === 0) continue;
        if (i + 1 < nT && dist[p + nP] + dT < d) d = dist[p + nP] + dT;
        const right = j + 1 < nP ? p + 1 : row;
        if (dist[right] + dP[i] < d) d = dist[right] + dP[i];
        dist[p] = d;
      }
    }
    for (const row of [0, (nT - 1) * nP]) {
      let m = Infinity;
      for (let j = 0; j < nP; j++) m = min(m, dist[row + j]);
      for (let j = 0; j < nP; j++) dist[row + j] = min(dist[row + j], m + dT);
    }
  }
  return dist;
}

/** Distance from each pixel of {sign h > level} to the nearest pixel outside it. */
function distanceToOutside(g: SphereGrid, sign: number, level: number): Float64Array {
  return chamfer(g, (p) => !(sign * g.h[p] > level));
}

function fmt(x: number): string {
  return x >= 100 ? x.toFixed(0) : x >= 10 ? x.toFixed(1) : x >= 1 ? x.toFixed(2) : x.toPrecision(2);
}

function lobeWords(lobe: RadialLobe, K: number): string {
  const range = `r ${fmt(lobe.rLo)} to ${lobe.index === K ? '∞' : fmt(lobe.rHi)} a0`;
  if (K === 1) return `the surface (${range})`;
  if (lobe.index === K) return `the outer lobe (${range})`;
  return `inner radial lobe ${lobe.index} of ${K} (${range})`;
}

const cache = new Map<string, SurfaceAnalysis>();
const grids = new Map<string, SphereGrid>();

/**
 * Analysis of the surface |psi| = sqrt(t) for a one-block compiled state (null for states of several (n, l)
 * blocks). t is the |psi|² level (a0⁻³).
 */
export function analyseSurface(compiled: CompiledState, t: number): SurfaceAnalysis | null {
  if (compiled.blocks.length !== 1) return null;
  if (!(t > 0) || !Number.isFinite(t)) throw new RangeError(`density level must be a positive number, got ${String(t)}`);
  const key = `${JSON.stringify(compiled.state)}@${t}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const { n, l } = compiled.blocks[0];
  const lobes: RadialLobes = radialLobes(n, l, compiled.state.Z);
  const ms = new Set(compiled.state.terms.map((x) => x.m));
  const oneM = ms.size === 1;
  const field: 'signed' | 'radial-sign' = compiled.isReal || oneM ? 'signed' : 'radial-sign';
  // s states are the same in every direction: a coarse sphere grid is exact for them.
  const nT = l === 0 ? 8 : 2 * round(60 + 8 * l);
  const gKey = `${JSON.stringify(compiled.state)}|${field}|${nT}|${oneM}`;
  let g = grids.get(gKey);
  if (!g) {
    g = sphereGrid(compiled, field, nT, oneM);
    if (grids.size >= 8) grids.delete(grids.keys().next().value as string);
    grids.set(gKey, g);
  }
  const c = sqrt(t);
  const K = lobes.lobes.length;
  const layers: SurfaceLayer[] = [];
  const features: SurfaceFeature[] = [];
  const topo = { plus: { components: 0, euler: 0 }, minus: { components: 0, euler: 0 } };
  for (const lobe of lobes.lobes) {
    const level = c / lobe.peak;
    const layer: SurfaceLayer = {
      lobe: lobe.index,
      rLo: lobe.rLo,
      rHi: lobe.index === K ? Infinity : lobe.rHi,
      present: false,
      plus: { components: 0, euler: 0 },
      minus: { components: 0, euler: 0 },
      smallest: null,
    };
    const lobeFeatures: SurfaceFeature[] = [];
    const where = lobeWords(lobe, K);
    let aMin = Infinity;
    for (const fs of [1, -1] as const) {
      // f = R h > c with R = σ|R|: in this lobe sign(f) = σ sign(h).
      const comps = components(g, fs * lobe.sign, level, distanceToOutside(g, fs * lobe.sign, level));
      const count = fs === 1 ? layer.plus : layer.minus;
      for (const comp of comps) {
        layer.present = true;
        const s = (c / comp.hMax) ** 2;
        const iv = lobeInterval(lobe, s);
        if (!iv) continue;
        aMin = min(aMin, iv.a);
        const whole = comp.chi === 2;
        if (whole) {
          const ball = iv.a === 0;
          count.components += ball ? 1 : 2;
          count.euler += ball ? 2 : 4;
        } else {
          count.components += 1;
          count.euler += 2 * comp.chi;
        }
        const thick = iv.a === 0 ? 2 * iv.b : iv.b - iv.a;
        const width = whole ? Infinity : 2 * comp.inradius * lobe.rPeak;
        if (thick <= width) {
          lobeFeatures.push({ kind: 'shell', size: thick, lobe: lobe.index, sign: fs, description: `${where}, ${fmt(thick)} a0 thick` });
        } else {
          lobeFeatures.push({ kind: 'lobe', size: width, lobe: lobe.index, sign: fs, description: `a lobe of ${where}, ${fmt(width)} a0 wide` });
        }
        if (comp.chi === 0) {
          const hole = ringHole(g, comp, lobe, c);
          lobeFeatures.push({ kind: 'ring-hole', size: hole, lobe: lobe.index, sign: fs, description: `the hole of a ring in ${where}, ${fmt(hole)} a0 across` });
        }
      }
      if (lobe.index === 1 && l > 0 && comps.length >= 2 && Number.isFinite(aMin)) {
        lobeFeatures.push({
          kind: 'nucleus-gap',
          size: 2 * aMin,
          lobe: 1,
          sign: fs,
          description: `the gap at the nucleus between same-sign lobes, ${fmt(2 * aMin)} a0 across`,
        });
      }
    }
    topo.plus.components += layer.plus.components;
    topo.plus.euler += layer.plus.euler;
    topo.minus.components += layer.minus.components;
    topo.minus.euler += layer.minus.euler;
    for (const f of lobeFeatures) if (!layer.smallest || f.size < layer.smallest.size) layer.smallest = f;
    features.push(...lobeFeatures);
    layers.push(layer);
  }
  let smallest: SurfaceFeature | null = null;
  for (const f of features) if (!smallest || f.size < smallest.size) smallest = f;
  const topology: SurfaceAnalysis['topology'] = compiled.isReal
    ? { '+': topo.plus, '-': topo.minus }
    : { complex: { components: topo.plus.components + topo.minus.components, euler: topo.plus.euler + topo.minus.euler } };
  const axial = oneM;
  const out: SurfaceAnalysis = {
    field,
    n,
    l,
    radialNodes: lobes.nodes,
    nodalCones: axial ? nodalCones(l, abs(compiled.state.terms[0].m)) : null,
    ring: !compiled.isReal && oneM && compiled.state.terms[0].m !== 0,
    layers,
    features,
    smallest,
    topology,
  };
  if (cache.size > 64) cache.clear();
  cache.set(key, out);
  return out;
}

/** Zeros of P_l^m(cos θ) in (0, π): the nodal cones (θ = π/2 is the xy plane). */
function nodalCones(l: number, m: number): number[] {
  const out: number[] = [];
  const S = 4000;
  let prev = assocLegendre(l, m, cos(1e-9));
  for (let i = 1; i <= S; i++) {
    const th = (i * PI) / S;
    const v = assocLegendre(l, m, cos(min(th, PI - 1e-9)));
    if (prev !== 0 && v !== 0 && prev < 0 !== v < 0) {
      let a = ((i - 1) * PI) / S;
      let b = th;
      let fa = prev;
      for (let k = 0; k < 80; k++) {
        const mid = 0.5 * (a + b);
        const fm = assocLegendre(l, m, cos(mid));
        if (fm < 0 === fa < 0) {
          a = mid;
          fa = fm;
        } else b = mid;
      }
      out.push(0.5 * (a + b));
    }
    prev = v;
  }
  return out;
}

/**
 * Diameter of the hole of a ring component: 2 min over its pixels of a(Ω) sin ∠(Ω, axis), the axis through the
 * pixel farthest from the component (the middle of the cap it winds round; by the chamfer distance).
 */
function ringHole(g: SphereGrid, comp: Component, lobe: RadialLobe, c: number): number {
  const N = g.nT * g.nP;
  const inComp = new Uint8Array(N + 2);
  for (const p of comp.pixels) inComp[p] = 1;
  const d = chamfer(g, (p) => inComp[p] === 1);
  let axis = 0;
  for (let p = 1; p < N; p++) if (d[p] > d[axis]) axis = p;
  const ax = [g.ux[axis], g.uy[axis], g.uz[axis]];
  let best = Infinity;
  for (const p of comp.pixels) {
    if (p >= N) continue;
    const iv = lobeInterval(lobe, (c / abs(g.h[p])) ** 2);
    if (!iv) continue;
    const dot = g.ux[p] * ax[0] + g.uy[p] * ax[1] + g.uz[p] * ax[2];
    const sin = sqrt(max(0, 1 - dot * dot));
    best = min(best, iv.a * sin);
  }
  return 2 * best;
}
