// Colour pipeline for render-target read-backs: linear light -> sRGB 8-bit, row flip.
// sRGB transfer function: IEC 61966-2-1:1999, §5.2 (encoding: 12.92 v below 0.0031308, else 1.055 v^(1/2.4) - 0.055).

const { pow, round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/** sRGB-encoded value in [0, 1] for linear v in [0, 1] (clamped; NaN -> 0). */
export function linearToSrgb(v: number): number {
  if (!(v > 0)) return 0;
  if (v >= 1) return 1;
  return v <= 0.0031308 ? 12.92 * v : 1.055 * pow(v, 1 / 2.4) - 0.055;
}

/** Linear value for sRGB-encoded s in [0, 1] (inverse transfer: s/12.92 below 0.04045, else ((s+0.055)/1.055)^2.4). */
export function srgbToLinear(s: number): number {
  if (!(s > 0)) return 0;
  if (s >= 1) return 1;
  return s <= 0.04045 ? s / 12.92 : pow((s + 0.055) / 1.055, 2.4);
}

/** 8-bit sRGB code for linear v: round(255 * linearToSrgb(v)). */
export function linearToSrgb8(v: number): number {
  return round(255 * linearToSrgb(v));
}

/**
 * Decision thresholds: code k is chosen for linear v with T[k-1] <= v < T[k], T[k] the linear value whose
 * encoding is exactly (k + 0.5)/255. A 255-entry binary search gives the same code as linearToSrgb8 (the
 * encoding is monotonic) with 8 comparisons instead of a pow per channel: a 20000 x 9000 export has
 * 540 million channels.
 */
let thresholds: Float64Array | null = null;
function decisionThresholds(): Float64Array {
  if (!thresholds) {
    thresholds = new Float64Array(255);
    for (let k = 0; k < 255; k++) thresholds[k] = srgbToLinear((k + 0.5) / 255);
  }
  return thresholds;
}

function codeFor(v: number, T: Float64Array): number {
  if (!(v > 0)) return 0;
  let lo = 0;
  let hi = 255;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (v < T[mid]) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

let lut8: Uint8Array | null = null;

/**
 * RGBA linear -> RGBA sRGB 8-bit. Float input: linear light in [0, 1] (clamped), alpha scaled to 0..255
 * without the transfer function. Uint8 input: linear 0..255 codes (8-bit linear render target), alpha copied.
 * dst may be the same buffer as a Uint8 src.
 */
export function linearBufferToSrgb(src: Float32Array | Uint8Array, dst: Uint8Array): Uint8Array {
  if (src.length % 4 !== 0) throw new RangeError(`source length ${src.length} is not a multiple of 4 (RGBA)`);
  if (dst.length !== src.length) throw new RangeError(`destination length ${dst.length} must equal source length ${src.length}`);
  if (src instanceof Uint8Array) {
    if (!lut8) {
      lut8 = new Uint8Array(256);
      for (let i = 0; i < 256; i++) lut8[i] = linearToSrgb8(i / 255);
    }
    const L = lut8;
    for (let i = 0; i < src.length; i += 4) {
      dst[i] = L[src[i]];
      dst[i + 1] = L[src[i + 1]];
      dst[i + 2] = L[src[i + 2]];
      dst[i + 3] = src[i + 3];
    }
    return dst;
  }
  const T = decisionThresholds();
  for (let i = 0; i < src.length; i += 4) {
    dst[i] = codeFor(src[i], T);
    dst[i + 1] = codeFor(src[i + 1], T);
    dst[i + 2] = codeFor(src[i + 2], T);
    const a = src[i + 3];
    dst[i + 3] = a > 0 ? (a >= 1 ? 255 : round(a * 255)) : 0;
  }
  return dst;
}

/** Reverses the row order of an RGBA image in place (WebGL readPixels returns the bottom row first). */
export function flipRowsInPlace(rgba: Uint8Array, width: number, height: number): Uint8Array {
  const stride = width * 4;
  if (!Number.isInteger(width) || !Number.isInteger(height) || width < 1 || height < 1) throw new RangeError('width and height must be positive integers');
  if (rgba.length !== stride * height) throw new RangeError(`rgba length ${rgba.length} must be width * height * 4 = ${stride * height}`);
  const tmp = new Uint8Array(stride);
  for (let top = 0, bottom = height - 1; top < bottom; top++, bottom--) {
    const a = top * stride;
    const b = bottom * stride;
    tmp.set(rgba.subarray(a, a + stride));
    rgba.copyWithin(a, b, b + stride);
    rgba.set(tmp, b);
  }
  return rgba;
}

/**
 * Copies a tile (RGBA, top row first) into a larger image at (x, y): for assembling planTiles output.
 */
export function blitTile(image: Uint8Array, imageWidth: number, tile: Uint8Array, x: number, y: number, width: number, height: number): void {
  if (tile.length !== width * height * 4) throw new RangeError(`tile length ${tile.length} must be width * height * 4`);
  const imageHeight = image.length / (imageWidth * 4);
  if (x < 0 || y < 0 || x + width > imageWidth || y + height > imageHeight) throw new RangeError('tile lies outside the image');
  for (let r = 0; r < height; r++) image.set(tile.subarray(r * width * 4, (r + 1) * width * 4), ((y + r) * imageWidth + x) * 4);
}
