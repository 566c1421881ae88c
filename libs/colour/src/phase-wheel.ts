import { formatHex, inGamut } from 'culori';
import type { Hex } from './hex';

const { PI } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/**
 * Colour wheel for the complex phase arg ψ: OKLCH (Ottosson 2020, "A perceptual color space for image
 * processing") at constant lightness and chroma, hue = phase. Constant L and C make equal phase steps equal
 * steps in OKLab, so no phase looks more important than another, and hue 0 and 360 coincide (cyclic).
 * Gamut clamp: if the requested chroma does not fit sRGB at EVERY hue of that lightness, the whole wheel's
 * chroma is lowered to the largest that does (clipping hue by hue would make the wheel uneven).
 */
export interface PhaseWheelOptions {
  /** OKLCH L, 0..1. */
  lightness: number;
  /** OKLCH C (0..~0.37); lowered to fit sRGB at every hue. */
  chroma: number;
  /** Number of swatches, 3..360. */
  steps: number;
}

export interface PhaseWheel {
  lightness: number;
  /** Chroma actually used (after the gamut clamp). */
  chroma: number;
  requestedChroma: number;
  clamped: boolean;
  /** steps[i] is the colour of phase 2πi/steps. */
  steps: Hex[];
}

export const DEFAULT_WHEEL = { lightness: 0.7, chroma: 0.11 } as const;

const inSrgb = inGamut('rgb');
const HUE_PROBES = 720;

function fitsEveryHue(l: number, c: number): boolean {
  for (let i = 0; i < HUE_PROBES; i++) if (!inSrgb({ mode: 'oklch', l, c, h: (360 * i) / HUE_PROBES })) return false;
  return true;
}

/** Largest OKLCH chroma that is inside sRGB at every hue for this lightness (bisection). */
export function maxWheelChroma(lightness: number): number {
  let lo = 0;
  let hi = 0.4;
  for (let i = 0; i < 30; i++) {
    const mid = (lo + hi) / 2;
    if (fitsEveryHue(lightness, mid)) lo = mid;
    else hi = mid;
  }
  return lo;
}

export function phaseWheel(opts: PhaseWheelOptions): PhaseWheel {
  const { lightness, chroma, steps } = opts;
  if (!(lightness > 0 && lightness < 1)) throw new Error('lightness must be between 0 and 1 (exclusive)');
  if (!(chroma >= 0 && chroma <= 0.4)) throw new Error('chroma must be between 0 and 0.4');
  if (!Number.isInteger(steps) || steps < 3 || steps > 360) throw new Error('steps must be an integer from 3 to 360');
  const fits = fitsEveryHue(lightness, chroma);
  const c = fits ? chroma : maxWheelChroma(lightness);
  const colours: Hex[] = [];
  for (let i = 0; i < steps; i++) colours.push(formatHex({ mode: 'oklch', l: lightness, c, h: (360 * i) / steps }) as Hex);
  return { lightness, chroma: c, requestedChroma: chroma, clamped: !fits, steps: colours };
}

/** Colour of the phase angle (radians, any real value; wraps every 2π) on the wheel. */
export function phaseColor(angleRad: number, wheel: Pick<PhaseWheel, 'lightness' | 'chroma'>): Hex {
  if (!Number.isFinite(angleRad)) throw new Error('angle must be a finite number');
  const deg = (((angleRad * 180) / PI) % 360 + 360) % 360;
  return formatHex({ mode: 'oklch', l: wheel.lightness, c: wheel.chroma, h: deg }) as Hex;
}
