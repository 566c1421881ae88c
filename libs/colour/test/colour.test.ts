import { describe, expect, it } from 'vitest';
import { converter, differenceCiede2000 } from 'culori';
import {
  checkSwatchbook,
  contrastRatio,
  deltaE2000,
  MACHADO_2009,
  PHASE_DELTA_E_ERROR,
  PHASE_DELTA_E_WARN,
  phaseColor,
  phaseWheel,
  simulateCvd,
  DEFAULT_WHEEL,
  phaseColoursInto,
  phaseHex,
  phaseRgb,
  resolvePhaseMode,
} from '../src';

/**
 * Sharma, Wu & Dalal (2005), "The CIEDE2000 color-difference formula: implementation notes, supplementary
 * test data, and mathematical observations", Color Res. Appl. 30(1) 21-30, Table 1: the 34 test pairs
 * [L1, a1, b1, L2, a2, b2, ΔE00]. Entered from the paper's table (from memory); every pair agreeing with
 * culori to 1e-4 is what confirms both.
 */
const SHARMA_2005: [number, number, number, number, number, number, number][] = [
  [50.0, 2.6772, -79.7751, 50.0, 0.0, -82.7485, 2.0425],
  [50.0, 3.1571, -77.2803, 50.0, 0.0, -82.7485, 2.8615],
  [50.0, 2.8361, -74.02, 50.0, 0.0, -82.7485, 3.4412],
  [50.0, -1.3802, -84.2814, 50.0, 0.0, -82.7485, 1.0],
  [50.0, -1.1848, -84.8006, 50.0, 0.0, -82.7485, 1.0],
  [50.0, -0.9009, -85.5211, 50.0, 0.0, -82.7485, 1.0],
  [50.0, 0.0, 0.0, 50.0, -1.0, 2.0, 2.3669],
  [50.0, -1.0, 2.0, 50.0, 0.0, 0.0, 2.3669],
  [50.0, 2.49, -0.001, 50.0, -2.49, 0.0009, 7.1792],
  [50.0, 2.49, -0.001, 50.0, -2.49, 0.001, 7.1792],
  [50.0, 2.49, -0.001, 50.0, -2.49, 0.0011, 7.2195],
  [50.0, 2.49, -0.001, 50.0, -2.49, 0.0012, 7.2195],
  [50.0, -0.001, 2.49, 50.0, 0.0009, -2.49, 4.8045],
  [50.0, -0.001, 2.49, 50.0, 0.001, -2.49, 4.8045],
  [50.0, -0.001, 2.49, 50.0, 0.0011, -2.49, 4.7461],
  [50.0, 2.5, 0.0, 50.0, 0.0, -2.5, 4.3065],
  [50.0, 2.5, 0.0, 73.0, 25.0, -18.0, 27.1492],
  [50.0, 2.5, 0.0, 61.0, -5.0, 29.0, 22.8977],
  [50.0, 2.5, 0.0, 56.0, -27.0, -3.0, 31.903],
  [50.0, 2.5, 0.0, 58.0, 24.0, 15.0, 19.4535],
  [50.0, 2.5, 0.0, 50.0, 3.1736, 0.5854, 1.0],
  [50.0, 2.5, 0.0, 50.0, 3.2972, 0.0, 1.0],
  [50.0, 2.5, 0.0, 50.0, 1.8634, 0.5757, 1.0],
  [50.0, 2.5, 0.0, 50.0, 3.2592, 0.335, 1.0],
  [60.2574, -34.0099, 36.2677, 60.4626, -34.1751, 39.4387, 1.2644],
  [63.0109, -31.0961, -5.8663, 62.8187, -29.7946, -4.0864, 1.263],
  [61.2901, 3.7196, -5.3901, 61.4292, 2.248, -4.962, 1.8731],
  [35.0831, -44.1164, 3.7933, 35.0232, -40.0716, 1.5901, 1.8645],
  [22.7233, 20.0904, -46.694, 23.0331, 14.973, -42.5619, 2.0373],
  [36.4612, 47.858, 18.3852, 36.2715, 50.5065, 21.2231, 1.4146],
  [90.8027, -2.0831, 1.441, 91.1528, -1.6435, 0.0447, 1.4441],
  [90.9257, -0.5406, -0.9208, 88.6381, -0.8985, -0.7239, 1.5381],
  [6.7747, -0.2908, -2.4247, 5.8714, -0.0985, -2.2286, 0.6377],
  [2.0776, 0.0795, -1.135, 0.9033, -0.0636, -0.5514, 0.9082],
];

/** sRGB transfer function, IEC 61966-2-1 (decode and encode), written out to check the library by hand. */
const decode = (v: number) => (v <= 0.04045 ? v / 12.92 : ((v + 0.055) / 1.055) ** 2.4);
const encode = (v: number) => (v <= 0.0031308 ? 12.92 * v : 1.055 * v ** (1 / 2.4) - 0.055);
const hexToRgb = (hex: string) => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255);

describe('deltaE2000 (CIEDE2000)', () => {
  const de = differenceCiede2000();
  it.each(SHARMA_2005.map((r, i) => [i + 1, ...r]))('Sharma et al. 2005 Table 1 pair %i', (_i, L1, a1, b1, L2, a2, b2, expected) => {
    const got = de({ mode: 'lab65', l: L1, a: a1, b: b1 }, { mode: 'lab65', l: L2, a: a2, b: b2 });
    expect(Math.abs(got - expected)).toBeLessThanOrEqual(1e-4);
    // symmetric (the formula is symmetric in its two inputs; Sharma et al. 2005, section 3)
    expect(Math.abs(de({ mode: 'lab65', l: L2, a: a2, b: b2 }, { mode: 'lab65', l: L1, a: a1, b: b1 }) - got)).toBeLessThan(1e-9);
  });

  it('works on hex through CIELAB D65: equal colours 0, black/white 100', () => {
    expect(deltaE2000('#c8553d', '#C8553D')).toBe(0);
    // L* of white is 100 and of black 0 in CIELAB; for neutrals ΔE00 reduces to ΔL/SL with SL = 1 at ΔL centre 50.
    expect(deltaE2000('#000000', '#ffffff')).toBeCloseTo(100, 3);
  });

  it('rejects a malformed colour naming it', () => {
    expect(() => deltaE2000('#12345', '#ffffff')).toThrow('"#12345" is not a #rrggbb colour');
  });
});

describe('contrastRatio (WCAG 2.1 relative luminance)', () => {
  it('#767676 on white is 4.54:1 (the grey commonly quoted as the lightest passing AA on white)', () => {
    expect(contrastRatio('#767676', '#ffffff').toFixed(2)).toBe('4.54');
  });
  it('black on white is 21:1, order does not matter, equal colours 1:1', () => {
    expect(contrastRatio('#000000', '#ffffff')).toBeCloseTo(21, 10);
    expect(contrastRatio('#ffffff', '#000000')).toBeCloseTo(21, 10);
    expect(contrastRatio('#2f6690', '#2f6690')).toBeCloseTo(1, 12);
  });
  it('matches the WCAG 2.1 formula written out by hand', () => {
    // WCAG 2.1 "relative luminance": L = 0.2126 R + 0.7152 G + 0.0722 B on linearised components.
    const lum = (hex: string) => {
      const [r, g, b] = hexToRgb(hex).map(decode);
      return 0.2126 * r + 0.7152 * g + 0.0722 * b;
    };
    const l1 = lum('#c8553d');
    const l2 = lum('#f4f1ea');
    const expected = (Math.max(l1, l2) + 0.05) / (Math.min(l1, l2) + 0.05);
    expect(contrastRatio('#c8553d', '#f4f1ea')).toBeCloseTo(expected, 4);
  });
});

describe('simulateCvd (Machado, Oliveira & Fernandes 2009, severity 1.0)', () => {
  it('white and black are unchanged for every kind (each matrix row sums to 1)', () => {
    for (const kind of ['protanopia', 'deuteranopia', 'tritanopia'] as const) {
      expect(simulateCvd('#ffffff', kind)).toBe('#ffffff');
      expect(simulateCvd('#000000', kind)).toBe('#000000');
    }
  });

  it('pure red under protanopia equals the published matrix applied by hand in linear RGB', () => {
    const m = MACHADO_2009.protanopia;
    // linear red (1, 0, 0) -> first column of the matrix, clipped to [0, 1], then sRGB-encoded
    const lin = [m[0], m[3], m[6]].map((v) => Math.min(1, Math.max(0, v)));
    const hand = '#' + lin.map((v) => Math.round(encode(v) * 255).toString(16).padStart(2, '0')).join('');
    expect(simulateCvd('#ff0000', 'protanopia')).toBe(hand);
  });

  it('pure red under protanopia loses most of its red-green opponent component (CIELAB a*)', () => {
    const lab = converter('lab65');
    const before = lab('#ff0000')!.a;
    const after = lab(simulateCvd('#ff0000', 'protanopia'))!.a;
    expect(before).toBeGreaterThan(75);
    expect(Math.abs(after)).toBeLessThan(0.1 * before);
    // and red vs green, far apart for normal vision, come much closer
    const normal = deltaE2000('#ff0000', '#00ff00');
    const protan = deltaE2000(simulateCvd('#ff0000', 'protanopia'), simulateCvd('#00ff00', 'protanopia'));
    expect(protan).toBeLessThan(0.6 * normal);
  });

  it('tritanopia leaves red-green largely intact but collapses blue-yellow (blue vs yellow-green)', () => {
    const normal = deltaE2000('#3050ff', '#a0c020');
    const trit = deltaE2000(simulateCvd('#3050ff', 'tritanopia'), simulateCvd('#a0c020', 'tritanopia'));
    expect(trit).toBeLessThan(normal);
    const rg = deltaE2000(simulateCvd('#d03020', 'tritanopia'), simulateCvd('#20a040', 'tritanopia'));
    expect(rg).toBeGreaterThan(0.7 * deltaE2000('#d03020', '#20a040'));
  });
});

describe('phaseWheel (OKLCH, constant L and C)', () => {
  const oklab = converter('oklab');
  const dOk = (a: string, b: string) => {
    const p = oklab(a)!;
    const q = oklab(b)!;
    return Math.hypot(p.l - q.l, p.a - q.a, p.b - q.b);
  };

  it('is cyclic: the last step is a neighbour of the first as close as any other pair, and phase 2π is phase 0', () => {
    const w = phaseWheel({ lightness: 0.7, chroma: 0.1, steps: 24 });
    const gaps = w.steps.map((c, i) => dOk(c, w.steps[(i + 1) % w.steps.length]));
    const inner = gaps.slice(0, -1);
    const wrap = gaps[gaps.length - 1];
    expect(wrap).toBeGreaterThan(0.8 * Math.min(...inner));
    expect(wrap).toBeLessThan(1.2 * Math.max(...inner));
    expect(phaseColor(2 * Math.PI, w)).toBe(phaseColor(0, w));
    expect(phaseColor(-Math.PI / 2, w)).toBe(phaseColor((3 * Math.PI) / 2, w));
    expect(w.steps[6]).toBe(phaseColor(Math.PI / 2, w));
  });

  it('is even: neighbour differences in OKLab vary by less than 20%, also when the requested chroma must be clamped', () => {
    for (const chroma of [0.1, 0.25]) {
      const w = phaseWheel({ lightness: 0.7, chroma, steps: 24 });
      const gaps = w.steps.map((c, i) => dOk(c, w.steps[(i + 1) % w.steps.length]));
      expect((Math.max(...gaps) - Math.min(...gaps)) / Math.max(...gaps)).toBeLessThan(0.2);
      // chord of a circle of radius C with 24 equal steps: 2 C sin(π/24)
      expect(gaps[0]).toBeCloseTo(2 * w.chroma * Math.sin(Math.PI / 24), 2);
    }
  });

  it('clamps to sRGB as a whole: a too-high chroma is lowered once for all hues, and every step is displayable', () => {
    const w = phaseWheel({ lightness: 0.7, chroma: 0.25, steps: 36 });
    expect(w.clamped).toBe(true);
    expect(w.chroma).toBeLessThan(0.25);
    expect(w.chroma).toBeGreaterThan(0.08);
    const ok = phaseWheel({ lightness: 0.7, chroma: 0.05, steps: 36 });
    expect(ok.clamped).toBe(false);
    expect(ok.chroma).toBe(0.05);
  });

  it('rejects bad options naming them', () => {
    expect(() => phaseWheel({ lightness: 1.2, chroma: 0.1, steps: 12 })).toThrow('lightness');
    expect(() => phaseWheel({ lightness: 0.7, chroma: 0.1, steps: 2 })).toThrow('steps');
  });
});

describe('checkSwatchbook', () => {
  it('a clear palette passes: phases far apart for normal vision and every dichromacy, dark label on light paper', () => {
    const r = checkSwatchbook({ positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' });
    expect(r.figures.phaseDeltaE2000).toBeCloseTo(deltaE2000('#c8553d', '#2f6690'), 2);
    expect(r.figures.phaseDeltaE2000).toBeGreaterThan(PHASE_DELTA_E_WARN);
    expect(r.figures.phaseDeltaE2000Protan).toBeCloseTo(deltaE2000(simulateCvd('#c8553d', 'protanopia'), simulateCvd('#2f6690', 'protanopia')), 2);
    expect(r.figures.labelContrast).toBeCloseTo(contrastRatio('#1a1a1a', '#ffffff'), 2);
    expect(r.warnings.filter((w) => w.code === 'phases_too_similar')).toEqual([]);
  });

  it('red against green is fine for normal vision but warned about under protanopia and deuteranopia', () => {
    const r = checkSwatchbook({ positive: '#c0392b', negative: '#4f8a2b', background: '#ffffff', label: '#000000' });
    expect(r.figures.phaseDeltaE2000).toBeGreaterThan(PHASE_DELTA_E_WARN);
    const phaseWarnings = r.warnings.filter((w) => w.code === 'phases_too_similar');
    expect(phaseWarnings.some((w) => w.message.includes('protanopia'))).toBe(true);
    expect(phaseWarnings.some((w) => w.message.includes('deuteranopia'))).toBe(true);
    expect(phaseWarnings.every((w) => w.colors.join() === 'positive,negative')).toBe(true);
  });

  it('nearly equal phases are an error-level warning whose text states the threshold and why', () => {
    const r = checkSwatchbook({ positive: '#2f6690', negative: '#336a94', background: '#ffffff', label: '#1a1a1a' });
    expect(r.figures.phaseDeltaE2000).toBeLessThan(PHASE_DELTA_E_ERROR);
    const w = r.warnings.find((x) => x.code === 'phases_too_similar')!;
    expect(w.level).toBe('error');
    expect(w.message).toContain(`at least ${PHASE_DELTA_E_WARN}`);
    expect(w.message).toContain('just noticeable');
  });

  it('a light label on light paper is flagged with its WCAG contrast; a wheel that needs clamping is reported', () => {
    const r = checkSwatchbook({ positive: '#c8553d', negative: '#2f6690', background: '#ffffff', label: '#bbbbbb', wheel: { lightness: 0.7, chroma: 0.3 } });
    const w = r.warnings.find((x) => x.code === 'label_contrast_low')!;
    expect(w.message).toContain(`${contrastRatio('#bbbbbb', '#ffffff').toFixed(2)}:1`);
    expect(r.figures.wheel?.clamped).toBe(true);
    expect(r.warnings.some((x) => x.code === 'wheel_clamped')).toBe(true);
  });
});

describe('phaseColoursInto: the one phase-colouring rule', () => {
  const palette = { positive: '#c8553d', negative: '#2f6690', wheel: { lightness: 0.7, chroma: 0.11 } };
  it("sign colouring: '+' and '-' take the swatchbook's colours exactly; a complex surface takes them by the sign of Re psi", () => {
    expect(phaseHex(palette, 'sign', '+')).toBe('#c8553d');
    expect(phaseHex(palette, 'sign', '-')).toBe('#2f6690');
    const out = phaseColoursInto(palette, 'sign', 'complex', new Float32Array([0.3, 2.5]), new Float32Array(6));
    expect(phaseHex(palette, 'sign', 'complex', 0.3)).toBe('#c8553d'); // cos 0.3 > 0
    expect(phaseHex(palette, 'sign', 'complex', 2.5)).toBe('#2f6690'); // cos 2.5 < 0
    expect(out[3]).toBeCloseTo(0x2f / 255, 6);
  });
  it('argument colouring follows the wheel: hue = arg psi (within one 8-bit step of culori at every 5 degrees), cyclic', () => {
    for (let d = 0; d < 360; d += 5) {
      const a = (d * Math.PI) / 180;
      const ref = converter('rgb')(phaseColor(a, palette.wheel))!;
      const got = phaseRgb(palette, 'argument', 'complex', a);
      expect(Math.abs(got[0] - ref.r) * 255).toBeLessThan(1);
      expect(Math.abs(got[1] - ref.g) * 255).toBeLessThan(1);
      expect(Math.abs(got[2] - ref.b) * 255).toBeLessThan(1);
    }
    expect(phaseHex(palette, 'argument', 'complex', -Math.PI / 2)).toBe(phaseHex(palette, 'argument', 'complex', (3 * Math.PI) / 2));
    // A real state coloured by argument shows arg 0 ('+') and arg pi ('-').
    expect(phaseHex(palette, 'argument', '+')).toBe(phaseHex(palette, 'argument', 'complex', 0));
    expect(phaseHex(palette, 'argument', '-')).toBe(phaseHex(palette, 'argument', 'complex', Math.PI));
  });
  it('linear output is the IEC 61966-2-1 decoding of the sRGB output; absent wheel = DEFAULT_WHEEL; auto mode by state', () => {
    const angles = new Float32Array([0, 1, 2, 3]);
    const s = phaseColoursInto(palette, 'argument', 'complex', angles, new Float32Array(12));
    const l = phaseColoursInto(palette, 'argument', 'complex', angles, new Float32Array(12), { linear: true });
    for (let i = 0; i < 12; i++) expect(l[i]).toBeCloseTo(s[i] <= 0.04045 ? s[i] / 12.92 : ((s[i] + 0.055) / 1.055) ** 2.4, 6);
    expect(phaseHex({ ...palette, wheel: null }, 'argument', 'complex', 1)).toBe(phaseHex({ ...palette, wheel: DEFAULT_WHEEL }, 'argument', 'complex', 1));
    expect(resolvePhaseMode('auto', true)).toBe('sign');
    expect(resolvePhaseMode('auto', false)).toBe('argument');
    expect(resolvePhaseMode('sign', false)).toBe('sign');
    expect(() => phaseColoursInto(palette, 'argument', 'complex', null, new Float32Array(3))).toThrow(/phaseAngle/);
  });
});
