import { recipeSchema } from '@psiform/contracts';
import { describe, expect, it } from 'vitest';
import { captionLayout, drawOverlay, OVERLAY_MM } from './overlay';

/** A Canvas 2D stand-in that records text calls; every glyph is 0.5 em wide (checkable by hand). */
function recorder() {
  const texts: { text: string; x: number; y: number; font: string }[] = [];
  const ctx = {
    font: '10px x',
    fillStyle: '',
    strokeStyle: '',
    lineWidth: 1,
    lineCap: 'butt',
    textAlign: 'left',
    textBaseline: 'alphabetic',
    measureText(t: string) {
      return { width: t.length * 0.5 * Number(/([\d.]+)px/.exec(this.font)![1]) };
    },
    fillText(text: string, x: number, y: number) {
      texts.push({ text, x, y, font: this.font });
    },
    save() {},
    restore() {},
    beginPath() {},
    moveTo() {},
    lineTo() {},
    stroke() {},
  };
  return { ctx, texts };
}

const annotations = (caption?: string) => recipeSchema.parse({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 32 }, surface: { rule: 'enclosed', fraction: 0.9 }, annotations: { caption } }).annotations;

describe('figure overlay', () => {
  it('the caption gets its own band under the figure area, so it never covers the lobes', () => {
    const { ctx } = recorder();
    // 2.2 mm text at 10 px/mm: 22 px, 11 px a glyph; 89 mm − 2 × 3 mm margins = 830 px → 75 glyphs a line.
    const text = 'Isosurface of the hydrogen-like 2pz orbital enclosing 90% of the probability density, coloured by the sign of ψ.';
    const layout = captionLayout(ctx, text, 89, 10);
    expect(layout.lines.length).toBe(2);
    expect(layout.bandMm).toBeCloseTo(OVERLAY_MM.margin + 2 * OVERLAY_MM.caption * 1.3 + OVERLAY_MM.margin * 0.5, 9);
    expect(captionLayout(ctx, '  ', 89, 10)).toEqual({ lines: [], bandMm: 0 });
    const long = captionLayout(ctx, 'word '.repeat(400), 89, 10);
    expect(long.lines).toHaveLength(6);
    expect(long.lines[5].endsWith('…')).toBe(true);
  });

  it('draws caption lines only inside the band, the scale bar above it, and the label typeset (subscript smaller and lower)', () => {
    const { ctx, texts } = recorder();
    const W = 890;
    const H = 600; // 89 × 60 mm at 10 px/mm
    const ann = annotations('Isosurface of 2pz.');
    drawOverlay(ctx as unknown as CanvasRenderingContext2D, { width: W, height: H, pxPerMm: 10, annotations: ann, label: '2p_z', visibleWidthBohr: 20, ink: '#000' });
    const band = captionLayout(ctx, ann.caption, 89, 10).bandMm * 10;
    const cap = texts.find((t) => t.text === 'Isosurface of 2pz.')!;
    expect(cap.y).toBeGreaterThan(H - band);
    expect(cap.y).toBeLessThan(H);
    const bar = texts.find((t) => /Å|^\d/.test(t.text) && t.text !== 'Isosurface of 2pz.')!;
    expect(bar.y).toBeLessThan(H - band);
    const [base, sub] = texts.filter((t) => t.text === '2p' || t.text === 'z');
    expect(base.text).toBe('2p');
    expect(sub.text).toBe('z');
    expect(sub.y).toBeGreaterThan(base.y);
    expect(Number(/([\d.]+)px/.exec(sub.font)![1])).toBeLessThan(Number(/([\d.]+)px/.exec(base.font)![1]));
    expect(texts.some((t) => t.text.includes('_'))).toBe(false);
  });
});
