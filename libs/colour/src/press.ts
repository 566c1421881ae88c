// Colours on a named press condition through a real ICC profile (replaces the old approximate gamut heuristic).
// The transform is an interface so apps can inject another implementation; `iccPressTransform` is the pure one
// (see icc.ts), built from the profile bytes the app reads (libs do no I/O).
import { converter, differenceCiede2000, formatHex, type Lab } from 'culori';
import { parseHex } from './hex';
import { evalLut, labToPcsV2, pcsV2ToLab, readIccProfile, IccError, type IccIntent } from './icc';

const { max, min, round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export interface PressConditionInfo {
  /** Our id: 'fogra39' | 'gracol' | 'swop' (libs/contracts PRESS_CONDITIONS). */
  id: string;
  /** The press condition by its trade name, e.g. "FOGRA39 (ISO 12647-2 coated)". */
  name: string;
  /** Total area coverage limit the profile was built with, in percent. */
  tacPercent: number;
}

/** CMYK in percent (0..100 each), C, M, Y, K. */
export type Cmyk = [number, number, number, number];
/** CIELAB under D50 (the ICC profile connection space), L*, a*, b*. */
export type LabD50 = [number, number, number];

export interface PressTransform {
  condition: PressConditionInfo;
  /** The rendering intent used both ways. */
  intent: IccIntent;
  labToCmyk(lab: LabD50): Cmyk;
  cmykToLab(cmyk: Cmyk): LabD50;
}

/**
 * The pure transform of one CMYK output profile, relative colorimetric (ICC intent 1) without black point
 * compensation: the intent a proof of spot-like swatch colours wants, and the one `transicc -t1` reproduces.
 */
export function iccPressTransform(profileBytes: Uint8Array, condition: PressConditionInfo, intent: IccIntent = 'relative'): PressTransform {
  const p = readIccProfile(profileBytes);
  if (p.colourSpace !== 'CMYK') throw new IccError(`${condition.id}: the profile's colour space is ${p.colourSpace.trim()}, not CMYK`);
  if (p.pcs !== 'Lab ') throw new IccError(`${condition.id}: the profile's connection space is ${p.pcs.trim()}; we evaluate CIELAB ones`);
  const b2a = p.b2a(intent);
  const a2b = p.a2b(intent);
  if (b2a.inputs !== 3 || b2a.outputs !== 4 || a2b.inputs !== 4 || a2b.outputs !== 3) throw new IccError(`${condition.id}: unexpected table shapes`);
  return {
    condition,
    intent,
    labToCmyk(lab) {
      const o = evalLut(b2a, labToPcsV2(lab[0], lab[1], lab[2]));
      return [o[0] * 100, o[1] * 100, o[2] * 100, o[3] * 100];
    },
    cmykToLab(cmyk) {
      return pcsV2ToLab(evalLut(a2b, cmyk.map((c) => min(100, max(0, c)) / 100)));
    },
  };
}

const toLabD50 = converter('lab');
const toRgb = converter('rgb');
// culori's CIEDE2000 converts its inputs to its `lab65` mode; handing it D50 numbers labelled lab65 makes it
// compute ΔE00 on the D50 values as they are (no adaptation), which is what comparing two PCS colours needs.
const ciede2000 = differenceCiede2000();
export function deltaE2000Lab(a: LabD50, b: LabD50): number {
  return ciede2000({ mode: 'lab65', l: a[0], a: a[1], b: a[2] }, { mode: 'lab65', l: b[0], a: b[1], b: b[2] });
}

/** sRGB hex (IEC 61966-2-1, adapted to D50 with Bradford as ICC sRGB profiles are) -> CIELAB D50. */
export function hexToLabD50(hex: string): LabD50 {
  const l = toLabD50(parseHex(hex)) as Lab;
  return [l.l, l.a, l.b];
}

/** CIELAB D50 -> the nearest sRGB hex (channels clipped): how a proofed colour looks on screen. */
export function labD50ToHex(lab: LabD50): string {
  const c = toRgb({ mode: 'lab', l: lab[0], a: lab[1], b: lab[2] });
  const clip = (x: number) => min(1, max(0, Number.isFinite(x) ? x : 0));
  return formatHex({ mode: 'rgb', r: clip(c.r), g: clip(c.g), b: clip(c.b) });
}

/**
 * ΔE00 of the sRGB -> CMYK -> CIELAB round trip above which a swatch is called out of gamut for the condition.
 * Our choice: ΔE00 ≈ 2 is just noticeable side by side (Sharma et al. 2005 discuss the scale); a swatch that
 * shifts by more than 3 on paper is visibly not the colour the art director chose.
 */
export const PRESS_DELTA_E_LIMIT = 3;

export interface PressSwatch {
  hex: string;
  /** CMYK the colour separates to, percent, rounded to 0.1. */
  cmyk: Cmyk;
  /** C + M + Y + K, percent. */
  totalInk: number;
  /** The colour as CIELAB D50, and as printed (CMYK -> CIELAB through the profile). */
  lab: LabD50;
  printedLab: LabD50;
  /** ΔE00 between the two. */
  deltaE00: number;
  inGamut: boolean;
  /** The printed colour shown on screen (soft proof), sRGB hex. */
  proofHex: string;
  /** Names the press condition ("FOGRA39 …"), so no number travels without it. */
  condition: string;
}

const r1 = (x: number) => round(x * 10) / 10;
const r2 = (x: number) => round(x * 100) / 100;

export function pressCheck(hex: string, t: PressTransform): PressSwatch {
  const lab = hexToLabD50(hex);
  const cmyk = t.labToCmyk(lab);
  const printedLab = t.cmykToLab(cmyk);
  const deltaE00 = deltaE2000Lab(lab, printedLab);
  return {
    hex: hex.toLowerCase(),
    cmyk: cmyk.map(r1) as Cmyk,
    totalInk: r1(cmyk.reduce((s, c) => s + c, 0)),
    lab: lab.map(r2) as LabD50,
    printedLab: printedLab.map(r2) as LabD50,
    deltaE00: r2(deltaE00),
    inGamut: deltaE00 <= PRESS_DELTA_E_LIMIT,
    proofHex: labD50ToHex(printedLab),
    condition: t.condition.name,
  };
}
