import { DOMParser } from '@xmldom/xmldom';
import { prettyLabel } from '@psiform/orbitals';
import { describe, expect, it } from 'vitest';
import { drawRuns, measureRuns, plainLabel, plainText, runsToSvg, SCRIPT_METRICS, svgText, typeset, type TextCanvas, type TextRun } from '../src';

const b = (text: string): TextRun => ({ text, script: 'base' });
const sub = (text: string): TextRun => ({ text, script: 'sub' });
const sup = (text: string): TextRun => ({ text, script: 'sup' });

describe('typeset: the one parser for names, units and exponents', () => {
  it('real orbital names from the engine: subscripts, never an underscore (labels from @psiform/orbitals prettyLabel)', () => {
    expect(typeset(prettyLabel('2px'))).toEqual([b('2p'), sub('x')]);
    expect(typeset(prettyLabel('3dz2'))).toEqual([b('3d'), sub('z²')]);
    expect(typeset(prettyLabel('3dx2-y2'))).toEqual([b('3d'), sub('x²−y²')]);
    expect(typeset(prettyLabel('4fz(x2-y2)'))).toEqual([b('4f'), sub('z(x²−y²)')]);
    expect(typeset(prettyLabel('1s'))).toEqual([b('1s')]);
    for (const label of ['2pz', '3dxy', '3dz2', '4fxyz', '5fy(3x2-y2)', '4fx(x2-3y2)']) {
      const runs = typeset(prettyLabel(label));
      expect(runs.map((r) => r.text).join('')).not.toContain('_');
    }
  });
  it('complex forms 2p(m=+1) become 2p with the m value as a subscript, with a true minus sign', () => {
    expect(typeset('2p(m=+1)')).toEqual([b('2p'), sub('+1')]);
    expect(typeset('4f(m=-3)')).toEqual([b('4f'), sub('−3')]);
    expect(typeset('(0+1i)·2p(m=+1)')).toEqual([b('(0+1i)·2p'), sub('+1')]);
  });
  it('superpositions keep each subscript; spaces end a bare subscript', () => {
    expect(typeset('0.707·2p_x + 0.707·2p_y')).toEqual([b('0.707·2p'), sub('x'), b(' + 0.707·2p'), sub('y')]);
  });
  it('units: a0 gets a subscript 0, exponents are superscripts with U+2212 minus', () => {
    expect(typeset('a0^−3/2')).toEqual([b('a'), sub('0'), sup('−3/2')]);
    expect(typeset('a0^-3')).toEqual([b('a'), sub('0'), sup('−3')]);
    expect(typeset('|ψ| = 0.0123 a0^−3/2')).toEqual([b('|ψ| = 0.0123 a'), sub('0'), sup('−3/2')]);
    expect(typeset('Å^{-1}')).toEqual([b('Å'), sup('−1')]);
    expect(typeset('x = 2 a₀')).toEqual([b('x = 2 a'), sub('0')]);
    // Not a unit: inside words, hex colours, numbers.
    expect(typeset('data0 #a0b0c0 ka0')).toEqual([b('data0 #a0b0c0 ka0')]);
  });
  it('Unicode superscripts: ¹²³ stay the font glyphs (sp³, 96³); a run with ⁺ or ⁴…⁹ becomes one superscript run (Li²⁺); inside a subscript they stay glyphs', () => {
    expect(typeset('Li²⁺')).toEqual([b('Li'), sup('2+')]);
    expect(typeset('Zn²⁹⁺')).toEqual([b('Zn'), sup('29+')]);
    expect(typeset('sp³ #2')).toEqual([b('sp³ #2')]);
    expect(typeset('grid 96³')).toEqual([b('grid 96³')]);
    expect(typeset('3d_z²')).toEqual([b('3d'), sub('z²')]);
  });
  it('a trailing full stop is not an exponent; braces group', () => {
    expect(typeset('r^2.')).toEqual([b('r'), sup('2'), b('.')]);
    expect(typeset('R_{10,5}')).toEqual([b('R'), sub('10,5')]);
    expect(typeset('')).toEqual([]);
  });
});

describe('plainText: for alt text, file names and sheets', () => {
  it('uses Unicode script characters for digits and signs only', () => {
    expect(plainLabel('3d_z²')).toBe('3dz²');
    expect(plainLabel('2p_x')).toBe('2px');
    expect(plainLabel('2p(m=-1)')).toBe('2p₋₁');
    expect(plainLabel('a0^−3/2')).toBe('a₀^(−3/2)');
    expect(plainLabel('He⁺')).toBe('He⁺');
    expect(plainText([b('Å'), sup('−1')])).toBe('Å⁻¹');
  });
});

describe('runsToSvg: real sub- and superscripts as tspans', () => {
  it('shifts with dy and takes the shift back on the next run; script size from SCRIPT_METRICS', () => {
    const svg = runsToSvg(typeset('a0^−3/2 here'), 10);
    // a, then sub 0 (down 2.2), then sup (up 2.2 + 3.8 = 6), then base (down 3.8).
    expect(svg).toBe('a<tspan dy="2.2" font-size="6.8" class="sub">0</tspan><tspan dy="-6" font-size="6.8" class="sup">−3/2</tspan><tspan dy="3.8"> here</tspan>');
    const doc = new DOMParser().parseFromString(`<svg xmlns="http://www.w3.org/2000/svg"><text>${svgText('3d_x²−y² & <b>', 3)}</text></svg>`, 'image/svg+xml');
    const tspans = Array.from(doc.getElementsByTagName('tspan'));
    expect(tspans.map((t) => t.getAttribute('class'))).toEqual(['sub', null]);
    expect(tspans[0].textContent).toBe('x²−y²');
    expect(Number(tspans[0].getAttribute('font-size'))).toBeCloseTo(3 * SCRIPT_METRICS.size, 3);
    expect(doc.documentElement?.textContent).toBe('3dx²−y² & <b>');
  });
});

describe('drawRuns / measureRuns on a Canvas 2D stand-in that records calls', () => {
  it('draws scripts smaller and shifted, advancing by the measured widths', () => {
    const calls: { text: string; x: number; y: number; font: string }[] = [];
    // Widths: 1 unit per character per px of font size (a monospaced stand-in, so the arithmetic is checkable).
    const ctx: TextCanvas = {
      font: '',
      measureText(t) {
        return { width: t.length * Number(/([\d.]+)px/.exec(this.font)![1]) };
      },
      fillText(text, x, y) {
        calls.push({ text, x, y, font: this.font });
      },
    };
    const runs = typeset('2p_x');
    const w = drawRuns(ctx, runs, 5, 100, 10, 'Lato', 700);
    expect(calls).toEqual([
      { text: '2p', x: 5, y: 100, font: '700 10.00px Lato' },
      { text: 'x', x: 25, y: 102.2, font: '700 6.80px Lato' },
    ]);
    expect(w).toBeCloseTo(26.8, 9);
    expect(measureRuns(ctx, runs, 10, 'Lato', 700)).toBeCloseTo(26.8, 9);
  });
});
