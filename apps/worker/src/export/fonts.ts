import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import * as fontkit from 'fontkit';
import { svgDrawnText, uncoveredCharacters, withFallbackFace, type FallbackFace, type FontBytes } from '@psiform/print';

// The faces every vector companion is set in, read once from the registry packages the web client ships too:
// Lato (the house face, Latin only) and DejaVu Sans for what Lato lacks (Greek ψ, sub/superscript digits, ≈),
// the same fallback order as the Studio's CSS. WOFF2 for SVG data URIs (smallest); WOFF (zlib) for pdfkit,
// whose fontkit WOFF2 reader broke on composite glyphs (Å) here.

/** The family name the fallback face goes by in SVG, in PDF tspans and in the web client's CSS. */
export const FALLBACK_FAMILY = 'DejaVu Sans';

interface Face {
  woff2: Uint8Array;
  woff: Buffer;
}
const cache = new Map<string, Face>();
function face(pkg: '@fontsource/lato' | '@fontsource/dejavu-sans', file: string): Face {
  const key = `${pkg}/${file}`;
  let f = cache.get(key);
  if (!f) {
    const dir = join(dirname(require.resolve(`${pkg}/package.json`)), 'files');
    f = { woff2: new Uint8Array(readFileSync(join(dir, `${file}.woff2`))), woff: readFileSync(join(dir, `${file}.woff`)) };
    cache.set(key, f);
  }
  return f;
}

const lato = (bold: boolean) => face('@fontsource/lato', bold ? 'lato-latin-700-normal' : 'lato-latin-400-normal');
const fallback = (bold: boolean) => face('@fontsource/dejavu-sans', bold ? 'dejavu-sans-latin-700-normal' : 'dejavu-sans-latin-400-normal');

/** Lato Regular and Bold (latin subset, woff2) for SVG companions. */
export function latoFonts(): FontBytes {
  return { regular: lato(false).woff2, bold: lato(true).woff2 };
}

/** WOFF bytes for pdfkit's registerFont. */
export function pdfFaces(): { lato: { regular: Buffer; bold: Buffer }; fallback: { regular: Buffer; bold: Buffer } } {
  return { lato: { regular: lato(false).woff, bold: lato(true).woff }, fallback: { regular: fallback(false).woff, bold: fallback(true).woff } };
}

const cmaps = new Map<string, fontkit.Font>();
function cmap(which: 'lato' | 'fallback'): fontkit.Font {
  let f = cmaps.get(which);
  if (!f) {
    f = fontkit.create(which === 'lato' ? lato(false).woff : fallback(false).woff) as fontkit.Font;
    cmaps.set(which, f);
  }
  return f;
}

/** True when Lato (regular; the bold cut has the same character set) has a glyph for the code point. */
export const latoCovers = (cp: number): boolean => cmap('lato').hasGlyphForCodePoint(cp);
/** True when Lato or the fallback face can draw the code point. */
export const facesCover = (cp: number): boolean => latoCovers(cp) || cmap('fallback').hasGlyphForCodePoint(cp);

/**
 * An SVG companion with the fallback face embedded when, and only when, its text has characters Lato lacks (the
 * face costs about 250 kB). Also returns the characters neither face can draw, for the preflight.
 */
export function withFallbackWhereNeeded(svg: string): { svg: string; unglyphed: string[] } {
  const text = svgDrawnText(svg);
  const beyondLato = uncoveredCharacters(text, latoCovers);
  if (!beyondLato.length) return { svg, unglyphed: [] };
  const f: FallbackFace = { family: FALLBACK_FAMILY, regular: fallback(false).woff2, bold: fallback(true).woff2, format: 'woff2' };
  return { svg: withFallbackFace(svg, f), unglyphed: uncoveredCharacters(text, facesCover) };
}
