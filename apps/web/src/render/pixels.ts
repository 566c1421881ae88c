// Pixel work for the render page: half floats from the render target, straight alpha, overlay compositing.
import { DataUtils } from 'three';

let HALF: Float32Array | null = null;
/** All 65536 half-float values as float32 (a table: decoding tens of millions of texels one call at a time is slow). */
export function halfTable(): Float32Array {
  if (!HALF) {
    HALF = new Float32Array(65536);
    for (let i = 0; i < 65536; i++) HALF[i] = DataUtils.fromHalfFloat(i);
  }
  return HALF;
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
