import { DOMParser } from '@xmldom/xmldom';
import { parseRecipe, type Recipe } from '@psiform/contracts';
import { companionSvg, dominantTerm, figureSvg, plotPalette } from './svg-export';
import { svgSubject } from './print-files';
import { latoFonts } from './fonts';

const recipe = (over: Record<string, unknown> = {}): Recipe => {
  const r = parseRecipe({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 32 }, surface: { rule: 'enclosed', fraction: 0.9 }, ...over });
  if (!r.ok) throw new Error(JSON.stringify(r.issues));
  return r.recipe;
};
const byClass = (svg: string, tag: string, cls: string) =>
  Array.from(new DOMParser().parseFromString(svg, 'image/svg+xml').getElementsByTagName(tag)).filter((e) => (e.getAttribute('class') ?? '').split(/\s+/).includes(cls));

describe('svg exports', () => {
  it('dominantTerm: the largest |c|², terms of equal n, l pooled (they share R_nl), first of equals', () => {
    // sp-type mix 1/2·2s + √3/2·2p_z: weights 1/4 and 3/4.
    const mix = recipe({ content: { Z: 1, terms: [{ n: 2, l: 0, m: 0, basis: 'real', re: 0.5 }, { n: 2, l: 1, m: 0, basis: 'real', re: Math.sqrt(3) / 2 }] } });
    expect(dominantTerm(mix)).toEqual({ n: 2, l: 1, weight: expect.closeTo(0.75, 12), single: false });
    const px = recipe({ content: { Z: 1, terms: [{ n: 2, l: 1, m: 1, basis: 'real', re: 1 }, { n: 2, l: 1, m: -1, basis: 'real', re: 0, im: 1 }] } });
    expect(dominantTerm(px)).toEqual({ n: 2, l: 1, weight: 1, single: true });
    const tie = recipe({ content: { Z: 1, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1 }, { n: 2, l: 1, m: 0, basis: 'real', re: -1 }] } });
    expect(dominantTerm(tie)).toMatchObject({ n: 3, l: 2, weight: 0.5 });
  });

  it('section map of 2p_z in the xz plane: 3 levels per sign -> 3 positive and 3 negative contours, one nodal line', () => {
    const svg = figureSvg(recipe(), { kind: 'section', plane: 'xz', offset: 0, levels: 3, widthMm: 80, heightMm: 80 }, undefined);
    expect(byClass(svg, 'path', 'contour-pos')).toHaveLength(3);
    expect(byClass(svg, 'path', 'contour-neg')).toHaveLength(3);
    expect(byClass(svg, 'path', 'nodal')).toHaveLength(1);
    // The xy plane lies in 2p_z's nodal plane (ψ ∝ z): no contour, one hatched nodal path.
    const xy = figureSvg(recipe(), { kind: 'section', plane: 'xy', offset: 0, levels: 3, widthMm: 80, heightMm: 80 }, undefined);
    expect(byClass(xy, 'path', 'contour-pos')).toHaveLength(0);
    expect(byClass(xy, 'path', 'nodal-plane')).toHaveLength(1);
  });

  it('radial plot: the recipe palette, Lato embedded, a title naming the dominant term of a superposition', () => {
    const mix = recipe({ content: { Z: 2, terms: [{ n: 2, l: 0, m: 0, basis: 'real', re: 0.5 }, { n: 2, l: 1, m: 0, basis: 'real', re: Math.sqrt(3) / 2 }] }, palette: { positive: '#aa0000', negative: '#0000aa' } });
    const svg = figureSvg(mix, { kind: 'radial', plane: 'xz', offset: 0, levels: 4, widthMm: 89, heightMm: 60 }, latoFonts());
    expect(svg).toContain('Radial distribution of the dominant term 2p (75% of the state), Z = 2');
    expect(svg).toContain('#aa0000');
    expect(svg).toMatch(/font-family:\s*["']?Lato/);
    expect(svg).toContain('data:font/woff2;base64,');
    expect(latoFonts().regular!.subarray(0, 4)).toEqual(new Uint8Array([0x77, 0x4f, 0x46, 0x32])); // "wOF2" (WOFF2 spec §3)
  });

  it('companion SVGs embed DejaVu Sans after Lato only when their text has characters Lato lacks (ψ in a section key)', () => {
    const section = companionSvg(recipe(), { kind: 'section', plane: 'xz', offset: 0, levels: 3, widthMm: 80, heightMm: 80 });
    expect(section).toContain('ψ &gt; 0');
    expect(section).toMatch(/@font-face\{font-family:"DejaVu Sans";font-weight:400;[^}]*src:url\(data:font\/woff2;base64,d09GMg/); // "wOF2"
    expect(section).toMatch(/text\{font-family:"Lato","DejaVu Sans";\}/);
    const subject = svgSubject('section.svg', section, 80, 80, { short: 'a', long: 'b' });
    expect(subject.fonts).toEqual([{ name: 'Lato', embedded: true, subset: false }, { name: 'DejaVu Sans', embedded: true, subset: false }]);
    expect(subject.unglyphed).toEqual([]);
    // Without the fallback face the same text has ψ with no glyph: the preflight would fail it.
    const latoOnly = figureSvg(recipe(), { kind: 'section', plane: 'xz', offset: 0, levels: 3, widthMm: 80, heightMm: 80 }, latoFonts());
    expect(svgSubject('section.svg', latoOnly, 80, 80, { short: 'a', long: 'b' }).unglyphed).toContain('ψ');
    const radial = companionSvg(recipe(), { kind: 'radial', plane: 'xz', offset: 0, levels: 3, widthMm: 89, heightMm: 60 });
    expect(radial).not.toContain('DejaVu');
    expect(svgSubject('radial.svg', radial, 89, 60, { short: 'a', long: 'b' }).unglyphed).toEqual([]);
  });

  it('plot palette: transparent stages print on white', () => {
    expect(plotPalette(recipe({ stage: { background: { transparent: true, color: '#000000' } } })).background).toBe('#ffffff');
    expect(plotPalette(recipe()).background).toBe('#fbfaf7');
  });
});
