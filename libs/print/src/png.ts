// PNG chunk surgery and a small RGBA encoder. PNG specification (W3C Recommendation, 2nd edition 2003 /
// 3rd edition 2025): §5.2 signature, §5.3 chunk layout, §5.5 CRC, §11.2.2 IHDR, §11.3.3.5 sRGB,
// §11.3.5.3 pHYs, §9 filtering.

import { zlibSync } from 'fflate';
import { crc32 } from './crc32';
import { pixelsPerMetre } from './size';

const { abs, min } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export const PNG_SIGNATURE = new Uint8Array([137, 80, 78, 71, 13, 10, 26, 10]);

export class PngError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PngError';
  }
}

export interface PngChunk {
  type: string;
  data: Uint8Array;
  /** CRC stored in the file. */
  crc: number;
  /** Stored CRC equals CRC-32 over type + data. */
  crcOk: boolean;
}

const enc = new TextEncoder();

function u32(b: Uint8Array, o: number): number {
  return ((b[o] << 24) | (b[o + 1] << 16) | (b[o + 2] << 8) | b[o + 3]) >>> 0;
}

function putU32(b: Uint8Array, o: number, v: number): void {
  b[o] = (v >>> 24) & 0xff;
  b[o + 1] = (v >>> 16) & 0xff;
  b[o + 2] = (v >>> 8) & 0xff;
  b[o + 3] = v & 0xff;
}

/** Splits a PNG into its chunks (no decompression). Throws PngError on a bad signature or truncation. */
export function parsePngChunks(bytes: Uint8Array): PngChunk[] {
  if (!(bytes instanceof Uint8Array)) throw new PngError('PNG bytes must be a Uint8Array');
  if (bytes.length < 8 || PNG_SIGNATURE.some((v, i) => bytes[i] !== v)) throw new PngError('not a PNG file: the 8-byte signature is missing');
  const chunks: PngChunk[] = [];
  let o = 8;
  while (o < bytes.length) {
    if (o + 12 > bytes.length) throw new PngError(`truncated PNG: chunk header at byte ${o} runs past the end`);
    const len = u32(bytes, o);
    if (len > 0x7fffffff) throw new PngError(`chunk length ${len} at byte ${o} exceeds 2^31 - 1`);
    if (o + 12 + len > bytes.length) throw new PngError(`truncated PNG: chunk at byte ${o} declares ${len} data bytes`);
    const typeBytes = bytes.subarray(o + 4, o + 8);
    const type = String.fromCharCode(...typeBytes);
    if (!/^[A-Za-z]{4}$/.test(type)) throw new PngError(`invalid chunk type at byte ${o}`);
    const data = bytes.subarray(o + 8, o + 8 + len);
    const crc = u32(bytes, o + 8 + len);
    chunks.push({ type, data, crc, crcOk: crc32(data, crc32(typeBytes)) === crc });
    o += 12 + len;
    if (type === 'IEND') break;
  }
  if (chunks[0]?.type !== 'IHDR') throw new PngError('IHDR must be the first chunk');
  if (chunks[chunks.length - 1].type !== 'IEND') throw new PngError('truncated PNG: no IEND chunk');
  return chunks;
}

/** Serialises one chunk: length, type, data, CRC-32 over type + data. */
export function pngChunk(type: string, data: Uint8Array): Uint8Array {
  if (!/^[A-Za-z]{4}$/.test(type)) throw new PngError(`chunk type must be four ASCII letters (got ${JSON.stringify(type)})`);
  const out = new Uint8Array(12 + data.length);
  putU32(out, 0, data.length);
  out.set(enc.encode(type), 4);
  out.set(data, 8);
  putU32(out, 8 + data.length, crc32(out.subarray(4, 8 + data.length)));
  return out;
}

function concat(parts: Uint8Array[]): Uint8Array {
  let n = 0;
  for (const p of parts) n += p.length;
  const out = new Uint8Array(n);
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

/** pHYs data: pixels per unit x, y (4 bytes each) and unit specifier (1 = metre). */
export function physData(dpi: number): Uint8Array {
  const ppm = pixelsPerMetre(dpi);
  const d = new Uint8Array(9);
  putU32(d, 0, ppm);
  putU32(d, 4, ppm);
  d[8] = 1;
  return d;
}

/** sRGB rendering intents (§11.3.3.5): 0 perceptual, 1 relative colorimetric, 2 saturation, 3 absolute colorimetric. */
export type SrgbIntent = 0 | 1 | 2 | 3;

/**
 * Chunks dropped by finishPng: older resolution and colour statements. cHRM goes too: the sRGB chunk
 * states the colour space on its own, and a stale cHRM from another tool would contradict it.
 */
const REPLACED = new Set(['pHYs', 'sRGB', 'gAMA', 'iCCP', 'cHRM']);

/**
 * Stamps print metadata on an existing PNG (canvas.toBlob, pngjs, ...): removes any pHYs, sRGB, gAMA, iCCP
 * and cHRM, then inserts pHYs (dpi as pixels per metre, both axes, unit metre) and sRGB (perceptual intent)
 * right after IHDR, so both precede PLTE and IDAT as §5.6 requires. Other chunks are copied byte for byte.
 * Rejects a PNG whose chunks fail their CRC (a corrupt input must not be re-stamped as valid).
 */
export function finishPng(pngBytes: Uint8Array, opts: { dpi: number; intent?: SrgbIntent }): Uint8Array {
  const chunks = parsePngChunks(pngBytes);
  const bad = chunks.find((c) => !c.crcOk);
  if (bad) throw new PngError(`corrupt PNG: CRC mismatch in the ${bad.type} chunk`);
  const intent = opts.intent ?? 0;
  if (![0, 1, 2, 3].includes(intent)) throw new PngError(`intent must be 0, 1, 2 or 3 (got ${String(intent)})`);
  const parts: Uint8Array[] = [PNG_SIGNATURE];
  for (const c of chunks) {
    if (REPLACED.has(c.type)) continue;
    parts.push(pngChunk(c.type, c.data));
    if (c.type === 'IHDR') {
      parts.push(pngChunk('pHYs', physData(opts.dpi)));
      parts.push(pngChunk('sRGB', new Uint8Array([intent])));
    }
  }
  return concat(parts);
}

export interface PngInfo {
  width: number;
  height: number;
  bitDepth: number;
  colorType: number;
  interlace: number;
  pHYs?: { x: number; y: number; unit: number };
  srgb?: number;
  /** Chunk types in file order. */
  chunks: string[];
  /** Every chunk's stored CRC matches. */
  crcOk: boolean;
}

export function readPngInfo(bytes: Uint8Array): PngInfo {
  const chunks = parsePngChunks(bytes);
  const h = chunks[0].data;
  if (h.length !== 13) throw new PngError(`IHDR must hold 13 bytes (got ${h.length})`);
  const info: PngInfo = {
    width: u32(h, 0),
    height: u32(h, 4),
    bitDepth: h[8],
    colorType: h[9],
    interlace: h[12],
    chunks: chunks.map((c) => c.type),
    crcOk: chunks.every((c) => c.crcOk),
  };
  const phys = chunks.find((c) => c.type === 'pHYs');
  if (phys && phys.data.length === 9) info.pHYs = { x: u32(phys.data, 0), y: u32(phys.data, 4), unit: phys.data[8] };
  const srgb = chunks.find((c) => c.type === 'sRGB');
  if (srgb && srgb.data.length === 1) info.srgb = srgb.data[0];
  return info;
}

export type PngFilterChoice = 'none' | 'up' | 'paeth' | 'adaptive';

/** IDAT data is split into chunks of this size (any split is valid, §5.6; smaller chunks stream better). */
const IDAT_CHUNK = 1 << 20;

/**
 * Encodes 8-bit RGBA (row-major, top row first, non-premultiplied) as a PNG with pHYs and sRGB.
 * Filtering (§9): 'adaptive' (default) picks per row the filter with the least sum of absolute signed
 * bytes, the heuristic the specification suggests (§12.8); the others use one filter for every row.
 * Compression: fflate's zlib (deflate, RFC 1950/1951).
 */
export function encodeRgbaPng(width: number, height: number, rgba: Uint8Array, opts: { dpi: number; filter?: PngFilterChoice; level?: 0 | 1 | 2 | 3 | 4 | 5 | 6 | 7 | 8 | 9 }): Uint8Array {
  if (!Number.isInteger(width) || width < 1 || width > 0x7fffffff) throw new PngError(`width must be a positive integer (got ${String(width)})`);
  if (!Number.isInteger(height) || height < 1 || height > 0x7fffffff) throw new PngError(`height must be a positive integer (got ${String(height)})`);
  if (!(rgba instanceof Uint8Array) && !((rgba as unknown) instanceof Uint8ClampedArray)) throw new PngError('rgba must be a Uint8Array');
  if (rgba.length !== width * height * 4) throw new PngError(`rgba length ${rgba.length} must be width * height * 4 = ${width * height * 4}`);
  const filter = opts.filter ?? 'adaptive';
  if (!['none', 'up', 'paeth', 'adaptive'].includes(filter)) throw new PngError(`filter must be none, up, paeth or adaptive (got ${String(filter)})`);

  const stride = width * 4;
  const raw = new Uint8Array((stride + 1) * height);
  const cand = filter === 'adaptive' ? [new Uint8Array(stride), new Uint8Array(stride), new Uint8Array(stride), new Uint8Array(stride), new Uint8Array(stride)] : [];
  const one = new Uint8Array(stride);
  for (let y = 0; y < height; y++) {
    const cur = rgba.subarray(y * stride, (y + 1) * stride);
    const prev = y > 0 ? rgba.subarray((y - 1) * stride, y * stride) : null;
    const o = y * (stride + 1);
    if (filter === 'adaptive') {
      let best = 0;
      let bestSum = Infinity;
      for (let t = 0; t < 5; t++) {
        applyFilter(t, cur, prev, cand[t]);
        let s = 0;
        const c = cand[t];
        for (let i = 0; i < stride; i++) s += c[i] < 128 ? c[i] : 256 - c[i];
        if (s < bestSum) {
          bestSum = s;
          best = t;
        }
      }
      raw[o] = best;
      raw.set(cand[best], o + 1);
    } else {
      const t = filter === 'none' ? 0 : filter === 'up' ? 2 : 4;
      applyFilter(t, cur, prev, one);
      raw[o] = t;
      raw.set(one, o + 1);
    }
  }
  const z = zlibSync(raw, { level: opts.level ?? 6 });

  const ihdr = new Uint8Array(13);
  putU32(ihdr, 0, width);
  putU32(ihdr, 4, height);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 6; // colour type 6: truecolour with alpha
  ihdr[10] = 0; // compression: deflate
  ihdr[11] = 0; // filter method 0 (adaptive, five types)
  ihdr[12] = 0; // no interlace
  const parts = [PNG_SIGNATURE, pngChunk('IHDR', ihdr), pngChunk('pHYs', physData(opts.dpi)), pngChunk('sRGB', new Uint8Array([0]))];
  for (let o = 0; o < z.length; o += IDAT_CHUNK) parts.push(pngChunk('IDAT', z.subarray(o, min(z.length, o + IDAT_CHUNK))));
  parts.push(pngChunk('IEND', new Uint8Array(0)));
  return concat(parts);
}

/** Filter types of §9.2 with bpp = 4: 0 none, 1 sub, 2 up, 3 average, 4 Paeth. */
function applyFilter(type: number, cur: Uint8Array, prev: Uint8Array | null, out: Uint8Array): void {
  const n = cur.length;
  switch (type) {
    case 0:
      out.set(cur);
      return;
    case 1:
      for (let i = 0; i < n; i++) out[i] = (cur[i] - (i >= 4 ? cur[i - 4] : 0)) & 0xff;
      return;
    case 2:
      for (let i = 0; i < n; i++) out[i] = (cur[i] - (prev ? prev[i] : 0)) & 0xff;
      return;
    case 3:
      for (let i = 0; i < n; i++) out[i] = (cur[i] - (((i >= 4 ? cur[i - 4] : 0) + (prev ? prev[i] : 0)) >> 1)) & 0xff;
      return;
    default:
      for (let i = 0; i < n; i++) {
        const a = i >= 4 ? cur[i - 4] : 0;
        const b = prev ? prev[i] : 0;
        const c = prev && i >= 4 ? prev[i - 4] : 0;
        out[i] = (cur[i] - paeth(a, b, c)) & 0xff;
      }
  }
}

/** Paeth predictor (§9.4). */
function paeth(a: number, b: number, c: number): number {
  const p = a + b - c;
  const pa = abs(p - a);
  const pb = abs(p - b);
  const pc = abs(p - c);
  if (pa <= pb && pa <= pc) return a;
  if (pb <= pc) return b;
  return c;
}
