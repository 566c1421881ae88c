import { converter } from 'culori';
import { parseHex } from './hex';

/**
 * APPROXIMATE check whether an sRGB colour is printable on a typical coated-paper CMYK press. No ICC profile
 * is used. Heuristic: in CIELAB (D50, the illuminant print characterisation data is measured under) the
 * printable solid is modelled, per hue angle, as a triangle in the (C*, L*) plane from the paper black
 * (L* 16) through the hue's cusp to the paper white (L* 95); cusps are the six solid primaries and
 * secondaries of a FOGRA39-like characterisation (values from memory, rounded; see PRINT_CUSPS), linearly
 * interpolated in hue. Limits: real gamut boundaries are curved (this triangle under-estimates chroma between
 * cusp and white/black, so it flags some printable colours: it errs on the cautious side), separations,
 * total ink limits and paper differ by press; final decisions belong to a real ICC soft-proof.
 */
export const PRINT_CUSPS: readonly { name: string; h: number; L: number; C: number }[] = [
  { name: 'red (M+Y)', h: 35, L: 47, C: 83 },
  { name: 'yellow', h: 93, L: 89, C: 93 },
  { name: 'green (C+Y)', h: 157, L: 50, C: 70 },
  { name: 'cyan', h: 234, L: 55, C: 62 },
  { name: 'blue (C+M)', h: 296, L: 24, C: 51 },
  { name: 'magenta', h: 358, L: 48, C: 74 },
];
export const PRINT_BLACK_L = 16;
export const PRINT_WHITE_L = 95;
/** Tolerance in C* before a colour is flagged, so colours sitting on the modelled boundary pass. */
export const PRINT_CHROMA_TOLERANCE = 2;

const toLab = converter('lab');

export interface PrintGamutReport {
  outOfGamut: boolean;
  /** CIELAB D50 of the colour. */
  L: number;
  C: number;
  h: number;
  /** Modelled largest printable C* at this L* and hue. */
  maxChroma: number;
  reason?: string;
}

function cuspAt(h: number): { L: number; C: number } {
  const cs = PRINT_CUSPS;
  for (let i = 0; i < cs.length; i++) {
    const a = cs[i];
    const b = cs[(i + 1) % cs.length];
    const span = (b.h - a.h + 360) % 360;
    const off = (h - a.h + 360) % 360;
    if (off <= span) {
      const t = span === 0 ? 0 : off / span;
      return { L: a.L + t * (b.L - a.L), C: a.C + t * (b.C - a.C) };
    }
  }
  return cs[0];
}

export function printGamutReport(hex: string): PrintGamutReport {
  const lab = toLab(parseHex(hex));
  const L = lab.l;
  const C = Math.hypot(lab.a, lab.b);
  const h = ((Math.atan2(lab.b, lab.a) * 180) / Math.PI + 360) % 360;
  const cusp = cuspAt(h);
  let maxChroma: number;
  if (L <= PRINT_BLACK_L || L >= PRINT_WHITE_L) maxChroma = 0;
  else if (L <= cusp.L) maxChroma = (cusp.C * (L - PRINT_BLACK_L)) / (cusp.L - PRINT_BLACK_L);
  else maxChroma = (cusp.C * (PRINT_WHITE_L - L)) / (PRINT_WHITE_L - cusp.L);
  const base = { L, C, h, maxChroma };
  // Neutrals beyond paper white or press black simply print as paper or as the darkest black (common
  // practice), so only chromatic colours there are flagged (by the chroma test below, maxChroma being 0).
  if (L >= PRINT_WHITE_L && C > PRINT_CHROMA_TOLERANCE) return { ...base, outOfGamut: true, reason: `coloured and lighter than paper white (L* ${L.toFixed(0)} > ${PRINT_WHITE_L})` };
  if (L <= PRINT_BLACK_L && C > PRINT_CHROMA_TOLERANCE) return { ...base, outOfGamut: true, reason: `coloured and darker than the press black (L* ${L.toFixed(0)} < ${PRINT_BLACK_L})` };
  if (C > maxChroma + PRINT_CHROMA_TOLERANCE) {
    return { ...base, outOfGamut: true, reason: `chroma C* ${C.toFixed(0)} above the approximate printable ${maxChroma.toFixed(0)} at this lightness and hue` };
  }
  return { ...base, outOfGamut: false };
}

/** Approximate (see printGamutReport): true when the colour likely falls outside a coated-paper CMYK gamut. */
export function outOfPrintGamut(hex: string): boolean {
  return printGamutReport(hex).outOfGamut;
}
