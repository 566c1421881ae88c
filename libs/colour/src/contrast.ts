import { wcagContrast } from 'culori';
import { parseHex } from './hex';

/**
 * WCAG 2.x contrast ratio (W3C WCAG 2.1, definitions "contrast ratio" and "relative luminance"):
 * (L1 + 0.05) / (L2 + 0.05), 1..21. culori's wcagContrast implements that definition.
 */
export function contrastRatio(fg: string, bg: string): number {
  return wcagContrast(parseHex(fg), parseHex(bg));
}

/** WCAG 2.1 success criterion 1.4.3 (AA): 4.5:1 for normal text, 3:1 for large text and graphics (1.4.11). */
export const WCAG_AA_TEXT = 4.5;
export const WCAG_AA_GRAPHICS = 3;
