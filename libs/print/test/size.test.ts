import { describe, expect, it } from 'vitest';
import { COLUMN_PRESETS, DPI_CHOICES, exportPixelSize, inchesToMm, mmToInches, pixelsFor, pixelsPerMetre, planTiles } from '../src';

describe('export size arithmetic (1 in = 25.4 mm exactly, international inch of 1959)', () => {
  it('89 × 60 mm at 300 dpi is 1051 × 709 px (89/25.4*300 = 1051.18, 60/25.4*300 = 708.66)', () => {
    expect(exportPixelSize({ widthMm: 89, heightMm: 60, dpi: 300 })).toEqual({ width: 1051, height: 709 });
  });
  it('180 × 120 mm at 600 dpi is 4252 × 2835 px (4251.97, 2834.65)', () => {
    expect(exportPixelSize({ widthMm: 180, heightMm: 120, dpi: 600 })).toEqual({ width: 4252, height: 2835 });
  });
  it('pixelsFor rounds to the nearest pixel; inches <-> mm round-trip', () => {
    expect(pixelsFor(25.4, 300)).toBe(300);
    expect(pixelsFor(25.4 / 600, 300)).toBe(1); // 0.5 px rounds up
    expect(inchesToMm(1)).toBe(25.4);
    expect(mmToInches(50.8)).toBeCloseTo(2, 12);
  });
  it('pixelsPerMetre(300) = 11811 (PNG specification §11.3.5.3 pHYs, unit 1 = metre: 300/0.0254 = 11811.02)', () => {
    expect(pixelsPerMetre(300)).toBe(11811);
    expect(pixelsPerMetre(600)).toBe(23622);
    expect(pixelsPerMetre(1200)).toBe(47244);
  });
  it('rejects bad input with the field named', () => {
    expect(() => pixelsFor(-1, 300)).toThrow(/lengthMm/);
    expect(() => pixelsFor(10, 0)).toThrow(/dpi/);
    expect(() => exportPixelSize({ widthMm: 10, heightMm: Number.NaN, dpi: 300 })).toThrow(/lengthMm/);
  });
  it('column presets sit inside the usual ranges (common practice, no source) and dpi choices match the recipe', () => {
    expect(COLUMN_PRESETS.single.widthMm).toBeGreaterThanOrEqual(85);
    expect(COLUMN_PRESETS.single.widthMm).toBeLessThanOrEqual(90);
    expect(COLUMN_PRESETS.oneAndHalf.widthMm).toBeGreaterThanOrEqual(120);
    expect(COLUMN_PRESETS.oneAndHalf.widthMm).toBeLessThanOrEqual(140);
    expect(COLUMN_PRESETS.double.widthMm).toBeGreaterThanOrEqual(170);
    expect(COLUMN_PRESETS.double.widthMm).toBeLessThanOrEqual(180);
    expect([...DPI_CHOICES]).toEqual([300, 600, 1200]);
  });
});

describe('planTiles', () => {
  it('20000 × 9000 with maxTile 8192: tiles <= 8192, areas sum to the image, no two overlap, all inside', () => {
    const W = 20000;
    const H = 9000;
    const tiles = planTiles(W, H, 8192);
    expect(tiles.length).toBe(6); // ceil(20000/8192) = 3 columns, ceil(9000/8192) = 2 rows
    let area = 0;
    for (const t of tiles) {
      expect(t.width).toBeLessThanOrEqual(8192);
      expect(t.height).toBeLessThanOrEqual(8192);
      expect(t.x).toBeGreaterThanOrEqual(0);
      expect(t.y).toBeGreaterThanOrEqual(0);
      expect(t.x + t.width).toBeLessThanOrEqual(W);
      expect(t.y + t.height).toBeLessThanOrEqual(H);
      area += t.width * t.height;
    }
    expect(area).toBe(W * H);
    for (let i = 0; i < tiles.length; i++) {
      for (let j = i + 1; j < tiles.length; j++) {
        const a = tiles[i];
        const b = tiles[j];
        const overlap = a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height;
        expect(overlap).toBe(false);
      }
    }
  });
  it('view offsets are what PerspectiveCamera.setViewOffset(fullWidth, fullHeight, x, y, width, height) takes', () => {
    for (const t of planTiles(20000, 9000)) {
      expect(t.view).toEqual({ fullWidth: 20000, fullHeight: 9000, x: t.x, y: t.y, width: t.width, height: t.height });
    }
  });
  it('every pixel of a small odd-sized image is covered exactly once (per-pixel count)', () => {
    const W = 101;
    const H = 37;
    const count = new Uint8Array(W * H);
    const tiles = planTiles(W, H, 16);
    for (const t of tiles) for (let y = t.y; y < t.y + t.height; y++) for (let x = t.x; x < t.x + t.width; x++) count[y * W + x]++;
    expect(count.every((c) => c === 1)).toBe(true);
    const widths = new Set(tiles.map((t) => t.width));
    expect(Math.max(...widths) - Math.min(...widths)).toBeLessThanOrEqual(1); // balanced, no sliver
  });
  it('an image within the limit is one tile; bad sizes are rejected', () => {
    expect(planTiles(4000, 3000)).toHaveLength(1);
    expect(() => planTiles(0, 10)).toThrow(/width/);
    expect(() => planTiles(10, 10.5)).toThrow(/height/);
  });
});
