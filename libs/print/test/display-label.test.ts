import { describe, expect, it } from 'vitest';
import { displayLabel, figureTextFacts, mmToPt, OVERLAY_MM, SUBSCRIPT_SCALE, typeset } from '../src';

const real = (n: number, l: number, m: number) => ({ n, l, m, basis: 'real' as const, re: 1, im: 0 });

describe('displayLabel: the one name a figure prints', () => {
  it('a typed orbital key prints as the engine names the drawn state, free text as written', () => {
    // 4f, m = 0 real form is 4f_z³ (libs/orbitals labels); '4fz3' is how the CLI and keyboards write it.
    expect(displayLabel({ label: '4fz3', content: { Z: 1, terms: [real(4, 3, 0)] } })).toBe('4f_z³');
    expect(typeset(displayLabel({ label: '4fz3', content: { Z: 1, terms: [real(4, 3, 0)] } }))).toEqual([
      { text: '4f', script: 'base' },
      { text: 'z³', script: 'sub' },
    ]);
    expect(displayLabel({ label: 'Plate 4, left', content: { Z: 1, terms: [real(2, 1, 0)] } })).toBe('Plate 4, left');
  });
  it('a label naming another state than the terms prints the terms\' own name (the figure never claims what it does not show)', () => {
    expect(displayLabel({ label: '2pz', content: { Z: 1, terms: [real(2, 1, 1)] } })).toBe('2p_x');
  });
  it('no label: the state\'s name', () => {
    expect(displayLabel({ content: { Z: 1, terms: [real(3, 2, 0)] } })).toBe('3d_z²');
    expect(displayLabel({ label: '', content: { Z: 1, terms: [{ n: 2, l: 1, m: 1, basis: 'complex', re: 1, im: 0 }] } })).toBe('2p(m=+1)');
  });
});

describe('figureTextFacts: a typeset caption', () => {
  it('counts the caption\'s scripts at their own size, for preflight', () => {
    const ann = { label: { show: false }, scaleBar: { show: false, unit: 'angstrom' as const }, axes: false, caption: 'ψ in a0^−3/2' };
    const { texts } = figureTextFacts(ann as never, '');
    expect(texts).toEqual([
      { what: 'caption', sizePt: mmToPt(OVERLAY_MM.caption) },
      { what: 'caption sub- and superscripts', sizePt: mmToPt(OVERLAY_MM.caption * SUBSCRIPT_SCALE) },
    ]);
  });
});
