import { converter } from 'culori';
import { parseHex, type Hex } from './hex';
import { DEFAULT_WHEEL, maxWheelChroma } from './phase-wheel';

const { PI, cos, floor, max, min, round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

/**
 * THE phase-colouring rule of every figure (GLB/PLY vertex colours, the Studio preview, thumbnails, phase keys):
 * one function, fed by the swatchbook's colours.
 *
 * - Sign colouring ('sign', the default for real states): psi > 0 surfaces take `positive`, psi < 0 `negative`.
 *   A complex state coloured by sign uses the sign of Re psi at each vertex.
 * - Argument colouring ('argument', the default for complex states): arg psi on the swatchbook's phase wheel
 *   (OKLCH at constant lightness and chroma, hue in degrees = arg psi in degrees, so arg 0 is hue 0 and +90° is
 *   hue 90; see phase-wheel.ts). A real state coloured by argument shows arg 0 and arg π.
 *   The wheel's chroma is lowered to fit sRGB at every hue (maxWheelChroma) exactly as phaseWheel() reports.
 */
export type PhaseMode = 'auto' | 'sign' | 'argument';

/** What a surface is: psi > 0 ('+'), psi < 0 ('-'), or a complex |psi| surface carrying arg psi per vertex. */
export type SurfacePhase = '+' | '-' | 'complex';

export interface PhasePalette {
  positive: Hex | string;
  negative: Hex | string;
  /** The swatchbook's phase wheel; absent or null = DEFAULT_WHEEL. */
  wheel?: { lightness: number; chroma: number } | null;
}

/** sRGB components 0..1. */
export type Rgb = [number, number, number];

const toRgb = converter('rgb');
const LUT_STEPS = 4096;
const luts = new Map<string, Float32Array>();

/** Wheel colours at LUT_STEPS hues (sRGB 0..1, clamped); cached per wheel. */
function wheelLut(wheel: { lightness: number; chroma: number }): Float32Array {
  const key = `${wheel.lightness}/${wheel.chroma}`;
  const hit = luts.get(key);
  if (hit) return hit;
  if (!(wheel.lightness > 0 && wheel.lightness < 1)) throw new RangeError('wheel.lightness must be between 0 and 1 (exclusive)');
  if (!(wheel.chroma >= 0 && wheel.chroma <= 0.4)) throw new RangeError('wheel.chroma must be between 0 and 0.4');
  const fit = min(wheel.chroma, maxWheelChroma(wheel.lightness));
  const lut = new Float32Array(3 * (LUT_STEPS + 1));
  for (let i = 0; i <= LUT_STEPS; i++) {
    const c = toRgb({ mode: 'oklch', l: wheel.lightness, c: fit, h: (360 * i) / LUT_STEPS });
    lut[3 * i] = min(1, max(0, c.r));
    lut[3 * i + 1] = min(1, max(0, c.g));
    lut[3 * i + 2] = min(1, max(0, c.b));
  }
  if (luts.size > 32) luts.clear();
  luts.set(key, lut);
  return lut;
}

function hexRgb(hex: string): Rgb {
  const c = toRgb(parseHex(hex));
  return [c.r, c.g, c.b];
}

/** sRGB → linear light (IEC 61966-2-1), what glTF vertex colours and three.js expect. */
export function srgbToLinear(c: number): number {
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

/** The mode actually used: 'auto' is 'sign' for real states and 'argument' for complex ones. */
export function resolvePhaseMode(mode: PhaseMode | undefined, isReal: boolean): 'sign' | 'argument' {
  return !mode || mode === 'auto' ? (isReal ? 'sign' : 'argument') : mode;
}

/**
 * Per-vertex colours of one surface into `out` (3 per vertex, sRGB 0..1, or linear light with opts.linear).
 * phaseAngle: arg psi per vertex (radians), required for complex surfaces; ignored for '+'/'-' under sign colouring.
 */
export function phaseColoursInto(
  palette: PhasePalette,
  mode: 'sign' | 'argument',
  phase: SurfacePhase,
  phaseAngle: Float32Array | null | undefined,
  out: Float32Array,
  opts: { linear?: boolean } = {},
): Float32Array {
  const nv = out.length / 3;
  if (!Number.isInteger(nv)) throw new RangeError('out must hold 3 values per vertex');
  if (phase === 'complex' && (!phaseAngle || phaseAngle.length !== nv)) throw new RangeError('a complex surface needs phaseAngle (one per vertex)');
  const conv = opts.linear ? srgbToLinear : (x: number) => x;
  const put = (v: number, c: Rgb | Float32Array, o = 0) => {
    out[3 * v] = conv(c[o]);
    out[3 * v + 1] = conv(c[o + 1]);
    out[3 * v + 2] = conv(c[o + 2]);
  };
  if (mode === 'sign') {
    const pos = hexRgb(palette.positive);
    const neg = hexRgb(palette.negative);
    for (let v = 0; v < nv; v++) {
      const positive = phase === '+' || (phase === 'complex' && cos(phaseAngle![v]) >= 0);
      put(v, positive ? pos : neg);
    }
    return out;
  }
  const lut = wheelLut(palette.wheel ?? DEFAULT_WHEEL);
  const twoPi = 2 * PI;
  for (let v = 0; v < nv; v++) {
    const a = phase === '+' ? 0 : phase === '-' ? PI : phaseAngle![v];
    let f = ((a % twoPi) + twoPi) % twoPi;
    f = (f / twoPi) * LUT_STEPS;
    const i = min(LUT_STEPS - 1, floor(f));
    const w = f - i;
    const c: Rgb = [0, 0, 0];
    for (let k = 0; k < 3; k++) c[k] = lut[3 * i + k] * (1 - w) + lut[3 * (i + 1) + k] * w;
    put(v, c);
  }
  return out;
}

/** One colour (sRGB 0..1): of a real phase, or of arg psi = angle on a complex surface. */
export function phaseRgb(palette: PhasePalette, mode: 'sign' | 'argument', phase: SurfacePhase, angle = 0): Rgb {
  const out = new Float32Array(3);
  phaseColoursInto(palette, mode, phase, phase === 'complex' ? new Float32Array([angle]) : null, out);
  return [out[0], out[1], out[2]];
}

/** Hex of phaseRgb (for phase keys and legends). */
export function phaseHex(palette: PhasePalette, mode: 'sign' | 'argument', phase: SurfacePhase, angle = 0): Hex {
  const [r, g, b] = phaseRgb(palette, mode, phase, angle);
  const h = (x: number) => round(min(1, max(0, x)) * 255).toString(16).padStart(2, '0');
  return `#${h(r)}${h(g)}${h(b)}` as Hex;
}
