// Export size fields: mm or inches in, pixels out (round(mm / 25.4 × dpi), from @psiform/print).
import { CANVAS_LIMITS } from '@psiform/contracts';
import { exportPixelSize, inchesToMm, mmToInches } from '@psiform/print';

export type LengthUnit = 'mm' | 'in';

/** The canvas limits of libs/contracts, as the server checks them. */
export const CANVAS_MM = { min: CANVAS_LIMITS.mmMin, max: CANVAS_LIMITS.mmMax } as const;

export function toMm(value: number, unit: LengthUnit): number {
  return unit === 'in' ? inchesToMm(value) : value;
}

export function fromMm(mm: number, unit: LengthUnit): string {
  const v = unit === 'in' ? mmToInches(mm) : mm;
  return String(Number(v.toFixed(unit === 'in' ? 3 : 1)));
}

export function lengthError(text: string, unit: LengthUnit, what: string): string | null {
  const t = text.trim().replace(',', '.');
  if (t === '') return `Enter the ${what}.`;
  const v = Number(t);
  if (!Number.isFinite(v)) return `The ${what} must be a number.`;
  const mm = toMm(v, unit);
  if (mm < CANVAS_MM.min || mm > CANVAS_MM.max) {
    const lo = unit === 'in' ? `${fromMm(CANVAS_MM.min, 'in')} in` : `${CANVAS_MM.min} mm`;
    const hi = unit === 'in' ? `${fromMm(CANVAS_MM.max, 'in')} in` : `${CANVAS_MM.max} mm`;
    return `The ${what} must be between ${lo} and ${hi}.`;
  }
  return null;
}

export function pixelText(widthMm: number, heightMm: number, dpi: number): { width: number; height: number; text: string } {
  const { width, height } = exportPixelSize({ widthMm, heightMm, dpi });
  const mp = (width * height) / 1e6;
  return { width, height, text: `${width} × ${height} px (${mp.toFixed(mp < 10 ? 2 : 1)} megapixels) at ${dpi} dpi` };
}
