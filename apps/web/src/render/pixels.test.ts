import { describe, expect, it } from 'vitest';
import { linearBufferToSrgb, readPngInfo } from '@psiform/print';
import { encodeFigurePng, FAST_PNG_PIXELS, halfTable, halfToFloat, halfToSrgb8 } from './pixels';

describe('halfToSrgb8', () => {
  it('gives the same bytes as halfToFloat + linearBufferToSrgb for every half-float bit pattern', () => {
    // Each of the 65536 codes once in every channel (shifted by one channel per pixel), so colour and alpha both see all.
    const src = new Uint16Array(65536 * 4);
    for (let i = 0; i < 65536; i++) for (let c = 0; c < 4; c++) src[4 * i + c] = (i + c * 16411) & 0xffff;
    const viaFloat = linearBufferToSrgb(halfToFloat(src, new Float32Array(src.length)), new Uint8Array(src.length));
    const viaTable = halfToSrgb8(src, new Uint8Array(src.length));
    expect(Buffer.from(viaTable).equals(Buffer.from(viaFloat))).toBe(true);
  });

  it('maps half 0.5 (0x3800) to sRGB 188 and 1.0 (0x3c00) to 255 (IEC 61966-2-1: 1.055·0.5^(1/2.4) − 0.055 = 0.7354)', () => {
    expect(halfTable()[0x3800]).toBe(0.5);
    const out = halfToSrgb8(new Uint16Array([0x3800, 0x3c00, 0, 0x3800]), new Uint8Array(4));
    expect(Array.from(out)).toEqual([188, 255, 0, 128]);
  });
});

describe('encodeFigurePng', () => {
  it('writes a valid PNG with pHYs for small and large images', () => {
    for (const [w, h] of [[4, 3], [2001, 2001]] as const) {
      const rgba = new Uint8Array(w * h * 4).map((_, i) => (i * 7) & 255);
      const info = readPngInfo(encodeFigurePng(w, h, rgba, 600));
      expect([info.width, info.height, info.crcOk, info.pHYs?.x]).toEqual([w, h, true, 23622]);
    }
    expect(2001 * 2001).toBeGreaterThan(FAST_PNG_PIXELS);
  });
});
