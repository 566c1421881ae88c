// Pixel work for the render page: half floats from the render target, straight alpha, overlay compositing.
import { encodeRgbaPng, linearBufferToSrgb } from '@psiform/print';
import { DataUtils, type WebGLRenderer, type WebGLRenderTarget } from 'three';

let HALF: Float32Array | null = null;
/** All 65536 half-float values as float32 (a table: decoding tens of millions of texels one call at a time is slow). */
export function halfTable(): Float32Array {
  if (!HALF) {
    HALF = new Float32Array(65536);
    for (let i = 0; i < 65536; i++) HALF[i] = DataUtils.fromHalfFloat(i);
  }
  return HALF;
}

let HALF_SRGB: Uint8Array | null = null;
/**
 * Every half-float bit pattern -> the byte linearBufferToSrgb gives for it: colour codes at [0, 65536), alpha codes at
 * [65536, 131072). Built with linearBufferToSrgb itself, so a lookup equals decode + conversion exactly; one table read
 * per channel instead of a float decode, a float array and a threshold search (measured: ~1 s less per 4252 × 2835 image).
 */
export function halfSrgbTable(): Uint8Array {
  if (!HALF_SRGB) {
    const f = halfTable();
    const src = new Float32Array(65536 * 4);
    for (let i = 0; i < 65536; i++) src[4 * i] = src[4 * i + 1] = src[4 * i + 2] = src[4 * i + 3] = f[i];
    const out = linearBufferToSrgb(src, new Uint8Array(src.length));
    HALF_SRGB = new Uint8Array(131072);
    for (let i = 0; i < 65536; i++) {
      HALF_SRGB[i] = out[4 * i];
      HALF_SRGB[65536 + i] = out[4 * i + 3];
    }
  }
  return HALF_SRGB;
}

/** Half-float RGBA (linear, straight or opaque) -> 8-bit sRGB RGBA, same bytes as halfToFloat + linearBufferToSrgb. */
export function halfToSrgb8(src: Uint16Array, dst: Uint8Array): Uint8Array {
  const T = halfSrgbTable();
  for (let i = 0; i < src.length; i += 4) {
    dst[i] = T[src[i]];
    dst[i + 1] = T[src[i + 1]];
    dst[i + 2] = T[src[i + 2]];
    dst[i + 3] = T[65536 + src[i + 3]];
  }
  return dst;
}

/**
 * One band of a render target as 8-bit sRGB RGBA, still bottom-up. Opaque half-float targets take the table path;
 * transparent ones need the float values to divide by alpha first (unpremultiply).
 */
export function readBandSrgb(gl: WebGLRenderer, rt: WebGLRenderTarget, y: number, w: number, h: number, float: boolean, transparent: boolean): Uint8Array {
  const n = w * h * 4;
  if (float && !transparent) {
    const half = new Uint16Array(n);
    gl.readRenderTargetPixels(rt, 0, y, w, h, half);
    return halfToSrgb8(half, new Uint8Array(n));
  }
  const lin = new Float32Array(n);
  if (float) {
    const half = new Uint16Array(n);
    gl.readRenderTargetPixels(rt, 0, y, w, h, half);
    halfToFloat(half, lin);
  } else {
    const u8 = new Uint8Array(n);
    gl.readRenderTargetPixels(rt, 0, y, w, h, u8);
    for (let i = 0; i < n; i++) lin[i] = u8[i] / 255;
  }
  if (transparent) unpremultiply(lin);
  return linearBufferToSrgb(lin, new Uint8Array(n));
}

/** Images above this many pixels are encoded for speed (filter none, deflate level 3) rather than size. */
export const FAST_PNG_PIXELS = 4_000_000;

/**
 * The page's PNG encode. Measured on a 4252 × 2835 figure (2 cores): adaptive filter + level 6 1.2-1.7 s, 0.73 MB;
 * none + level 3 0.4-0.5 s, 0.87 MB. Small images (thumbnails, screen sizes) keep the smaller adaptive encoding.
 */
export function encodeFigurePng(width: number, height: number, rgba: Uint8Array, dpi: number): Uint8Array {
  const fast = width * height > FAST_PNG_PIXELS;
  return encodeRgbaPng(width, height, rgba, fast ? { dpi, filter: 'none', level: 3 } : { dpi });
}

/** Half floats -> float32, in place into `out`. */
export function halfToFloat(src: Uint16Array, out: Float32Array): Float32Array {
  const t = halfTable();
  for (let i = 0; i < src.length; i++) out[i] = t[src[i]];
  return out;
}

/**
 * Render targets hold premultiplied colour at anti-aliased edges over a transparent clear (rgb·a, a); PNG stores
 * straight alpha, so divide back (PNG specification §12.3, "Alpha channel": not premultiplied).
 */
export function unpremultiply(rgba: Float32Array): void {
  for (let i = 0; i < rgba.length; i += 4) {
    const a = rgba[i + 3];
    if (a > 0 && a < 1) {
      rgba[i] = Math.min(1, rgba[i] / a);
      rgba[i + 1] = Math.min(1, rgba[i + 1] / a);
      rgba[i + 2] = Math.min(1, rgba[i + 2] / a);
    } else if (a <= 0) {
      rgba[i] = rgba[i + 1] = rgba[i + 2] = 0;
    }
  }
}

/**
 * Source-over of an sRGB overlay (straight alpha, as getImageData returns it) onto sRGB image pixels
 * (straight alpha), both 8-bit RGBA of the same size. Blending in sRGB matches what a browser does on screen.
 */
export function compositeOver(dst: Uint8Array | Uint8ClampedArray, src: Uint8Array | Uint8ClampedArray): void {
  for (let i = 0; i < dst.length; i += 4) {
    const as = src[i + 3] / 255;
    if (as === 0) continue;
    const ad = dst[i + 3] / 255;
    const ao = as + ad * (1 - as);
    for (let c = 0; c < 3; c++) dst[i + c] = Math.round((src[i + c] * as + dst[i + c] * ad * (1 - as)) / ao);
    dst[i + 3] = Math.round(ao * 255);
  }
}

export function bytesToBase64(bytes: Uint8Array): string {
  let s = '';
  const CH = 0x8000;
  for (let i = 0; i < bytes.length; i += CH) s += String.fromCharCode(...bytes.subarray(i, i + CH));
  return btoa(s);
}
