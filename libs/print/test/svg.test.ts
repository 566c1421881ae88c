import { parseOrbitalLabel, compileState } from '@psiform/orbitals';
import { describe, expect, it } from 'vitest';
import { phaseHex } from '@psiform/colour';
import { base64, PHASE_MAP_BANDS, radialPlotSvg, sectionMapSvg } from '../src';
import { PALETTE, byClass, parseSvg, pathPoints } from './helpers';

const num = (e: { getAttribute(n: string): string | null }, a: string) => Number(e.getAttribute(a));

function radial(n: number, l: number, extra: Partial<Parameters<typeof radialPlotSvg>[0]> = {}) {
  const svg = radialPlotSvg({ n, l, Z: 1, palette: PALETTE, widthMm: 89, heightMm: 60, unit: 'bohr', ...extra });
  const doc = parseSvg(svg);
  const plot = byClass(doc, 'g', 'plot')[0];
  const x0 = num(plot, 'data-x0');
  const x1 = num(plot, 'data-x1');
  const rMax = num(plot, 'data-rmax-bohr');
  return { svg, doc, X: (r: number) => x0 + (r / rMax) * (x1 - x0), rMax };
}

describe('base64 (RFC 4648 §10 test vectors)', () => {
  it('encodes "", f, fo, foo, foob, fooba, foobar', () => {
    const e = new TextEncoder();
    expect(['', 'f', 'fo', 'foo', 'foob', 'fooba', 'foobar'].map((s) => base64(e.encode(s)))).toEqual(['', 'Zg==', 'Zm8=', 'Zm9v', 'Zm9vYg==', 'Zm9vYmE=', 'Zm9vYmFy']);
  });
});

describe('radialPlotSvg', () => {
  it('is well-formed SVG 1.1 with width/height in mm and a matching viewBox', () => {
    const { doc } = radial(1, 0);
    const root = doc.documentElement!;
    expect(root.getAttribute('xmlns')).toBe('http://www.w3.org/2000/svg');
    expect(root.getAttribute('version')).toBe('1.1');
    expect(root.getAttribute('width')).toBe('89mm');
    expect(root.getAttribute('height')).toBe('60mm');
    expect(root.getAttribute('viewBox')).toBe('0 0 89 60');
  });
  it('1s: forbidden region starts at the classical turning point r = 2 a0 (E = −1/2 = −1/r, a fact of the trade)', () => {
    const { doc, X } = radial(1, 0);
    const rects = byClass(doc, 'rect', 'forbidden');
    expect(rects).toHaveLength(1); // l = 0: no inner forbidden region
    expect(num(rects[0], 'data-r-bohr')).toBeCloseTo(2, 12);
    expect(num(rects[0], 'x')).toBeCloseTo(X(2), 2); // coordinates are written to 1 µm
    expect(byClass(doc, 'circle', 'node')).toHaveLength(0);
  });
  it('1s: the curve peaks at the most probable radius r = a0 (dP/dr = 0 for P = 4r²e^{−2r}), within one sample step', () => {
    const { doc, X, rMax } = radial(1, 0);
    const pts = pathPoints(byClass(doc, 'path', 'curve')[0].getAttribute('d')!);
    expect(pts).toHaveLength(801);
    const top = pts.reduce((a, b) => (b[1] < a[1] ? b : a));
    expect(Math.abs(top[0] - X(1))).toBeLessThanOrEqual(X(rMax / 800) - X(0) + 1e-3);
  });
  it('2p: outer and inner turning points 4 ± 2√2 a0 (roots of −1/8 = −1/r + 1/r², i.e. E = −Z/r + l(l+1)/2r²)', () => {
    const { doc, X } = radial(2, 1);
    const outer = byClass(doc, 'rect', 'forbidden-outer')[0];
    const inner = byClass(doc, 'rect', 'forbidden-inner')[0];
    expect(num(outer, 'data-r-bohr')).toBeCloseTo(4 + 2 * Math.SQRT2, 10);
    expect(num(outer, 'x')).toBeCloseTo(X(4 + 2 * Math.SQRT2), 2);
    expect(num(inner, 'data-r-bohr')).toBeCloseTo(4 - 2 * Math.SQRT2, 10);
    expect(num(inner, 'x') + num(inner, 'width')).toBeCloseTo(X(4 - 2 * Math.SQRT2), 2);
  });
  it('2s: one node marker at r = 2 a0 (R_20 ∝ (2 − r) e^{−r/2}; Griffiths, Introduction to QM, Table 4.7, table number from memory)', () => {
    const { doc, X } = radial(2, 0);
    const nodes = byClass(doc, 'circle', 'node');
    expect(nodes).toHaveLength(1);
    expect(num(nodes[0], 'data-r-bohr')).toBeCloseTo(2, 9);
    expect(num(nodes[0], 'cx')).toBeCloseTo(X(2), 2);
    // lobes by the sign of R: inside the node R > 0, outside R < 0
    expect(byClass(doc, 'path', 'lobe-pos')).toHaveLength(1);
    expect(byClass(doc, 'path', 'lobe-neg')).toHaveLength(1);
  });
  it('3s: node markers at (9 ∓ 3√3)/2 a0 (zeros of 27 − 18r + 2r², same table)', () => {
    const { doc } = radial(3, 0);
    const r = byClass(doc, 'circle', 'node').map((e) => num(e, 'data-r-bohr')).sort((a, b) => a - b);
    expect(r[0]).toBeCloseTo((9 - 3 * Math.sqrt(3)) / 2, 9);
    expect(r[1]).toBeCloseTo((9 + 3 * Math.sqrt(3)) / 2, 9);
  });
  it('title, axis units and model note; Å unit converts the axis', () => {
    const { svg } = radial(2, 1, { unit: 'angstrom' });
    expect(svg).toContain('Radial distribution of 2p, Z = 1');
    expect(svg).toContain('r / Å');
    expect(svg).toContain('one-electron hydrogen-like model');
    const b = radial(2, 1, { unit: 'bohr' }).svg;
    expect(b).toContain('r / a<tspan');
  });
  it('fonts: embeds the passed woff2 bytes as data URIs; without bytes says so and falls back', () => {
    const withFonts = radialPlotSvg({ n: 1, l: 0, Z: 1, palette: PALETTE, widthMm: 89, heightMm: 60, unit: 'bohr', fonts: { regular: new Uint8Array([0, 1, 2, 3, 4]), bold: new TextEncoder().encode('foobar') } });
    parseSvg(withFonts);
    expect(withFonts).toContain('url(data:font/woff2;base64,AAECAwQ=) format("woff2")');
    expect(withFonts).toContain('font-weight:700;font-style:normal;src:url(data:font/woff2;base64,Zm9vYmFy)');
    const without = radial(1, 0).svg;
    expect(without).toContain('No font bytes were passed');
    expect(without).toContain('font-family:"Lato", sans-serif');
  });
  it('rejects bad input naming the field', () => {
    expect(() => radialPlotSvg({ n: 2, l: 2, Z: 1, palette: PALETTE, widthMm: 89, heightMm: 60, unit: 'bohr' })).toThrow(/l/);
    expect(() => radialPlotSvg({ n: 1, l: 0, Z: 1, palette: { ...PALETTE, positive: 'red"/><script>' }, widthMm: 89, heightMm: 60, unit: 'bohr' })).toThrow(/palette.positive/);
    expect(() => radialPlotSvg({ n: 1, l: 0, Z: 1, palette: PALETTE, widthMm: 2, heightMm: 60, unit: 'bohr' })).toThrow(/widthMm/);
    expect(() => radialPlotSvg({ n: 1, l: 0, Z: 1, palette: PALETTE, widthMm: 89, heightMm: 60, unit: 'parsec' as 'bohr' })).toThrow(/unit/);
  });
});

function section(label: string, plane: 'xy' | 'xz' | 'yz', offset: number, levels = 3, n = 41) {
  const svg = sectionMapSvg({ state: parseOrbitalLabel(label).state, plane, offset, extent: 10, n, levels, palette: PALETTE, widthMm: 88, heightMm: 100 });
  const doc = parseSvg(svg);
  const g = byClass(doc, 'g', 'section')[0];
  const x0 = num(g, 'data-x0');
  const y0 = num(g, 'data-y0');
  const side = num(g, 'data-side');
  return {
    svg,
    doc,
    pos: byClass(doc, 'path', 'contour-pos'),
    neg: byClass(doc, 'path', 'contour-neg'),
    nodal: byClass(doc, 'path', 'nodal'),
    U: (u: number) => x0 + ((u + 10) / 20) * side,
    V: (v: number) => y0 + ((10 - v) / 20) * side,
  };
}

describe('sectionMapSvg', () => {
  it('well-formed, size in mm, viewBox', () => {
    const { doc } = section('2pz', 'xz', 0);
    const root = doc.documentElement!;
    expect(root.getAttribute('width')).toBe('88mm');
    expect(root.getAttribute('height')).toBe('100mm');
    expect(root.getAttribute('viewBox')).toBe('0 0 88 100');
  });
  it('2p_z in the xz plane, 3 levels per sign: 3 contour-pos, 3 contour-neg, 1 nodal path on z = 0', () => {
    const { pos, neg, nodal, V, svg } = section('2pz', 'xz', 0);
    expect(pos.map((p) => p.getAttribute('data-level'))).toEqual(['1', '2', '3']);
    expect(neg.map((p) => p.getAttribute('data-level'))).toEqual(['-1', '-2', '-3']);
    expect(nodal).toHaveLength(1);
    expect(nodal[0].getAttribute('data-level')).toBe('0');
    // psi ∝ z: the nodal line is the x axis; every point of it sits at z = 0 (to 1 µm rounding)
    const pts = pathPoints(nodal[0].getAttribute('d')!);
    expect(pts.length).toBeGreaterThan(10);
    for (const [, y] of pts) expect(Math.abs(y - V(0))).toBeLessThan(2e-3);
    // + lobes above (z > 0, smaller SVG y), − below
    for (const [, y] of pathPoints(pos[0].getAttribute('d')!)) expect(y).toBeLessThan(V(0));
    for (const [, y] of pathPoints(neg[0].getAttribute('d')!)) expect(y).toBeGreaterThan(V(0));
    // The name is typeset: 2p with a subscript z (a tspan), never an underscore.
    expect(svg).toContain('2p<tspan');
    expect(svg).not.toContain('2p_z');
    expect(svg).toContain('one-electron hydrogen-like model');
  });
  it('levels are nested: level k+1 lies inside level k (smaller extent in u and v)', () => {
    const { pos } = section('2pz', 'xz', 0, 3, 61);
    const span = (d: string) => {
      const p = pathPoints(d);
      return Math.max(...p.map((q) => q[0])) - Math.min(...p.map((q) => q[0]));
    };
    const s = pos.map((p) => span(p.getAttribute('d')!));
    expect(s[0]).toBeGreaterThan(s[1]);
    expect(s[1]).toBeGreaterThan(s[2]);
  });
  it('2p_z in the xy plane at z = 0 is all nodal: no filled contour, one hatched nodal-plane path', () => {
    const { pos, neg, nodal, svg } = section('2pz', 'xy', 0);
    expect(pos).toHaveLength(0);
    expect(neg).toHaveLength(0);
    expect(nodal).toHaveLength(1);
    expect(nodal[0].getAttribute('class')).toContain('nodal-plane');
    expect(svg).toContain('ψ = 0 throughout this plane');
  });
  it('2p_z in the xy plane at z = 1 a0 is positive everywhere: only + contours, no nodal line', () => {
    const { pos, neg, nodal } = section('2pz', 'xy', 1);
    expect(pos).toHaveLength(3);
    expect(neg).toHaveLength(0);
    expect(nodal).toHaveLength(0);
  });
  it('3d_xy in the xy plane: nodal lines are the x and y axes (ψ ∝ xy), two + and two − lobes per level', () => {
    const { pos, neg, nodal, U, V } = section('3dxy', 'xy', 0, 2);
    expect(pos).toHaveLength(2);
    expect(neg).toHaveLength(2);
    const pts = pathPoints(nodal[0].getAttribute('d')!);
    for (const [x, y] of pts) expect(Math.min(Math.abs(x - U(0)), Math.abs(y - V(0)))).toBeLessThan(2e-3);
    const rings = (d: string) => (d.match(/M/g) ?? []).length;
    expect(rings(pos[0].getAttribute('d')!)).toBe(2);
    expect(rings(neg[0].getAttribute('d')!)).toBe(2);
  });
  it('accepts a compiled state and explicit thresholds; complex states note the signed-modulus drawing', () => {
    const compiled = compileState(parseOrbitalLabel('2pz').state);
    const svg = sectionMapSvg({ state: compiled, plane: 'yz', offset: 0, extent: 8, n: 31, thresholds: [0.01, 0.05], palette: PALETTE, widthMm: 60, heightMm: 70 });
    const doc = parseSvg(svg);
    expect(byClass(doc, 'path', 'contour-pos').map((p) => p.getAttribute('data-value'))).toEqual(['0.01', '0.05']);
    expect(doc.getElementsByTagName('title')[0].textContent).toMatch(/^2pz: yz plane, x = 0 a₀$/);
    const cx = sectionMapSvg({ state: parseOrbitalLabel('2p+1').state, plane: 'xz', offset: 0, extent: 10, n: 31, palette: PALETTE, widthMm: 60, heightMm: 70, colouring: { mode: 'sign' } });
    const cdoc = parseSvg(cx);
    expect(cx).toContain('|ψ| with the sign of Re ψ');
    // Coloured by sign, a complex map's dashed line is where Re ψ changes sign, and says so (it is no node of ψ).
    expect(Array.from(cdoc.getElementsByTagName('text')).map((t) => t.textContent)).toContain('Re ψ = 0');
  });
  it('one length unit per figure: an Å map says Å for the axes, the plane position, the scale bar and ψ; a0 appears nowhere', () => {
    // 3d_z² in the xz plane at y = 1 a0 = 0.529 Å (CODATA 2018 a0 = 0.529177210903 Å).
    const svg = sectionMapSvg({ state: parseOrbitalLabel('3dz2').state, plane: 'xz', offset: 1, extent: 12, n: 31, palette: PALETTE, widthMm: 89, heightMm: 60, unit: 'angstrom' });
    const doc = parseSvg(svg);
    const texts = Array.from(doc.getElementsByTagName('text')).map((t) => t.textContent ?? '');
    const title = texts.find((t) => /plane/.test(t))!;
    expect(title).toBe('3dz²: xz plane, y = 0.529 Å');
    expect(texts.filter((t) => /\/ Å$/.test(t))).toHaveLength(2); // "x / Å", "z / Å"
    expect(texts.find((t) => /levels/.test(t))).toMatch(/Å−3\/2\)$/); // ψ per Å^(3/2)
    for (const t of texts) expect({ t, a0: /a0|a₀/.test(t) }).toEqual({ t, a0: false });
    expect(svg).not.toMatch(/>a<tspan[^>]*class="sub">0</);
  });
  it('axes carry at least five ticks (0 and two each side), even on a small figure', () => {
    for (const [w, h, extent] of [[89, 60, 12], [40, 40, 8], [180, 120, 30], [89, 60, 0.4]] as const) {
      for (const unit of ['bohr', 'angstrom'] as const) {
        const svg = sectionMapSvg({ state: parseOrbitalLabel('2pz').state, plane: 'xz', offset: 0, extent, n: 21, palette: PALETTE, widthMm: w, heightMm: h, unit });
        const doc = parseSvg(svg);
        const xt = byClass(doc, 'text', 'tick').length / 2; // x and y ticks share the values
        expect({ w, h, extent, unit, enough: xt >= 5 }).toEqual({ w, h, extent, unit, enough: true });
      }
    }
  });
  it('rejects bad input naming the field', () => {
    const st = parseOrbitalLabel('2pz').state;
    const base = { state: st, plane: 'xz' as const, offset: 0, extent: 10, n: 31, palette: PALETTE, widthMm: 88, heightMm: 100 };
    expect(() => sectionMapSvg({ ...base, plane: 'ab' as 'xy' })).toThrow(/plane/);
    expect(() => sectionMapSvg({ ...base, levels: 0 })).toThrow(/levels/);
    expect(() => sectionMapSvg({ ...base, thresholds: [-1] })).toThrow(/thresholds/);
    expect(() => sectionMapSvg({ ...base, state: { Z: 1, terms: [{ n: 1, l: 1, m: 0, basis: 'real', re: 1, im: 0 }] } })).toThrow(/state: terms\[0\]/);
  });
});

/** Even-odd point-in-path for the M/L/Z paths the maps write (mm, y down). */
function inside(d: string, x: number, y: number): boolean {
  let hit = false;
  for (const sub of d.split('M').filter(Boolean)) {
    const pts = pathPoints('M' + sub);
    for (let i = 0, j = pts.length - 1; i < pts.length; j = i++) {
      const [xi, yi] = pts[i];
      const [xj, yj] = pts[j];
      if (yi > y !== yj > y && x < ((xj - xi) * (y - yi)) / (yj - yi) + xi) hit = !hit;
    }
  }
  return hit;
}

describe('sectionMapSvg coloured by arg ψ (complex states, and any figure coloured by phase)', () => {
  const WHEEL = { lightness: 0.7, chroma: 0.12 };
  const map = (label: string, plane: 'xy' | 'xz', extra: Partial<Parameters<typeof sectionMapSvg>[0]> = {}) => {
    const svg = sectionMapSvg({ state: parseOrbitalLabel(label).state, plane, offset: 0, extent: 10, n: 61, palette: PALETTE, widthMm: 89, heightMm: 60, colouring: { wheel: WHEEL }, ...extra });
    const doc = parseSvg(svg);
    const g = byClass(doc, 'g', 'section')[0];
    const x0 = num(g, 'data-x0');
    const y0 = num(g, 'data-y0');
    const side = num(g, 'data-side');
    // Map (u, v) in a0 to the page (v up), as the map draws it.
    const at = (u: number, v: number) => [x0 + ((u + 10) / 20) * side, y0 + ((10 - v) / 20) * side] as const;
    return { svg, doc, at, bands: byClass(doc, 'path', 'phase-band') };
  };
  it('2p(m=+1) in the xy plane: every band of the wheel, each in phaseColoursInto\'s colour, and the point at azimuth φ lies in the band of arg ψ = φ + π', () => {
    // ψ ∝ Y_1^1 = −√(3/8π) sin θ e^{iφ} (Condon–Shortley phase, as in DLMF 14.7.14 / 14.30.1), so arg ψ = φ + π.
    const { doc, at, bands } = map('2p+1', 'xy');
    expect(bands).toHaveLength(PHASE_MAP_BANDS);
    for (const b of bands) expect(b.getAttribute('fill')).toBe(phaseHex({ positive: PALETTE.positive, negative: PALETTE.negative, wheel: WHEEL }, 'argument', 'complex', (2 * Math.PI * Math.round((num(b, 'data-angle') * PHASE_MAP_BANDS) / (2 * Math.PI))) / PHASE_MAP_BANDS));
    for (const phiDeg of [17, 93, 200, 290]) {
      const phi = (phiDeg * Math.PI) / 180;
      const [x, y] = at(3 * Math.cos(phi), 3 * Math.sin(phi)); // off the bands' edges (φ + π not at 5° + k·10°), r = 3 a0: |ψ| well above the lowest level
      const holding = bands.filter((b) => inside(b.getAttribute('d')!, x, y)).map((b) => num(b, 'data-angle'));
      expect(holding.length).toBe(1);
      const want = (phi + Math.PI) % (2 * Math.PI);
      const diff = Math.abs(((holding[0] - want + 3 * Math.PI) % (2 * Math.PI)) - Math.PI);
      expect(diff).toBeLessThanOrEqual(Math.PI / PHASE_MAP_BANDS + 0.01); // within half a band
    }
    // The key: marked 0, π/2, π, 3π/2, titled arg ψ; no ψ > 0 / ψ < 0 legend and no nodal line (ψ is complex).
    const key = byClass(doc, 'g', 'phase-key');
    expect(key).toHaveLength(1);
    const texts = Array.from(key[0].getElementsByTagName('text')).map((t) => t.textContent);
    expect(texts).toEqual(['arg ψ', '0', 'π/2', 'π', '3π/2']);
    expect(byClass(doc, 'rect', 'legend-pos')).toHaveLength(0);
    expect(byClass(doc, 'path', 'nodal')).toHaveLength(0);
    expect(byClass(doc, 'path', 'contour-abs').length).toBe(4);
    expect(doc.getElementsByTagName('desc')[0].textContent).toMatch(/arg ψ on the phase wheel \(key marked 0, π\/2, π, 3π\/2\)/);
  });
  it('2p(m=+1) in the xz plane shows only arg 0 and π (ψ is real there), on the side Condon–Shortley puts them', () => {
    const { at, bands } = map('2p+1', 'xz');
    expect(bands.map((b) => num(b, 'data-angle'))).toEqual([0, 3.142]);
    const [xr, yr] = at(3, 0);
    expect(inside(bands[1].getAttribute('d')!, xr, yr)).toBe(true); // x > 0: ψ < 0, arg π
    const [xl, yl] = at(-3, 0);
    expect(inside(bands[0].getAttribute('d')!, xl, yl)).toBe(true);
  });
  it('a real state keeps the two-phase legend by default, and coloured by phase it has bands at 0 and π, its nodal line and the key', () => {
    const plain = map('2pz', 'xz', { colouring: undefined });
    expect(plain.bands).toHaveLength(0);
    expect(byClass(plain.doc, 'g', 'phase-key')).toHaveLength(0);
    expect(byClass(plain.doc, 'rect', 'legend-pos')).toHaveLength(1);
    const phased = map('2pz', 'xz', { colouring: { mode: 'argument', wheel: WHEEL } });
    expect(phased.bands.map((b) => num(b, 'data-angle'))).toEqual([0, 3.142]);
    expect(byClass(phased.doc, 'path', 'nodal')).toHaveLength(1);
    expect(byClass(phased.doc, 'g', 'phase-key')).toHaveLength(1);
  });
});
