// Glyph coverage of the SVG companions' text. Lato (the house face) has no Greek, no sub/superscript digits
// (₀ ⁴ … ⁹) and no ≈, so "ψ > 0", "a₀" or "r²R²" would print as empty boxes (.notdef) wherever the file is read
// without a fallback. Two answers, both driven by the caller's coverage test (the libs do no font I/O):
//  - SVG (read by browsers and editors with per-character font fallback, CSS Fonts 4 §5): embed a second face
//    and name it after Lato in the font-family list;
//  - PDF (svg-to-pdfkit picks one font per element, no fallback): put each run Lato cannot draw in its own
//    <tspan font-family="…">, so the run is set in the second face.
// And the preflight is told which characters no embedded face can draw, so it never passes a file with boxes.

import { base64 } from './svg-common';

/** Decodes the five XML entities `esc` writes plus numeric references (XML 1.0 §4.1). */
function decodeEntity(e: string): string {
  if (e.startsWith('&#x')) return String.fromCodePoint(parseInt(e.slice(3, -1), 16));
  if (e.startsWith('&#')) return String.fromCodePoint(parseInt(e.slice(2, -1), 10));
  return ({ '&amp;': '&', '&lt;': '<', '&gt;': '>', '&quot;': '"', '&apos;': "'" } as Record<string, string>)[e] ?? e;
}

const TEXT_ELEMENT = /<text\b[^>]*>[\s\S]*?<\/text>/g;
const TOKEN = /&#x[0-9a-fA-F]+;|&#\d+;|&[a-z]+;|[\s\S]/gu;

/** Every character drawn by the <text> elements (tspans included), entities decoded, in document order. */
export function svgDrawnText(svg: string): string {
  let out = '';
  for (const m of svg.matchAll(TEXT_ELEMENT)) {
    for (const t of m[0].matchAll(/>([^<]+)</g)) out += t[1].replace(TOKEN, (x) => (x.startsWith('&') ? decodeEntity(x) : x));
  }
  return out;
}

/** The distinct characters of `text` (white space aside) for which `covers` is false, in first-seen order. */
export function uncoveredCharacters(text: string, covers: (codePoint: number) => boolean): string[] {
  const seen = new Set<string>();
  for (const ch of text) {
    if (/\s/u.test(ch) || seen.has(ch)) continue;
    if (!covers(ch.codePointAt(0)!)) seen.add(ch);
  }
  return [...seen];
}

export interface FallbackFace {
  /** CSS family name, e.g. "DejaVu Sans". */
  family: string;
  regular: Uint8Array;
  bold?: Uint8Array;
  /** MIME subtype of the bytes' format (CSS Fonts 4 §4.3.1): 'woff2' or 'woff'. */
  format: 'woff2' | 'woff';
}

/**
 * Adds `face` to the SVG's embedded fonts and to the text's font-family list after the faces already named, so a
 * reader sets only the characters the first face lacks in it. The SVG must carry the style block `fontStyle`
 * writes; without it the SVG is returned unchanged (it embeds no fonts at all, and its preflight says so).
 */
export function withFallbackFace(svg: string, face: FallbackFace): string {
  const rule = /text\{font-family:([^;}]*);\}/;
  const m = rule.exec(svg);
  if (!m || m[1].includes(`"${face.family}"`)) return svg;
  const src = (bytes: Uint8Array) => `src:url(data:font/${face.format};base64,${base64(bytes)}) format("${face.format}")`;
  const faces = [`@font-face{font-family:"${face.family}";font-weight:400;font-style:normal;${src(face.regular)};}`];
  if (face.bold) faces.push(`@font-face{font-family:"${face.family}";font-weight:700;font-style:normal;${src(face.bold)};}`);
  const names = m[1].split(',').map((x) => x.trim());
  const generic = names[names.length - 1] === 'sans-serif' ? names.pop() : undefined;
  const family = [...names, `"${face.family}"`, ...(generic ? [generic] : [])].join(',');
  return svg.replace(rule, `${faces.join('\n')}\ntext{font-family:${family};}`);
}

/**
 * Wraps every run of characters `covers` rejects, inside <text> elements, in <tspan font-family="family">. The
 * tspan has no position of its own, so the run continues the line where it stood (SVG 1.1 §10.5).
 */
export function wrapUncoveredRuns(svg: string, covers: (codePoint: number) => boolean, family: string): string {
  const open = `<tspan font-family="${family.replace(/"/g, '&quot;')}">`;
  return svg.replace(TEXT_ELEMENT, (el) =>
    el.replace(/>([^<]+)</g, (_all, body: string) => {
      let out = '';
      let inRun = false;
      for (const tok of body.match(TOKEN) ?? []) {
        const ch = tok.startsWith('&') ? decodeEntity(tok) : tok;
        const outside = !/\s/u.test(ch) && !covers(ch.codePointAt(0)!);
        if (outside !== inRun) {
          out += outside ? open : '</tspan>';
          inRun = outside;
        }
        out += tok;
      }
      return `>${out}${inRun ? '</tspan>' : ''}<`;
    }),
  );
}
