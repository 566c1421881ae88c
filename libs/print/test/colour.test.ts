import { describe, expect, it } from 'vitest';
import { blitTile, flipRowsInPlace, linearBufferToSrgb, linearToSrgb, linearToSrgb8, srgbToLinear } from '../src';

describe('sRGB transfer function (IEC 61966-2-1:1999 §5.2)', () => {
  it('0 -> 0, 1 -> 255, 0.5 -> 188 (1.055·0.5^(1/2.4) − 0.055 = 0.7354, ×255 = 187.5)', () => {
    expect(linearToSrgb8(0)).toBe(0);
    expect(linearToSrgb8(1)).toBe(255);
    expect(linearToSrgb8(0.5)).toBe(188);
    expect(linearToSrgb(0.5)).toBeCloseTo(0.735357, 6);
  });
  it('the two branches meet at 0.0031308 (both give 0.04045 within 1e-7)', () => {
    const b = 0.0031308;
    const linear = 12.92 * b;
    const power = 1.055 * Math.pow(b, 1 / 2.4) - 0.055;
    expect(Math.abs(linear - power)).toBeLessThan(1e-7);
    expect(Math.abs(linearToSrgb(b - 1e-12) - linearToSrgb(b + 1e-12))).toBeLessThan(1e-7);
    expect(linearToSrgb(b / 2)).toBeCloseTo((12.92 * b) / 2, 15);
  });
  it('clamps out-of-range and NaN input', () => {
    expect(linearToSrgb8(-0.2)).toBe(0);
    expect(linearToSrgb8(1.7)).toBe(255);
    expect(linearToSrgb8(Number.NaN)).toBe(0);
  });
  it('srgbToLinear inverts linearToSrgb (IEC 61966-2-1 decoding) to 1e-12', () => {
    for (const v of [0, 0.001, 0.0031308, 0.01, 0.2, 0.5, 0.9, 1]) expect(srgbToLinear(linearToSrgb(v))).toBeCloseTo(v, 12);
  });
});

describe('linearBufferToSrgb', () => {
  it('float input: the threshold search gives exactly linearToSrgb8 for 200 001 values, alpha scaled not encoded', () => {
    const N = 200_001;
    const src = new Float32Array(N * 4);
    for (let i = 0; i < N; i++) {
      const v = i / (N - 1);
      src[4 * i] = v;
      src[4 * i + 1] = v * v;
      src[4 * i + 2] = Math.sqrt(v);
      src[4 * i + 3] = v;
    }
    const dst = linearBufferToSrgb(src, new Uint8Array(N * 4));
    let bad = 0;
    for (let i = 0; i < N; i++) {
      if (dst[4 * i] !== linearToSrgb8(src[4 * i])) bad++;
      if (dst[4 * i + 1] !== linearToSrgb8(src[4 * i + 1])) bad++;
      if (dst[4 * i + 2] !== linearToSrgb8(src[4 * i + 2])) bad++;
      if (dst[4 * i + 3] !== Math.round(src[4 * i + 3] * 255)) bad++;
    }
    expect(bad).toBe(0);
  });
  it('8-bit linear input: channels through the curve, alpha copied, in place allowed', () => {
    const buf = new Uint8Array([0, 128, 255, 77, 10, 20, 30, 200]);
    linearBufferToSrgb(buf, buf);
    expect(Array.from(buf)).toEqual([0, linearToSrgb8(128 / 255), 255, 77, linearToSrgb8(10 / 255), linearToSrgb8(20 / 255), linearToSrgb8(30 / 255), 200]);
    expect(buf[1]).toBe(188); // 128/255 = 0.50196 -> 0.7366·255 = 187.8
  });
  it('rejects mismatched lengths', () => {
    expect(() => linearBufferToSrgb(new Float32Array(8), new Uint8Array(4))).toThrow(/length/);
    expect(() => linearBufferToSrgb(new Float32Array(6), new Uint8Array(6))).toThrow(/multiple of 4/);
  });
});

describe('flipRowsInPlace (WebGL readPixels returns the bottom row first) and blitTile', () => {
  it('reverses rows for odd and even heights and is its own inverse', () => {
    for (const H of [1, 2, 3, 4]) {
      const W = 2;
      const a = new Uint8Array(W * H * 4).map((_, i) => i);
      const orig = a.slice();
      flipRowsInPlace(a, W, H);
      for (let y = 0; y < H; y++) expect(Array.from(a.subarray(y * 8, y * 8 + 8))).toEqual(Array.from(orig.subarray((H - 1 - y) * 8, (H - y) * 8)));
      flipRowsInPlace(a, W, H);
      expect(a).toEqual(orig);
    }
  });
  it('blitTile places a tile at its offset', () => {
    const img = new Uint8Array(3 * 2 * 4);
    blitTile(img, 3, new Uint8Array([1, 2, 3, 4, 5, 6, 7, 8]), 1, 1, 2, 1);
    expect(Array.from(img.subarray(16, 24))).toEqual([1, 2, 3, 4, 5, 6, 7, 8]);
    expect(img.subarray(0, 16).every((v) => v === 0)).toBe(true);
    expect(() => blitTile(img, 3, new Uint8Array(8), 2, 1, 2, 1)).toThrow(/outside/);
  });
});
