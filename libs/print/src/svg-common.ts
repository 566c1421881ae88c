// Shared pieces of the SVG companions: escaping, number formatting, fonts, palette checks, ticks.

const { ceil, floor, log10, max, pow, round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export interface FontBytes {
  /** Lato Regular as woff2 (e.g. read by the caller from @fontsource/lato). */
  regular?: Uint8Array;
  /** Lato Bold as woff2. */
  bold?: Uint8Array;
}

export interface PlotPalette {
  positive: string;
  negative: string;
  background: string;
  /** Ink for text. */
  label: string;
  /** Ink for axes and ticks; defaults to label. */
  axes?: string;
}

const HEX = /^#(?:[0-9a-fA-F]{3}|[0-9a-fA-F]{6})$/;

/** Colours go into attributes verbatim, so only #rgb / #rrggbb is accepted. */
export function checkPalette(p: PlotPalette): Required<PlotPalette> {
  if (!p || typeof p !== 'object') throw new RangeError('palette must be an object with positive, negative, background and label colours');
  for (const k of ['positive', 'negative', 'background', 'label'] as const) {
    if (typeof p[k] !== 'string' || !HEX.test(p[k])) throw new RangeError(`palette.${k} must be a colour like #1a2b3c (got ${JSON.stringify(p[k])})`);
  }
  if (p.axes !== undefined && (typeof p.axes !== 'string' || !HEX.test(p.axes))) throw new RangeError(`palette.axes must be a colour like #1a2b3c (got ${JSON.stringify(p.axes)})`);
  return { ...p, axes: p.axes ?? p.label };
}

export function checkSizeMm(widthMm: number, heightMm: number): void {
  for (const [k, v] of [['widthMm', widthMm], ['heightMm', heightMm]] as const) {
    if (typeof v !== 'number' || !Number.isFinite(v) || v < 10 || v > 1000) throw new RangeError(`${k} must be a number of millimetres in 10..1000 (got ${String(v)})`);
  }
}

export function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&apos;');
}

/** Coordinates in mm with 3 decimals (1 µm): plenty for print, keeps files small. */
export function f(x: number): string {
  const s = (round(x * 1000) / 1000).toString();
  return s === '-0' ? '0' : s;
}

/** Our own base64 (RFC 4648 §4): the libs avoid Node's Buffer, and btoa needs a binary string copy. */
export function base64(bytes: Uint8Array): string {
  const A = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789+/';
  let out = '';
  let i = 0;
  for (; i + 2 < bytes.length; i += 3) {
    const v = (bytes[i] << 16) | (bytes[i + 1] << 8) | bytes[i + 2];
    out += A[v >> 18] + A[(v >> 12) & 63] + A[(v >> 6) & 63] + A[v & 63];
  }
  const rest = bytes.length - i;
  if (rest === 1) {
    const v = bytes[i] << 16;
    out += A[v >> 18] + A[(v >> 12) & 63] + '==';
  } else if (rest === 2) {
    const v = (bytes[i] << 16) | (bytes[i + 1] << 8);
    out += A[v >> 18] + A[(v >> 12) & 63] + A[(v >> 6) & 63] + '=';
  }
  return out;
}

/** <style> with the Lato faces embedded as data URIs, or a comment saying the font is left to the viewer. */
export function fontStyle(fonts: FontBytes | undefined, extraCss = ''): string {
  const faces: string[] = [];
  if (fonts?.regular) faces.push(`@font-face{font-family:"Lato";font-weight:400;font-style:normal;src:url(data:font/woff2;base64,${base64(fonts.regular)}) format("woff2");}`);
  if (fonts?.bold) faces.push(`@font-face{font-family:"Lato";font-weight:700;font-style:normal;src:url(data:font/woff2;base64,${base64(fonts.bold)}) format("woff2");}`);
  const note = faces.length
    ? ''
    : '<!-- No font bytes were passed: text asks for Lato and falls back to the viewer\'s sans-serif, so line widths may differ slightly. -->\n';
  const family = faces.length ? '"Lato"' : '"Lato", sans-serif';
  return `${note}<style type="text/css"><![CDATA[\n${faces.join('\n')}\ntext{font-family:${family};}\n${extraCss}]]></style>`;
}

export function svgOpen(widthMm: number, heightMm: number, title: string, desc: string): string {
  return (
    `<?xml version="1.0" encoding="UTF-8" standalone="no"?>\n` +
    `<svg xmlns="http://www.w3.org/2000/svg" version="1.1" width="${f(widthMm)}mm" height="${f(heightMm)}mm" viewBox="0 0 ${f(widthMm)} ${f(heightMm)}">\n` +
    `<title>${esc(title)}</title>\n<desc>${esc(desc)}</desc>\n`
  );
}

/** Round steps 1, 2, 5 x 10^k (common practice for axis ticks). */
export function niceStep(span: number, targetCount: number): number {
  const raw = span / max(1, targetCount);
  const p = pow(10, floor(log10(raw)));
  const m = raw / p;
  return (m <= 1 ? 1 : m <= 2 ? 2 : m <= 5 ? 5 : 10) * p;
}

/** Tick values k*step inside [lo, hi] (inclusive with a small tolerance). */
export function ticks(lo: number, hi: number, step: number): number[] {
  const out: number[] = [];
  const eps = step * 1e-9;
  for (let k = ceil((lo - eps) / step); k * step <= hi + eps; k++) out.push(k * step);
  return out;
}

/** Label for a tick value with as many decimals as the step needs. */
export function tickLabel(v: number, step: number): string {
  const dec = max(0, -floor(log10(step) + 1e-9));
  const s = v.toFixed(dec);
  return (s.startsWith('-') && Number(s) === 0 ? s.slice(1) : s).replace('-', '−');
}

/**
 * Ticks for an axis from lo to hi: a round step (1, 2, 5 × 10^k) giving at least `minCount` ticks (so an axis
 * never shows 0 alone), at most about one per `minGap` of length when the axis is `length` long.
 */
export function axisTicks(lo: number, hi: number, length: number, minGap: number, minCount = 5): { step: number; values: number[] } {
  let step = niceStep(hi - lo, max(2, floor(length / minGap)));
  let values = ticks(lo, hi, step);
  // Smaller round steps (÷2, ÷2.5, ÷2: 10 → 5 → 2 → 1) until there are enough ticks.
  for (let i = 0; values.length < minCount && i < 12; i++) {
    const m = round(step / 10 ** floor(log10(step) + 1e-9));
    step = m === 5 ? (step * 2) / 5 : step / 2;
    values = ticks(lo, hi, step);
  }
  return { step, values };
}
