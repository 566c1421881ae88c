import { formatHex, parse, type Color } from 'culori';

/** A colour as "#rrggbb" (lower-case sRGB hex), the only form swatchbooks store. */
export type Hex = `#${string}`;

const HEX = /^#[0-9a-fA-F]{6}$/;

export function isHex(value: unknown): value is Hex {
  return typeof value === 'string' && HEX.test(value);
}

/** Parses "#rrggbb"; throws naming the value otherwise (callers turn this into a 400). */
export function parseHex(hex: string): Color {
  if (!isHex(hex)) throw new Error(`"${hex}" is not a #rrggbb colour`);
  return parse(hex)!;
}

export function normaliseHex(hex: string): Hex {
  return formatHex(parseHex(hex)) as Hex;
}
