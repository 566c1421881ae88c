// Pixel and PNG helpers shared by the browser tests.
import assert from 'node:assert/strict';

/** '#c8553d' -> [200, 85, 61] */
export function hexRgb(hex) {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) throw new Error(`not a #rrggbb colour: ${hex}`);
  return [parseInt(m[1], 16), parseInt(m[2], 16), parseInt(m[3], 16)];
}

/** HSV with hue in degrees, s and v in 0..1 (the usual hexcone model, common practice). */
export function hsv([r, g, b]) {
  const R = r / 255;
  const G = g / 255;
  const B = b / 255;
  const max = Math.max(R, G, B);
  const min = Math.min(R, G, B);
  const d = max - min;
  let h = 0;
  if (d > 0) {
    if (max === R) h = 60 * (((G - B) / d) % 6);
    else if (max === G) h = 60 * ((B - R) / d + 2);
    else h = 60 * ((R - G) / d + 4);
  }
  if (h < 0) h += 360;
  return { h, s: max === 0 ? 0 : d / max, v: max };
}

function hueDistance(a, b) {
  const d = Math.abs(a - b) % 360;
  return d > 180 ? 360 - d : d;
}

/**
 * Counts pixels that read as each palette colour under shading. Lighting scales brightness and, with
 * specular highlights, pulls saturation down; the hue survives. So a pixel counts for a colour when its hue is
 * within HUE_TOL degrees of the colour's hue and it is clearly coloured (s >= MIN_S) and not near black.
 * Tolerances are our own choice (common practice for such checks), wide enough for shading, narrow enough
 * that the two default palette hues (verdigris about 178°, ochre about 34°) and the near-white background can never be confused.
 * Fully transparent pixels never count.
 */
const HUE_TOL = 20;
const MIN_S = 0.25;
const MIN_V = 0.12;

export function countPhasePixels(png, colours) {
  const targets = colours.map((c) => hsv(hexRgb(c)));
  const counts = colours.map(() => 0);
  const { width, height, data } = png;
  for (let i = 0; i < width * height; i++) {
    if (data[4 * i + 3] === 0) continue;
    const p = hsv([data[4 * i], data[4 * i + 1], data[4 * i + 2]]);
    if (p.s < MIN_S || p.v < MIN_V) continue;
    targets.forEach((t, k) => {
      if (hueDistance(p.h, t.h) <= HUE_TOL) counts[k] += 1;
    });
  }
  return { counts, total: width * height };
}

/** PNG chunks (PNG specification §5.3): length, type, data; IHDR first. */
export function pngChunks(buf) {
  const sig = [137, 80, 78, 71, 13, 10, 26, 10];
  assert.deepEqual([...buf.subarray(0, 8)], sig, 'the file starts with the PNG signature');
  const chunks = [];
  let off = 8;
  while (off + 8 <= buf.length) {
    const len = buf.readUInt32BE(off);
    const type = buf.toString('ascii', off + 4, off + 8);
    chunks.push({ type, data: buf.subarray(off + 8, off + 8 + len) });
    off += 12 + len;
    if (type === 'IEND') break;
  }
  return chunks;
}
