// A small, pure reader and evaluator of the ICC profiles Psiform builds (assets/icc): version 2 output profiles
// with a CIELAB PCS and lut16Type (or lut8Type) A2B/B2A tags, as Argyll's colprof writes them.
//
// Why our own and not a package: the transform must run in libs (no native code, no I/O, no async wasm start-up)
// and in the browser as well as in Node; the only registry port of Little CMS (lcms-wasm) needs its wasm file
// loaded at run time, pulls a test framework in as a runtime dependency, and returned garbage for its double
// formats here (stack notes). What we need is small: parse the header and tag table, and evaluate a lut16 pipeline
// (input curves -> CLUT -> output curves). It is checked in the tests against Little CMS's own `transicc` on the
// same profile. Pixels (TIFF) are converted by sharp (libvips + Little CMS) in the worker, not here.
//
// Sources: ICC.1:2001-04 (profile format v2.4), §6.1 header, §6.5.7 lut8Type, §6.5.8 lut16Type, Annex A (PCS
// encodings: v2 16-bit CIELAB, L* 0..100 -> 0x0000..0xFF00, a*/b* -128..127.996 -> 0x0000..0xFFFF). Interpolation
// follows Little CMS 2 (cmsintrp.c): tetrahedral in three device inputs (Sakamoto 1980, as in Kasson, Nin, Plouffe
// & Hafner 1995), trilinear for CIELAB inputs, and for four inputs two tetrahedral evaluations in the last three,
// linear in the first.

const { floor, max, min } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export type IccIntent = 'perceptual' | 'relative' | 'saturation';
const INTENT_INDEX: Record<IccIntent, number> = { perceptual: 0, relative: 1, saturation: 2 };

export class IccError extends Error {}

/** One lut8/lut16 tag: inputs -> outputs, every value normalised to 0..1. */
export interface IccLut {
  inputs: number;
  outputs: number;
  grid: number;
  inCurves: Float64Array[];
  clut: Float64Array;
  outCurves: Float64Array[];
  /**
   * Little CMS interpolates CLUTs whose inputs are CIELAB (the B2A tables of a Lab-PCS profile) trilinearly, not
   * tetrahedrally (cmsio1.c, ChangeInterpolationToTrilinear: tetrahedra suit device cubes, not Lab); we do the same.
   */
  trilinear: boolean;
}

export interface IccProfile {
  /** 'CMYK', 'RGB ', 'GRAY' … (the header's data colour space, 4 characters). */
  colourSpace: string;
  pcs: string;
  deviceClass: string;
  version: string;
  description: string;
  copyright: string;
  /** Media white point (XYZ, D50 relative to 1), when present. */
  mediaWhite?: [number, number, number];
  tags: string[];
  /** The device -> PCS and PCS -> device tables by intent (falling back to intent 0, as ICC.1 §6.3 says). */
  a2b(intent: IccIntent): IccLut;
  b2a(intent: IccIntent): IccLut;
}

function ascii(b: Uint8Array, at: number, n: number): string {
  let s = '';
  for (let i = 0; i < n; i++) s += String.fromCharCode(b[at + i]);
  return s;
}

function s15f16(v: DataView, at: number): number {
  return v.getInt32(at, false) / 65536;
}

function readText(b: Uint8Array, v: DataView, at: number, size: number): string {
  const type = ascii(b, at, 4);
  if (type === 'desc') {
    const n = v.getUint32(at + 8, false);
    return ascii(b, at + 12, max(0, min(n, size - 12) - 1));
  }
  if (type === 'text') return ascii(b, at + 8, size - 8).replace(/\0+$/, '');
  if (type === 'mluc') {
    const count = v.getUint32(at + 8, false);
    if (count < 1) return '';
    const len = v.getUint32(at + 20, false);
    const off = v.getUint32(at + 24, false);
    let s = '';
    for (let i = 0; i + 1 < len; i += 2) s += String.fromCharCode(v.getUint16(at + off + i, false));
    return s;
  }
  return '';
}

function readLut(b: Uint8Array, v: DataView, at: number, size: number, tag: string, trilinear: boolean): IccLut {
  const type = ascii(b, at, 4);
  if (type !== 'mft2' && type !== 'mft1') throw new IccError(`${tag}: tag type ${JSON.stringify(type)} is not supported (lut16Type or lut8Type expected)`);
  const i = b[at + 8];
  const o = b[at + 9];
  const g = b[at + 10];
  if (i < 1 || i > 4 || o < 1 || o > 4 || g < 2) throw new IccError(`${tag}: ${i} inputs, ${o} outputs, grid ${g} are outside what we evaluate`);
  const wide = type === 'mft2';
  const n = wide ? v.getUint16(at + 48, false) : 256;
  const m = wide ? v.getUint16(at + 50, false) : 256;
  const unit = wide ? 65535 : 255;
  const word = wide ? 2 : 1;
  let p = at + (wide ? 52 : 48);
  const get = (k: number) => (wide ? v.getUint16(k, false) : b[k]) / unit;
  const need = (wide ? 52 : 48) + (i * n + g ** i * o + o * m) * word;
  if (need > size) throw new IccError(`${tag}: truncated (${size} bytes, ${need} needed)`);
  const inCurves: Float64Array[] = [];
  for (let c = 0; c < i; c++) {
    const t = new Float64Array(n);
    for (let k = 0; k < n; k++, p += word) t[k] = get(p);
    inCurves.push(t);
  }
  const clut = new Float64Array(g ** i * o);
  for (let k = 0; k < clut.length; k++, p += word) clut[k] = get(p);
  const outCurves: Float64Array[] = [];
  for (let c = 0; c < o; c++) {
    const t = new Float64Array(m);
    for (let k = 0; k < m; k++, p += word) t[k] = get(p);
    outCurves.push(t);
  }
  return { inputs: i, outputs: o, grid: g, inCurves, clut, outCurves, trilinear: trilinear && i === 3 };
}

/** Parses an ICC profile's header and tag table; tables are decoded when first asked for. */
export function readIccProfile(bytes: Uint8Array): IccProfile {
  if (!(bytes instanceof Uint8Array) || bytes.length < 132) throw new IccError('not an ICC profile: fewer than 132 bytes');
  const v = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const size = v.getUint32(0, false);
  if (ascii(bytes, 36, 4) !== 'acsp') throw new IccError("not an ICC profile: no 'acsp' signature at byte 36");
  if (size > bytes.length) throw new IccError(`ICC profile truncated: header says ${size} bytes, got ${bytes.length}`);
  const count = v.getUint32(128, false);
  const table = new Map<string, { at: number; size: number }>();
  for (let k = 0; k < count; k++) {
    const e = 132 + 12 * k;
    if (e + 12 > size) throw new IccError('ICC tag table runs past the end of the profile');
    const sig = ascii(bytes, e, 4);
    const at = v.getUint32(e + 4, false);
    const n = v.getUint32(e + 8, false);
    if (at + n > size) throw new IccError(`ICC tag ${sig} runs past the end of the profile`);
    table.set(sig, { at, size: n });
  }
  const text = (sig: string) => {
    const t = table.get(sig);
    return t ? readText(bytes, v, t.at, t.size) : '';
  };
  let mediaWhite: [number, number, number] | undefined;
  const wt = table.get('wtpt');
  if (wt && ascii(bytes, wt.at, 4) === 'XYZ ') mediaWhite = [s15f16(v, wt.at + 8), s15f16(v, wt.at + 12), s15f16(v, wt.at + 16)];
  const cache = new Map<string, IccLut>();
  const lut = (prefix: 'A2B' | 'B2A', intent: IccIntent): IccLut => {
    const sig = table.has(`${prefix}${INTENT_INDEX[intent]}`) ? `${prefix}${INTENT_INDEX[intent]}` : `${prefix}0`;
    const t = table.get(sig);
    if (!t) throw new IccError(`the profile has no ${prefix}0 table`);
    let l = cache.get(sig);
    if (!l) {
      l = readLut(bytes, v, t.at, t.size, sig, prefix === 'B2A' && ascii(bytes, 20, 4) === 'Lab ');
      cache.set(sig, l);
    }
    return l;
  };
  const major = bytes[8];
  return {
    colourSpace: ascii(bytes, 16, 4),
    pcs: ascii(bytes, 20, 4),
    deviceClass: ascii(bytes, 12, 4),
    version: `${major}.${bytes[9] >> 4}`,
    description: text('desc'),
    copyright: text('cprt'),
    mediaWhite,
    tags: [...table.keys()],
    a2b: (intent) => lut('A2B', intent),
    b2a: (intent) => lut('B2A', intent),
  };
}

/** Linear interpolation in a 1D table over 0..1 (Little CMS's 1D evaluation). */
function curve(t: Float64Array, x: number): number {
  const n = t.length;
  if (n === 1) return t[0];
  const pos = min(1, max(0, x)) * (n - 1);
  const k = min(n - 2, floor(pos));
  const r = pos - k;
  return t[k] + r * (t[k + 1] - t[k]);
}

/** The cell of a 3D grid of `g` points a side holding (x, y, z) in grid units, and where in it (0..1 per axis); the top edge falls in the last cell. */
function cellOf(g: number, x: number, y: number, z: number): [number, number, number, number, number, number] {
  const x0 = min(g - 2, floor(x));
  const y0 = min(g - 2, floor(y));
  const z0 = min(g - 2, floor(z));
  return [x0, y0, z0, x - x0, y - y0, z - z0];
}

/**
 * Tetrahedral interpolation in a 3D grid at (x, y, z) in grid units, writing `o` outputs. `base` is the offset of
 * the sub-grid in `clut`; strides are for the three axes (x slowest). Same tetrahedra as Little CMS.
 */
function tetra(clut: Float64Array, base: number, sx: number, sy: number, sz: number, g: number, o: number, x: number, y: number, z: number, out: Float64Array): void {
  const [x0, y0, z0, rx, ry, rz] = cellOf(g, x, y, z);
  const c0 = base + x0 * sx + y0 * sy + z0 * sz;
  for (let k = 0; k < o; k++) {
    const C = (dx: number, dy: number, dz: number) => clut[c0 + dx * sx + dy * sy + dz * sz + k];
    const v000 = C(0, 0, 0);
    let c1: number, c2: number, c3: number;
    if (rx >= ry && ry >= rz) {
      c1 = C(1, 0, 0) - v000; c2 = C(1, 1, 0) - C(1, 0, 0); c3 = C(1, 1, 1) - C(1, 1, 0);
    } else if (rx >= rz && rz >= ry) {
      c1 = C(1, 0, 0) - v000; c2 = C(1, 1, 1) - C(1, 0, 1); c3 = C(1, 0, 1) - C(1, 0, 0);
    } else if (rz >= rx && rx >= ry) {
      c1 = C(1, 0, 1) - C(0, 0, 1); c2 = C(1, 1, 1) - C(1, 0, 1); c3 = C(0, 0, 1) - v000;
    } else if (ry >= rx && rx >= rz) {
      c1 = C(1, 1, 0) - C(0, 1, 0); c2 = C(0, 1, 0) - v000; c3 = C(1, 1, 1) - C(1, 1, 0);
    } else if (ry >= rz && rz >= rx) {
      c1 = C(1, 1, 1) - C(0, 1, 1); c2 = C(0, 1, 0) - v000; c3 = C(0, 1, 1) - C(0, 1, 0);
    } else {
      c1 = C(1, 1, 1) - C(0, 1, 1); c2 = C(0, 1, 1) - C(0, 0, 1); c3 = C(0, 0, 1) - v000;
    }
    out[k] = v000 + c1 * rx + c2 * ry + c3 * rz;
  }
}

/** Trilinear interpolation in a 3D grid (x slowest), as Little CMS's TrilinearInterpFloat. */
function trilinear(clut: Float64Array, g: number, o: number, x: number, y: number, z: number, out: Float64Array): void {
  const [x0, y0, z0, rx, ry, rz] = cellOf(g, x, y, z);
  const sx = g * g * o;
  const sy = g * o;
  const c0 = x0 * sx + y0 * sy + z0 * o;
  for (let k = 0; k < o; k++) {
    const C = (dx: number, dy: number, dz: number) => clut[c0 + dx * sx + dy * sy + dz * o + k];
    const lerp = (a: number, b: number, t: number) => a + t * (b - a);
    const d00 = lerp(C(0, 0, 0), C(1, 0, 0), rx);
    const d01 = lerp(C(0, 0, 1), C(1, 0, 1), rx);
    const d10 = lerp(C(0, 1, 0), C(1, 1, 0), rx);
    const d11 = lerp(C(0, 1, 1), C(1, 1, 1), rx);
    out[k] = lerp(lerp(d00, d10, ry), lerp(d01, d11, ry), rz);
  }
}

/** Evaluates a lut tag at `input` (each 0..1), returning outputs in 0..1. */
export function evalLut(l: IccLut, input: ArrayLike<number>): Float64Array {
  const { inputs: i, outputs: o, grid: g } = l;
  if (input.length !== i) throw new IccError(`this table takes ${i} inputs, got ${input.length}`);
  const pos = new Float64Array(i);
  for (let c = 0; c < i; c++) pos[c] = min(1, max(0, curve(l.inCurves[c], input[c]))) * (g - 1);
  const out = new Float64Array(o);
  if (i === 3 && l.trilinear) trilinear(l.clut, g, o, pos[0], pos[1], pos[2], out);
  else if (i === 3) tetra(l.clut, 0, g * g * o, g * o, o, g, o, pos[0], pos[1], pos[2], out);
  else if (i === 4) {
    const k0 = min(g - 2, floor(pos[0]));
    const r = pos[0] - k0;
    const s0 = g * g * g * o;
    const a = new Float64Array(o);
    const b2 = new Float64Array(o);
    tetra(l.clut, k0 * s0, g * g * o, g * o, o, g, o, pos[1], pos[2], pos[3], a);
    tetra(l.clut, (k0 + 1) * s0, g * g * o, g * o, o, g, o, pos[1], pos[2], pos[3], b2);
    for (let k = 0; k < o; k++) out[k] = a[k] + r * (b2[k] - a[k]);
  } else if (i === 1) {
    const k0 = min(g - 2, floor(pos[0]));
    const r = pos[0] - k0;
    for (let k = 0; k < o; k++) out[k] = l.clut[k0 * o + k] + r * (l.clut[(k0 + 1) * o + k] - l.clut[k0 * o + k]);
  } else {
    // Two inputs: bilinear (not used by our profiles; kept simple).
    const x0 = min(g - 2, floor(pos[0]));
    const y0 = min(g - 2, floor(pos[1]));
    const rx = pos[0] - x0;
    const ry = pos[1] - y0;
    for (let k = 0; k < o; k++) {
      const C = (dx: number, dy: number) => l.clut[((x0 + dx) * g + (y0 + dy)) * o + k];
      out[k] = (1 - rx) * ((1 - ry) * C(0, 0) + ry * C(0, 1)) + rx * ((1 - ry) * C(1, 0) + ry * C(1, 1));
    }
  }
  for (let k = 0; k < o; k++) out[k] = curve(l.outCurves[k], min(1, max(0, out[k])));
  return out;
}

/** CIELAB (D50) -> the v2 16-bit PCS encoding as 0..1 (ICC.1:2001-04 Annex A, "legacy" Lab). */
export function labToPcsV2(L: number, a: number, b: number): [number, number, number] {
  const clamp = (x: number, lo: number, hi: number) => min(hi, max(lo, x));
  return [(clamp(L, 0, 100) * 652.8) / 65535, ((clamp(a, -128, 127.99609375) + 128) * 256) / 65535, ((clamp(b, -128, 127.99609375) + 128) * 256) / 65535];
}

export function pcsV2ToLab(p: ArrayLike<number>): [number, number, number] {
  return [(p[0] * 65535) / 652.8, (p[1] * 65535) / 256 - 128, (p[2] * 65535) / 256 - 128];
}
