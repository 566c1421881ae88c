import { BadRequestException } from '@nestjs/common';
import { parseColors, parseSwatchbookFile } from './swatchbook-input';

const messages = (fn: () => unknown): string[] => {
  try {
    fn();
  } catch (e) {
    if (e instanceof BadRequestException) return (e.getResponse() as { message: string[] }).message;
    throw e;
  }
  throw new Error('expected a 400');
};

describe('swatchbook input', () => {
  const good = { positive: '#C8553D', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' };

  it('accepts the four required swatches and normalises hex to lower case', () => {
    expect(parseColors(good)).toEqual({ ...good, positive: '#c8553d' });
  });

  it('names each bad or missing field', () => {
    expect(messages(() => parseColors({ ...good, positive: 'red', label: undefined }))).toEqual(['colors.positive must be a colour like #1a2b3c (# and six hex digits)', 'colors.label is required']);
    expect(messages(() => parseColors({ ...good, glow: '#ffffff' }))).toEqual([expect.stringContaining('colors.glow is not a swatch')]);
    expect(messages(() => parseColors({ ...good, wheel: { lightness: 2, chroma: 0.1 } }))).toEqual(['colors.wheel.lightness must be a number between 0 and 1 (OKLCH L)']);
  });

  it('a patch keeps unchanged swatches and may drop optional ones', () => {
    const base = parseColors({ ...good, nucleus: '#333333' });
    expect(parseColors({ negative: '#123456', nucleus: null }, base)).toEqual({ ...good, positive: '#c8553d', negative: '#123456' });
  });

  it('import checks the file format', () => {
    expect(messages(() => parseSwatchbookFile({ format: 'other', formatVersion: 2, name: 'x', colors: good }))).toEqual(['format must be "psiform-swatchbook"', 'formatVersion must be 1']);
    expect(parseSwatchbookFile({ format: 'psiform-swatchbook', formatVersion: 1, name: ' House ', colors: good }).name).toBe('House');
  });
});
