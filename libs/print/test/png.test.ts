import zlib from 'node:zlib';
import { PNG } from 'pngjs';
import { describe, expect, it } from 'vitest';
import { crc32, encodeRgbaPng, finishPng, parsePngChunks, pngChunk, readPngInfo, PNG_SIGNATURE } from '../src';

const enc = new TextEncoder();

/** A deterministic RGBA test image with gradients, flat areas and transparency. */
function testImage(W: number, H: number): Uint8Array {
  const a = new Uint8Array(W * H * 4);
  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      const i = 4 * (y * W + x);
      a[i] = (x * 37) & 255;
      a[i + 1] = (y * 91) & 255;
      a[i + 2] = x < W / 2 ? 200 : (x * y) & 255;
      a[i + 3] = (x + y) % 3 === 0 ? 255 : 128;
    }
  }
  return a;
}

/** Independent chunk walker with Node's zlib.crc32 (Node >= 20.15) as the reference CRC. */
function chunksByZlib(bytes: Uint8Array): { type: string; ok: boolean }[] {
  const out = [];
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  for (let o = 8; o < bytes.length; ) {
    const len = dv.getUint32(o);
    const type = String.fromCharCode(...bytes.subarray(o + 4, o + 8));
    const crc = dv.getUint32(o + 8 + len);
    out.push({ type, ok: zlib.crc32(bytes.subarray(o + 4, o + 8 + len)) === crc });
    o += 12 + len;
  }
  return out;
}

describe('CRC-32 (PNG specification §5.5, ISO 3309 polynomial)', () => {
  it('check value: CRC-32 of "123456789" is 0xCBF43926 (the standard CRC-32 check value)', () => {
    expect(crc32(enc.encode('123456789'))).toBe(0xcbf43926);
  });
  it('agrees with Node zlib.crc32 on random data and supports running updates', () => {
    const data = new Uint8Array(10_000).map((_, i) => (i * 2654435761) >>> 24);
    expect(crc32(data)).toBe(zlib.crc32(data));
    expect(crc32(data.subarray(5000), crc32(data.subarray(0, 5000)))).toBe(zlib.crc32(data));
  });
  it('IEND chunk CRC is AE 42 60 82 (every PNG ends with these bytes)', () => {
    expect(Array.from(pngChunk('IEND', new Uint8Array(0)).subarray(8))).toEqual([0xae, 0x42, 0x60, 0x82]);
  });
});

describe('encodeRgbaPng', () => {
  for (const filter of ['none', 'up', 'paeth', 'adaptive'] as const) {
    it(`filter ${filter}: pngjs decodes the same pixels; pHYs and sRGB sit right after IHDR`, () => {
      const W = 23;
      const H = 17;
      const rgba = testImage(W, H);
      const png = encodeRgbaPng(W, H, rgba, { dpi: 300, filter });
      const dec = PNG.sync.read(Buffer.from(png));
      expect(dec.width).toBe(W);
      expect(dec.height).toBe(H);
      expect(new Uint8Array(dec.data)).toEqual(rgba);
      const info = readPngInfo(png);
      expect(info.chunks.slice(0, 3)).toEqual(['IHDR', 'pHYs', 'sRGB']);
      expect(info.bitDepth).toBe(8);
      expect(info.colorType).toBe(6);
      expect(chunksByZlib(png).every((c) => c.ok)).toBe(true);
    });
  }
  it('rejects a buffer of the wrong length, naming it', () => {
    expect(() => encodeRgbaPng(2, 2, new Uint8Array(15), { dpi: 300 })).toThrow(/rgba length 15/);
    expect(() => encodeRgbaPng(0, 2, new Uint8Array(0), { dpi: 300 })).toThrow(/width/);
  });
});

describe('finishPng (PNG specification §11.3.5.3 pHYs, §11.3.3.5 sRGB)', () => {
  function pngjsImage(W: number, H: number, rgba: Uint8Array): Uint8Array {
    const p = new PNG({ width: W, height: H });
    Buffer.from(rgba).copy(p.data);
    return new Uint8Array(PNG.sync.write(p));
  }

  it('stamps pHYs 11811/11811 unit 1 and sRGB intent 0 on a pngjs file; CRCs verify; pixels unchanged', () => {
    const W = 9;
    const H = 5;
    const rgba = testImage(W, H);
    const src = pngjsImage(W, H, rgba);
    expect(readPngInfo(src).pHYs).toBeUndefined();
    const out = finishPng(src, { dpi: 300 });
    const info = readPngInfo(out);
    expect(info.pHYs).toEqual({ x: 11811, y: 11811, unit: 1 });
    expect(info.srgb).toBe(0);
    expect(info.chunks.slice(0, 3)).toEqual(['IHDR', 'pHYs', 'sRGB']);
    expect(info.crcOk).toBe(true);
    expect(chunksByZlib(out).every((c) => c.ok)).toBe(true);
    expect(new Uint8Array(PNG.sync.read(Buffer.from(out)).data)).toEqual(rgba);
  });

  it('replaces existing pHYs, sRGB, gAMA and iCCP chunks rather than adding a second set', () => {
    const base = encodeRgbaPng(3, 2, testImage(3, 2), { dpi: 600 });
    const chunks = parsePngChunks(base);
    const gama = pngChunk('gAMA', new Uint8Array([0, 0, 0xb1, 0x8f])); // 45455 = 1/2.2 × 100000
    const iccp = pngChunk('iCCP', new Uint8Array([...enc.encode('x'), 0, 0, 0x78, 0x9c, 3, 0, 0, 0, 0, 1]));
    const parts = [PNG_SIGNATURE, pngChunk('IHDR', chunks[0].data), gama, iccp, ...chunks.slice(1).map((c) => pngChunk(c.type, c.data))];
    const messy = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
    let o = 0;
    for (const p of parts) {
      messy.set(p, o);
      o += p.length;
    }
    expect(readPngInfo(messy).chunks.filter((t) => t === 'pHYs')).toHaveLength(1);
    const out = finishPng(messy, { dpi: 1200 });
    const info = readPngInfo(out);
    expect(info.chunks.filter((t) => ['pHYs', 'sRGB', 'gAMA', 'iCCP'].includes(t))).toEqual(['pHYs', 'sRGB']);
    expect(info.pHYs).toEqual({ x: 47244, y: 47244, unit: 1 });
    expect(new Uint8Array(PNG.sync.read(Buffer.from(out)).data)).toEqual(testImage(3, 2));
  });

  it('refuses a non-PNG, a truncated PNG and a PNG with a bad CRC', () => {
    const good = encodeRgbaPng(2, 2, testImage(2, 2), { dpi: 300 });
    expect(() => finishPng(enc.encode('GIF89a...'), { dpi: 300 })).toThrow(/signature/);
    expect(() => finishPng(good.subarray(0, good.length - 6), { dpi: 300 })).toThrow(/truncated/);
    const bad = good.slice();
    bad[8 + 8 + 3] ^= 0xff; // a byte of IHDR's data
    expect(() => finishPng(bad, { dpi: 300 })).toThrow(/CRC mismatch in the IHDR/);
    expect(readPngInfo(bad).crcOk).toBe(false);
  });
});
