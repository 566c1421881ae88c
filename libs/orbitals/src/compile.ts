import { expNonPositive } from './fast-exp';
import { GridSpec, assertGridSpec } from './grid';
import { Complex, Monomial, solidHarmonic } from './harmonics';
import { radialConstants } from './radial';
import { OrbitalState, isRealState, normaliseState, toComplexBasis } from './state';

const { abs, exp, max, sqrt } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/**
 * A state prepared for fast evaluation. Coordinates in Bohr, nucleus at the origin.
 * sampleGrid writes psi on a cube grid: points -extent..+extent inclusive, spacing 2*extent/(n-1),
 * index = x + n*(y + n*z) (x fastest). Output arrays may hold the whole grid (length n³; only planes
 * zStart <= z < zEnd are written) or just the slab (length n²*(zEnd-zStart), plane zStart at offset 0).
 * Real states write psi into outRe (outIm, if given, is zero-filled); complex states need outIm.
 */
export interface CompiledState {
  readonly isReal: boolean;
  readonly state: OrbitalState;
  evaluate(x: number, y: number, z: number): Complex;
  /**
   * out[0..2] = d Re psi/dx,dy,dz; out[3..5] = d Im psi/dx,dy,dz. At r = 0 the radial cusp term is taken as 0.
   * When out holds 8 values, out[6], out[7] = Re psi, Im psi at the same point (one pass for value and slope).
   */
  gradient(x: number, y: number, z: number, out: Float64Array): void;
  sampleGrid(grid: GridSpec, outRe: Float32Array, outIm: Float32Array | null, zStart?: number, zEnd?: number): void;
  /**
   * psi on a block of a lattice: points (ox + (i0 + ix) h, oy + (j0 + iy) h, oz + (k0 + iz) h), ix < nx, iy < ny,
   * iz < nz, index ix + nx (iy + ny iz), into caller-owned arrays (the coarse-to-fine sampler's kernel). The
   * coordinates are computed exactly as sampleGrid computes them, so a block of a cube grid gets bit-identical values.
   */
  sampleBox(box: BoxSpec, outRe: Float32Array, outIm: Float32Array | null): void;
  /** The solid-harmonic polynomial H_b of each block (monomials c x^a y^b z^c), for bounds over boxes. */
  readonly polynomials: ReadonlyArray<ReadonlyArray<Readonly<Monomial>>>;
  /** The (n, l) blocks of the complex-basis expansion, sorted by n then l: psi = sum_b R_{n_b l_b}(r) H_b(unit vector). */
  readonly blocks: ReadonlyArray<{ readonly n: number; readonly l: number }>;
  /** R_{n_b l_b}(r) of block b (Condon–Shortley state, R > 0 near the nucleus). */
  radial(b: number, r: number): number;
  /** Angular part of block b at a unit vector: H_b = sum_m c_{n_b l_b m} Y_{l_b m}. */
  angular(b: number, ux: number, uy: number, uz: number): Complex;
  /** The same for many unit vectors (x, y, z per direction) into caller-owned arrays (no allocation per point). */
  angularInto(b: number, dirs: Float64Array, outRe: Float64Array, outIm: Float64Array | null): void;
  /**
   * psi along rays (the spherical quadrature's kernel): out[i * M + j] = psi(radii[j] * dirs[i]), M = radii.length,
   * dirs = unit vectors (x, y, z per direction). psi(r u) = sum_b R_b(r) H_b(u), so the cost is one radial table and
   * one angular table per block plus a B-term sum per sample. outIm may be null for real states.
   */
  sampleRays(dirs: Float64Array, radii: Float64Array, outRe: Float64Array, outIm: Float64Array | null): void;
}

/** A block of the lattice origin + index × spacing (see CompiledState.sampleBox). */
export interface BoxSpec {
  origin: readonly [number, number, number];
  spacing: number;
  start: readonly [number, number, number];
  size: readonly [number, number, number];
}

/**
 * Cartesian form used here (per block of equal n, l in the complex basis):
 *   sum_m c_nlm R_nl(r) Y_lm = [R_nl(r)/r^l] * H_nl(x,y,z),   H_nl = sum_m c_nlm r^l Y_lm (homogeneous, degree l),
 *   R_nl(r)/r^l = scale * e^{-kappa r} * L_k^alpha(rhoFactor r).
 * So a voxel costs one sqrt, one exp per distinct n, a short Laguerre recurrence and a Horner pass in x
 * over row coefficients C_a(y,z) that are computed once per grid row. No trigonometry.
 * Written by hand (rather than a general expression library) because this loop is the sampling hot path.
 */
export function compileState(state: OrbitalState): CompiledState {
  // The one normalisation rule: coefficients are relative weights; the engine scales them once, here, so that
  // sum |c|² = 1 over the orthonormal complex-basis expansion (every sampler, level and density downstream sees a
  // normalised psi). A state whose coefficients cancel to zero is refused.
  const cx = normaliseState(toComplexBasis(state));
  const real = isRealState(cx);

  // ---- blocks (n, l), sorted by n so blocks sharing an exponential are adjacent
  const blockKeys: Array<{ n: number; l: number }> = [];
  for (const t of cx.terms) if (!blockKeys.some((b) => b.n === t.n && b.l === t.l)) blockKeys.push({ n: t.n, l: t.l });
  blockKeys.sort((p, q) => p.n - q.n || p.l - q.l);
  const B = blockKeys.length;
  let Lmax = 0;
  for (const b of blockKeys) Lmax = max(Lmax, b.l);
  const S = Lmax + 1; // stride of per-block row coefficient storage

  const bL = new Int32Array(B);
  const bK = new Int32Array(B);
  const bAlpha = new Float64Array(B);
  const bScale = new Float64Array(B);
  const bRhoF = new Float64Array(B);
  const bKappa = new Float64Array(B);
  const bNewExp = new Uint8Array(B); // 1 if this block starts a new n (needs its own exp)
  const lagStart = new Int32Array(B + 1);
  const monoStart = new Int32Array(B + 1);

  const monos: Monomial[][] = [];
  let lagTotal = 0;
  for (let i = 0; i < B; i++) {
    const { n, l } = blockKeys[i];
    const rc = radialConstants(n, l, cx.Z);
    bL[i] = l;
    bK[i] = rc.k;
    bAlpha[i] = rc.alpha;
    bScale[i] = rc.scale;
    bRhoF[i] = rc.rhoFactor;
    bKappa[i] = rc.kappa;
    bNewExp[i] = i === 0 || blockKeys[i - 1].n !== n ? 1 : 0;
    lagStart[i] = lagTotal;
    lagTotal += max(rc.k - 1, 0);
    // H = sum_m c_m r^l Y_lm
    const acc = new Map<number, Monomial>();
    for (const t of cx.terms) {
      if (t.n !== n || t.l !== l) continue;
      for (const mo of solidHarmonic(l, t.m)) {
        const k = (mo.a << 10) | (mo.b << 5) | mo.c;
        const re = t.re * mo.re - t.im * mo.im;
        const im = t.re * mo.im + t.im * mo.re;
        const prev = acc.get(k);
        if (prev) {
          prev.re += re;
          prev.im += im;
        } else acc.set(k, { a: mo.a, b: mo.b, c: mo.c, re, im });
      }
    }
    let list = [...acc.values()];
    let maxAbs = 0;
    for (const mo of list) maxAbs = max(maxAbs, abs(mo.re), abs(mo.im));
    // Drop round-off residue of cancelled monomials; for real states the imaginary parts cancel exactly in theory.
    list = list
      .map((mo) => ({ ...mo, re: abs(mo.re) > 1e-14 * maxAbs ? mo.re : 0, im: real || abs(mo.im) <= 1e-14 * maxAbs ? 0 : mo.im }))
      .filter((mo) => mo.re !== 0 || mo.im !== 0);
    monos.push(list);
  }
  lagStart[B] = lagTotal;

  // Laguerre recurrence L_{j+1} = (A_j - Bc_j rho) L_j - C_j L_{j-1}, j = 1..k-1 (DLMF 18.9.13)
  const lagA = new Float64Array(max(lagTotal, 1));
  const lagB = new Float64Array(max(lagTotal, 1));
  const lagC = new Float64Array(max(lagTotal, 1));
  for (let i = 0; i < B; i++) {
    const alpha = bAlpha[i];
    for (let j = 1; j < bK[i]; j++) {
      const o = lagStart[i] + j - 1;
      lagA[o] = (2 * j + 1 + alpha) / (j + 1);
      lagB[o] = 1 / (j + 1);
      lagC[o] = (j + alpha) / (j + 1);
    }
  }

  let monoTotal = 0;
  for (let i = 0; i < B; i++) {
    monoStart[i] = monoTotal;
    monoTotal += monos[i].length;
  }
  monoStart[B] = monoTotal;
  const mA = new Int32Array(monoTotal);
  const mB = new Int32Array(monoTotal);
  const mC = new Int32Array(monoTotal);
  const mRe = new Float64Array(monoTotal);
  const mIm = new Float64Array(monoTotal);
  for (let i = 0, o = 0; i < B; i++) {
    for (const mo of monos[i]) {
      mA[o] = mo.a;
      mB[o] = mo.b;
      mC[o] = mo.c;
      mRe[o] = mo.re;
      mIm[o] = mo.im;
      o++;
    }
  }

  /** L_k^alpha(rho) for block i by the precomputed recurrence. */
  const laguerre = (i: number, rho: number): number => {
    const k = bK[i];
    if (k === 0) return 1;
    let prev = 1;
    let cur = 1 + bAlpha[i] - rho;
    const o = lagStart[i] - 1;
    for (let j = 1; j < k; j++) {
      const next = (lagA[o + j] - lagB[o + j] * rho) * cur - lagC[o + j] * prev;
      prev = cur;
      cur = next;
    }
    return cur;
  };

  const xp = new Float64Array(S + 1);
  const yp = new Float64Array(S + 1);
  const zp = new Float64Array(S + 1);
  const powers = (x: number, y: number, z: number) => {
    xp[0] = yp[0] = zp[0] = 1;
    for (let p = 1; p <= S; p++) {
      xp[p] = xp[p - 1] * x;
      yp[p] = yp[p - 1] * y;
      zp[p] = zp[p - 1] * z;
    }
  };

  // H_b at the point whose powers were last set by powers(): one Horner-free monomial sum, shared by evaluate and
  // the angular kernels (results in polyRe / polyIm, no allocation).
  let polyRe = 0;
  let polyIm = 0;
  const blockPoly = (b: number): void => {
    let re = 0;
    let im = 0;
    for (let o = monoStart[b]; o < monoStart[b + 1]; o++) {
      const v = xp[mA[o]] * yp[mB[o]] * zp[mC[o]];
      re += mRe[o] * v;
      im += mIm[o] * v;
    }
    polyRe = re;
    polyIm = im;
  };

  const evaluate = (x: number, y: number, z: number): Complex => {
    powers(x, y, z);
    const r = sqrt(x * x + y * y + z * z);
    let re = 0;
    let im = 0;
    let e = 0;
    for (let i = 0; i < B; i++) {
      if (bNewExp[i]) e = exp(-bKappa[i] * r);
      const rad = bScale[i] * e * laguerre(i, bRhoF[i] * r);
      blockPoly(i);
      re += rad * polyRe;
      im += rad * polyIm;
    }
    return { re, im: real ? 0 : im };
  };

  const gradient = (x: number, y: number, z: number, out: Float64Array): void => {
    powers(x, y, z);
    const r = sqrt(x * x + y * y + z * z);
    const ux = r > 0 ? x / r : 0;
    const uy = r > 0 ? y / r : 0;
    const uz = r > 0 ? z / r : 0;
    out.fill(0, 0, 6);
    let vr = 0;
    let vi = 0;
    let e = 0;
    for (let i = 0; i < B; i++) {
      if (bNewExp[i]) e = exp(-bKappa[i] * r);
      const rho = bRhoF[i] * r;
      const L = laguerre(i, rho);
      // d/dr [scale e^{-kappa r} L(rhoF r)] with L' = -L_{k-1}^{alpha+1} (DLMF 18.9.23)
      let dL = 0;
      const k = bK[i];
      if (k > 0) {
        const a1 = bAlpha[i] + 1;
        let prev = 1;
        let cur = 1;
        if (k - 1 >= 1) cur = 1 + a1 - rho;
        for (let j = 1; j < k - 1; j++) {
          const next = ((2 * j + 1 + a1 - rho) * cur - (j + a1) * prev) / (j + 1);
          prev = cur;
          cur = next;
        }
        dL = -cur;
      }
      const rad = bScale[i] * e * L;
      const drad = bScale[i] * e * (-bKappa[i] * L + bRhoF[i] * dL);
      let hr = 0, hi = 0, hxr = 0, hxi = 0, hyr = 0, hyi = 0, hzr = 0, hzi = 0;
      for (let o = monoStart[i]; o < monoStart[i + 1]; o++) {
        const a = mA[o], b = mB[o], c = mC[o];
        const cr = mRe[o], ci = mIm[o];
        const v = xp[a] * yp[b] * zp[c];
        hr += cr * v;
        hi += ci * v;
        if (a > 0) {
          const d = a * xp[a - 1] * yp[b] * zp[c];
          hxr += cr * d;
          hxi += ci * d;
        }
        if (b > 0) {
          const d = b * xp[a] * yp[b - 1] * zp[c];
          hyr += cr * d;
          hyi += ci * d;
        }
        if (c > 0) {
          const d = c * xp[a] * yp[b] * zp[c - 1];
          hzr += cr * d;
          hzi += ci * d;
        }
      }
      out[0] += drad * ux * hr + rad * hxr;
      out[1] += drad * uy * hr + rad * hyr;
      out[2] += drad * uz * hr + rad * hzr;
      out[3] += drad * ux * hi + rad * hxi;
      out[4] += drad * uy * hi + rad * hyi;
      out[5] += drad * uz * hi + rad * hzi;
      vr += rad * hr;
      vi += rad * hi;
    }
    if (real) out[3] = out[4] = out[5] = 0;
    if (out.length >= 8) {
      out[6] = vr;
      out[7] = real ? 0 : vi;
    }
  };

  // row coefficient storage: C_a(y,z) for each block, a = 0..l
  const rowRe = new Float64Array(B * S);
  const rowIm = new Float64Array(B * S);

  const computeRow = (y: number, z: number) => {
    yp[0] = zp[0] = 1;
    for (let p = 1; p <= S; p++) {
      yp[p] = yp[p - 1] * y;
      zp[p] = zp[p - 1] * z;
    }
    rowRe.fill(0);
    rowIm.fill(0);
    for (let i = 0; i < B; i++) {
      const base = i * S;
      for (let o = monoStart[i]; o < monoStart[i + 1]; o++) {
        const v = yp[mB[o]] * zp[mC[o]];
        rowRe[base + mA[o]] += mRe[o] * v;
        rowIm[base + mA[o]] += mIm[o] * v;
      }
    }
  };

  const sampleGrid = (grid: GridSpec, outRe: Float32Array, outIm: Float32Array | null, zStart = 0, zEnd?: number): void => {
    assertGridSpec(grid);
    const n = grid.n;
    const z1 = zEnd ?? n;
    if (!Number.isInteger(zStart) || !Number.isInteger(z1) || zStart < 0 || z1 > n || zStart > z1) {
      throw new RangeError(`sampleGrid: need integers 0 <= zStart <= zEnd <= ${n}, got ${zStart}..${z1}`);
    }
    const plane = n * n;
    const full = plane * n;
    const slab = plane * (z1 - zStart);
    let offset: number;
    if (outRe.length === full) offset = 0;
    else if (outRe.length === slab) offset = zStart * plane;
    else throw new RangeError(`sampleGrid: outRe has length ${outRe.length}; expected ${full} (whole grid) or ${slab} (slab)`);
    if (!real) {
      if (!outIm) throw new RangeError('sampleGrid: this state is complex-valued; pass outIm');
    }
    if (outIm && outIm.length !== outRe.length) throw new RangeError(`sampleGrid: outIm has length ${outIm.length}, expected ${outRe.length}`);
    if (real && outIm) outIm.fill(0, zStart * plane - offset, z1 * plane - offset);
    const E = grid.extent as number;
    const h = (2 * E) / (n - 1);
    run(n, n, 0, 0, -E, -E, -E, h, zStart, z1, offset, outRe, outIm);
  };

  const run = (nx: number, ny: number, sx: number, sy: number, ox: number, oy: number, oz: number, h: number, z0: number, z1: number, offset: number, outRe: Float32Array, outIm: Float32Array | null) => {
    if (real && B === 1) sampleSingleReal(nx, ny, sx, sy, ox, oy, oz, h, z0, z1, offset, outRe);
    else if (real) sampleGeneralReal(nx, ny, sx, sy, ox, oy, oz, h, z0, z1, offset, outRe);
    else sampleGeneral(nx, ny, sx, sy, ox, oy, oz, h, z0, z1, offset, outRe, outIm);
  };

  const sampleBox = (box: BoxSpec, outRe: Float32Array, outIm: Float32Array | null): void => {
    const [ox, oy, oz] = box.origin;
    const [i0, j0, k0] = box.start;
    const [nx, ny, nz] = box.size;
    const h = box.spacing;
    // Plain checks, no arrays: coarse-to-fine sampling calls this once per block (10⁵ times at 512³).
    if (!(Number.isInteger(i0) && i0 >= 0 && Number.isInteger(j0) && j0 >= 0 && Number.isInteger(k0) && k0 >= 0)) throw new RangeError(`sampleBox: start indices must be integers >= 0 (got ${box.start.join(', ')})`);
    if (!(Number.isInteger(nx) && nx >= 1 && Number.isInteger(ny) && ny >= 1 && Number.isInteger(nz) && nz >= 1)) throw new RangeError(`sampleBox: sizes must be integers >= 1 (got ${box.size.join(', ')})`);
    if (!(Number.isFinite(ox) && Number.isFinite(oy) && Number.isFinite(oz) && Number.isFinite(h)) || !(h > 0)) throw new RangeError('sampleBox: origin and spacing must be finite, spacing > 0');
    const N = nx * ny * nz;
    if (outRe.length < N) throw new RangeError(`sampleBox: outRe must hold ${N} values`);
    if (!real && (!outIm || outIm.length < N)) throw new RangeError(`sampleBox: this state is complex-valued; pass outIm of ${N} values`);
    // Planes k0..k0+nz written from offset k0 * plane, so index = ix + nx (iy + ny (iz - k0)).
    run(nx, ny, i0, j0, ox, oy, oz, h, k0, k0 + nz, k0 * nx * ny, outRe, real ? null : outIm);
    if (real && outIm) outIm.fill(0, 0, N);
  };


  // Fast path: one (n, l) block with real coefficients (every real single-orbital label).
  const sampleSingleReal = (nx: number, ny: number, sx: number, sy: number, ox: number, oy: number, oz: number, h: number, z0: number, z1: number, offset: number, out: Float32Array) => {
    const l = bL[0];
    const k = bK[0];
    const scale = bScale[0];
    const kappa = bKappa[0];
    const rhoF = bRhoF[0];
    const alpha1 = 1 + bAlpha[0];
    const lo = lagStart[0] - 1;
    const c = rowRe;
    for (let iz = z0; iz < z1; iz++) {
      const z = oz + iz * h;
      for (let iy = 0; iy < ny; iy++) {
        const y = oy + (iy + sy) * h;
        const s2 = y * y + z * z;
        computeRow(y, z);
        let idx = iy * nx + iz * nx * ny - offset;
        for (let ix = 0; ix < nx; ix++, idx++) {
          const x = ox + (ix + sx) * h;
          const r = sqrt(x * x + s2);
          let L = 1;
          if (k > 0) {
            const rho = rhoF * r;
            let prev = 1;
            L = alpha1 - rho;
            for (let j = 1; j < k; j++) {
              const next = (lagA[lo + j] - lagB[lo + j] * rho) * L - lagC[lo + j] * prev;
              prev = L;
              L = next;
            }
          }
          let p = c[l];
          for (let a = l - 1; a >= 0; a--) p = p * x + c[a];
          out[idx] = scale * expNonPositive(-kappa * r) * L * p;
        }
      }
    }
  };

  const sampleGeneral = (nx: number, ny: number, sx: number, sy: number, ox: number, oy: number, oz: number, h: number, z0: number, z1: number, offset: number, outRe: Float32Array, outIm: Float32Array | null) => {
    for (let iz = z0; iz < z1; iz++) {
      const z = oz + iz * h;
      for (let iy = 0; iy < ny; iy++) {
        const y = oy + (iy + sy) * h;
        const s2 = y * y + z * z;
        computeRow(y, z);
        let idx = iy * nx + iz * nx * ny - offset;
        for (let ix = 0; ix < nx; ix++, idx++) {
          const x = ox + (ix + sx) * h;
          const r = sqrt(x * x + s2);
          let accRe = 0;
          let accIm = 0;
          let e = 0;
          for (let i = 0; i < B; i++) {
            if (bNewExp[i] === 1) e = expNonPositive(-bKappa[i] * r);
            const k = bK[i];
            let L = 1;
            if (k > 0) {
              const rho = bRhoF[i] * r;
              let prev = 1;
              L = 1 + bAlpha[i] - rho;
              const lo = lagStart[i] - 1;
              for (let j = 1; j < k; j++) {
                const next = (lagA[lo + j] - lagB[lo + j] * rho) * L - lagC[lo + j] * prev;
                prev = L;
                L = next;
              }
            }
            const rad = bScale[i] * e * L;
            const base = i * S;
            const l = bL[i];
            let pr = rowRe[base + l];
            let pi = rowIm[base + l];
            for (let a = l - 1; a >= 0; a--) {
              pr = pr * x + rowRe[base + a];
              pi = pi * x + rowIm[base + a];
            }
            accRe += rad * pr;
            accIm += rad * pi;
          }
          outRe[idx] = accRe;
          if (outIm) outIm[idx] = accIm;
        }
      }
    }
  };

  // Real superpositions (hybrids, real combinations): same loop without the imaginary Horner pass.
  const sampleGeneralReal = (nx: number, ny: number, sx: number, sy: number, ox: number, oy: number, oz: number, h: number, z0: number, z1: number, offset: number, outRe: Float32Array) => {
    for (let iz = z0; iz < z1; iz++) {
      const z = oz + iz * h;
      for (let iy = 0; iy < ny; iy++) {
        const y = oy + (iy + sy) * h;
        const s2 = y * y + z * z;
        computeRow(y, z);
        let idx = iy * nx + iz * nx * ny - offset;
        for (let ix = 0; ix < nx; ix++, idx++) {
          const x = ox + (ix + sx) * h;
          const r = sqrt(x * x + s2);
          let accRe = 0;
          let e = 0;
          for (let i = 0; i < B; i++) {
            if (bNewExp[i] === 1) e = expNonPositive(-bKappa[i] * r);
            const k = bK[i];
            let L = 1;
            if (k > 0) {
              const rho = bRhoF[i] * r;
              let prev = 1;
              L = 1 + bAlpha[i] - rho;
              const lo = lagStart[i] - 1;
              for (let j = 1; j < k; j++) {
                const next = (lagA[lo + j] - lagB[lo + j] * rho) * L - lagC[lo + j] * prev;
                prev = L;
                L = next;
              }
            }
            const rad = bScale[i] * e * L;
            const base = i * S;
            const l = bL[i];
            let pr = rowRe[base + l];
            for (let a = l - 1; a >= 0; a--) {
              pr = pr * x + rowRe[base + a];
            }
            accRe += rad * pr;
          }
          outRe[idx] = accRe;
        }
      }
    }
  };

  const checkBlock = (b: number) => {
    if (!Number.isInteger(b) || b < 0 || b >= B) throw new RangeError(`block index must be 0..${B - 1}, got ${String(b)}`);
  };
  const radial = (b: number, r: number): number => {
    checkBlock(b);
    let rl = 1;
    for (let p = 0; p < bL[b]; p++) rl *= r;
    return bScale[b] * exp(-bKappa[b] * r) * laguerre(b, bRhoF[b] * r) * rl;
  };
  const angular = (b: number, ux: number, uy: number, uz: number): Complex => {
    checkBlock(b);
    powers(ux, uy, uz);
    blockPoly(b);
    return { re: polyRe, im: real ? 0 : polyIm };
  };
  const angularInto = (b: number, dirs: Float64Array, outRe: Float64Array, outIm: Float64Array | null): void => {
    checkBlock(b);
    const D = dirs.length / 3;
    if (outRe.length < D || (outIm && outIm.length < D)) throw new RangeError(`angularInto: output arrays must hold ${D} values`);
    for (let i = 0; i < D; i++) {
      powers(dirs[3 * i], dirs[3 * i + 1], dirs[3 * i + 2]);
      blockPoly(b);
      outRe[i] = polyRe;
      if (outIm) outIm[i] = real ? 0 : polyIm;
    }
  };
  const sampleRays = (dirs: Float64Array, radii: Float64Array, outRe: Float64Array, outIm: Float64Array | null): void => {
    const D = dirs.length / 3;
    const M = radii.length;
    if (!Number.isInteger(D)) throw new RangeError('sampleRays: dirs must hold x, y, z per direction');
    if (outRe.length !== D * M) throw new RangeError(`sampleRays: outRe has length ${outRe.length}, expected ${D * M}`);
    if (!real && !outIm) throw new RangeError('sampleRays: this state is complex-valued; pass outIm');
    if (outIm && outIm.length !== D * M) throw new RangeError(`sampleRays: outIm has length ${outIm.length}, expected ${D * M}`);
    outRe.fill(0);
    if (outIm) outIm.fill(0);
    const rad = new Float64Array(M);
    for (let b = 0; b < B; b++) {
      for (let j = 0; j < M; j++) rad[j] = radial(b, radii[j]);
      for (let i = 0; i < D; i++) {
        const h = angular(b, dirs[3 * i], dirs[3 * i + 1], dirs[3 * i + 2]);
        const o = i * M;
        if (h.re !== 0) for (let j = 0; j < M; j++) outRe[o + j] += rad[j] * h.re;
        if (outIm && h.im !== 0) for (let j = 0; j < M; j++) outIm[o + j] += rad[j] * h.im;
      }
    }
  };

  return { isReal: real, state: cx, evaluate, gradient, sampleGrid, sampleBox, polynomials: monos, blocks: blockKeys.map((b) => ({ n: b.n, l: b.l })), radial, angular, angularInto, sampleRays };
}
