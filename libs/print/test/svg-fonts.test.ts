// Glyph coverage helpers on literal SVG strings, checkable by eye. "covers" stands for a font's cmap: here a face
// with ASCII only, so ψ (U+03C8), − (U+2212) and ₀ (U+2080) are the characters it lacks.
import { describe, expect, it } from 'vitest';
import { fontStyle, svgDrawnText, uncoveredCharacters, withFallbackFace, wrapUncoveredRuns } from '../src';

const ascii = (cp: number) => cp < 0x80;
const svg = (body: string) => `<svg xmlns="http://www.w3.org/2000/svg">${fontStyle({ regular: new Uint8Array([1, 2, 3]) })}<title>ψ title</title>${body}</svg>`;

describe('svgDrawnText', () => {
  it('collects text and tspan content of <text> elements only, entities decoded', () => {
    const s = svg('<text x="1">a &lt; b &amp; &#x3c8;<tspan dy="1">&#8722;1</tspan></text><desc>ψ desc</desc>');
    expect(svgDrawnText(s)).toBe('a < b & ψ−1');
  });
});

describe('uncoveredCharacters', () => {
  it('lists each character the face lacks once, in first-seen order, ignoring white space', () => {
    expect(uncoveredCharacters('ψ > 0, ψ < 0, a₀ −1\u00a0', ascii)).toEqual(['ψ', '₀', '−']);
    expect(uncoveredCharacters('plain text', ascii)).toEqual([]);
  });
});

describe('wrapUncoveredRuns', () => {
  it('puts each run the face lacks in its own tspan and leaves covered text and other elements alone', () => {
    const out = wrapUncoveredRuns(svg('<text class="k">ψψ &gt; 0 and &#x3c8;<tspan class="sub">₀x</tspan></text>'), ascii, 'Fallback "F"');
    expect(out).toContain('<text class="k"><tspan font-family="Fallback &quot;F&quot;">ψψ</tspan> &gt; 0 and <tspan font-family="Fallback &quot;F&quot;">&#x3c8;</tspan><tspan class="sub"><tspan font-family="Fallback &quot;F&quot;">₀</tspan>x</tspan></text>');
    expect(out).toContain('<title>ψ title</title>');
    // The drawn text is unchanged: only font assignment moves.
    expect(svgDrawnText(out)).toBe(svgDrawnText(svg('<text class="k">ψψ &gt; 0 and &#x3c8;<tspan class="sub">₀x</tspan></text>')));
  });

  it('a run at the end of a text node is closed before the next tag', () => {
    expect(wrapUncoveredRuns('<text>a ψ</text>', ascii, 'F')).toBe('<text>a <tspan font-family="F">ψ</tspan></text>');
  });
});

describe('withFallbackFace', () => {
  it('embeds the face and names it after the first family, before any generic family', () => {
    const out = withFallbackFace(svg('<text>ψ</text>'), { family: 'Fallback', regular: new Uint8Array([0xff]), bold: new Uint8Array([0xfe]), format: 'woff2' });
    expect(out).toContain('@font-face{font-family:"Fallback";font-weight:400;font-style:normal;src:url(data:font/woff2;base64,/w==) format("woff2");}');
    expect(out).toContain('@font-face{font-family:"Fallback";font-weight:700;font-style:normal;src:url(data:font/woff2;base64,/g==) format("woff2");}');
    expect(out).toContain('text{font-family:"Lato","Fallback";}');
    expect(withFallbackFace(out, { family: 'Fallback', regular: new Uint8Array([0xff]), format: 'woff2' })).toBe(out);
  });

  it('keeps a generic family last, and leaves an SVG without our style block unchanged', () => {
    const noFaces = `<svg>${fontStyle(undefined)}<text>ψ</text></svg>`;
    expect(withFallbackFace(noFaces, { family: 'F', regular: new Uint8Array([1]), format: 'woff' })).toContain('text{font-family:"Lato","F",sans-serif;}');
    expect(withFallbackFace('<svg><text>ψ</text></svg>', { family: 'F', regular: new Uint8Array([1]), format: 'woff' })).toBe('<svg><text>ψ</text></svg>');
  });
});
