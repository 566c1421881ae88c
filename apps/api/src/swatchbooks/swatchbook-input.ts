import { BadRequestException } from '@nestjs/common';
import { normaliseHex, isHex } from '@psiform/colour';
import { HEX_COLOUR_MESSAGE, SWATCHBOOK_FILE_FORMAT, type SwatchbookColorsDto } from '@psiform/contracts';

export const SWATCH_REQUIRED = ['positive', 'negative', 'background', 'label'] as const;
export const SWATCH_OPTIONAL = ['nucleus', 'axes'] as const;
export const NAME_MAX = 120;

/**
 * Validates swatchbook colours; every problem is one message naming the field (colors.<name>). With `base`
 * (a PATCH), missing fields keep their old value and `null` removes an optional one.
 */
export function parseColors(input: unknown, base?: SwatchbookColorsDto, prefix = 'colors'): SwatchbookColorsDto {
  const problems: string[] = [];
  if (input === null || typeof input !== 'object' || Array.isArray(input)) throw new BadRequestException([`${prefix} must be an object`]);
  const o = input as Record<string, unknown>;
  const known = new Set<string>([...SWATCH_REQUIRED, ...SWATCH_OPTIONAL, 'wheel']);
  for (const k of Object.keys(o)) if (!known.has(k)) problems.push(`${prefix}.${k} is not a swatch (expected ${[...known].join(', ')})`);
  const out: Record<string, unknown> = { ...(base ?? {}) };
  for (const k of [...SWATCH_REQUIRED, ...SWATCH_OPTIONAL]) {
    const v = o[k];
    const required = (SWATCH_REQUIRED as readonly string[]).includes(k);
    if (v === undefined) {
      if (required && !base) problems.push(`${prefix}.${k} is required`);
      continue;
    }
    if (v === null && !required) {
      delete out[k];
      continue;
    }
    if (!isHex(v)) problems.push(`${prefix}.${k} ${HEX_COLOUR_MESSAGE}`);
    else out[k] = normaliseHex(v);
  }
  if (o.wheel !== undefined) {
    const w = o.wheel as Record<string, unknown> | null;
    if (w === null) delete out.wheel;
    else if (typeof w !== 'object' || Array.isArray(w)) problems.push(`${prefix}.wheel must be an object {lightness, chroma}`);
    else {
      const { lightness, chroma } = w;
      if (typeof lightness !== 'number' || !(lightness > 0 && lightness < 1)) problems.push(`${prefix}.wheel.lightness must be a number between 0 and 1 (OKLCH L)`);
      if (typeof chroma !== 'number' || !(chroma >= 0 && chroma <= 0.4)) problems.push(`${prefix}.wheel.chroma must be a number from 0 to 0.4 (OKLCH C)`);
      const extra = Object.keys(w).filter((k) => k !== 'lightness' && k !== 'chroma');
      if (extra.length) problems.push(`${prefix}.wheel.${extra[0]} is not allowed`);
      out.wheel = { lightness, chroma };
    }
  }
  if (problems.length) throw new BadRequestException(problems);
  return out as unknown as SwatchbookColorsDto;
}

export function parseName(input: unknown, field = 'name'): string {
  if (typeof input !== 'string') throw new BadRequestException([`${field} must be a string`]);
  const name = input.trim();
  if (!name) throw new BadRequestException([`${field} must not be empty`]);
  if (name.length > NAME_MAX) throw new BadRequestException([`${field} must be at most ${NAME_MAX} characters`]);
  return name;
}

/** An exported swatchbook file (GET /:id/export), validated for import. */
export function parseSwatchbookFile(input: unknown): { name: string; colors: SwatchbookColorsDto } {
  if (input === null || typeof input !== 'object' || Array.isArray(input)) throw new BadRequestException(['the file must be a JSON object']);
  const o = input as Record<string, unknown>;
  const problems: string[] = [];
  if (o.format !== SWATCHBOOK_FILE_FORMAT) problems.push(`format must be "${SWATCHBOOK_FILE_FORMAT}"`);
  if (o.formatVersion !== 1) problems.push('formatVersion must be 1');
  if (problems.length) throw new BadRequestException(problems);
  return { name: parseName(o.name), colors: parseColors(o.colors) };
}
