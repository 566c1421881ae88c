import { converter, formatHex } from 'culori';
import { parseHex, type Hex } from './hex';

const { max, min } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export const CVD_KINDS = ['protanopia', 'deuteranopia', 'tritanopia'] as const;
export type CvdKind = (typeof CVD_KINDS)[number];

/**
 * Severity-1.0 simulation matrices of Machado, Oliveira & Fernandes (2009), "A Physiologically-based Model
 * for Simulation of Color Vision Deficiency", IEEE TVCG 15(6) 1291-1298 (the authors' published table),
 * row-major, acting on LINEAR RGB. culori ships the same numbers (filterDeficiencyProt/Deuter/Trit) but
 * applies them to gamma-encoded sRGB, which the model does not intend, so we apply them ourselves in linear RGB.
 */
export const MACHADO_2009: Record<CvdKind, readonly number[]> = {
  protanopia: [0.152286, 1.052583, -0.204868, 0.114503, 0.786281, 0.099216, -0.003882, -0.048116, 1.051998],
  deuteranopia: [0.367322, 0.860646, -0.227968, 0.280085, 0.672501, 0.047413, -0.01182, 0.04294, 0.968881],
  tritanopia: [1.255528, -0.076749, -0.178779, -0.078411, 0.930809, 0.147602, 0.004733, 0.691367, 0.3039],
};

const toLrgb = converter('lrgb');
const clamp01 = (v: number) => min(1, max(0, v));

/** How the colour looks to a dichromat of the given kind (Machado et al. 2009, severity 1.0), as sRGB hex. */
export function simulateCvd(hex: string, kind: CvdKind): Hex {
  const m = MACHADO_2009[kind];
  if (!m) throw new Error(`unknown colour-vision kind "${kind}"`);
  const { r, g, b } = toLrgb(parseHex(hex));
  // Results slightly outside [0, 1] are clipped, as an sRGB display would.
  return formatHex({
    mode: 'lrgb',
    r: clamp01(m[0] * r + m[1] * g + m[2] * b),
    g: clamp01(m[3] * r + m[4] * g + m[5] * b),
    b: clamp01(m[6] * r + m[7] * g + m[8] * b),
  }) as Hex;
}
