// Preflight rules on tiny cases checkable by hand (numbers worked out in the comments).
import { DEFAULT_DELIVERY_PROFILE, PREFLIGHT_RULES, parseDeliveryProfile, recipeSchema, type DeliveryProfile } from '@psiform/contracts';
import { describe, expect, it } from 'vitest';
import { figureSvg, mmToPt, placement, plannedSubject, preflightFailures, preflightFile, preflightReport, preflightText, svgPrintFacts, type PreflightSubject } from '../src';

const profile: DeliveryProfile = {
  ...DEFAULT_DELIVERY_PROFILE,
  columnWidthsMm: [{ name: 'single', widthMm: 89 }, { name: 'double', widthMm: 183 }],
  minDpi: 600,
  minFontPt: 6,
  minLineWeightPt: 0.25,
  colourMode: 'cmyk',
  pressCondition: 'fogra39',
  altText: { required: true, maxLength: 125, longDescriptionRequired: true },
};

// 89 mm at 600 dpi: 89 / 25.4 × 600 = 2102.36 -> 2102 px; 60 mm -> 1417.32 -> 1417 px.
const tiff: PreflightSubject = {
  file: 'figure.tif',
  format: 'tiff',
  widthMm: 89,
  heightMm: 60,
  raster: { widthPx: 2102, heightPx: 1417, dpi: 600, dpiTagged: 600 },
  colourSpace: 'cmyk',
  icc: { description: 'Psiform FOGRA39 coated', condition: 'fogra39' },
  texts: [{ what: 'label', sizePt: 10 }, { what: 'label subscript', sizePt: 7 }],
  lines: [{ what: 'scale bar', weightPt: 1 }],
  fonts: 'rasterised',
  altText: { short: '3d_z² orbital, 90% enclosed', long: 'A longer description.' },
};
const status = (r: ReturnType<typeof preflightFile>, id: string) => r.results.find((x) => x.rule === id)!.status;

describe('preflightFile', () => {
  it('lists every rule, in order, each pass or fail; a good CMYK TIFF passes them all', () => {
    const r = preflightFile(tiff, profile);
    expect(r.results.map((x) => x.rule)).toEqual(PREFLIGHT_RULES.map((x) => x.id));
    expect(r.results.every((x) => x.status === 'pass')).toBe(true);
    expect(r.passed).toBe(true);
  });

  it('size: one pixel off, or a wrong resolution tag, fails', () => {
    expect(status(preflightFile({ ...tiff, raster: { ...tiff.raster!, widthPx: 2103 } }, profile), 'size')).toBe('fail');
    expect(status(preflightFile({ ...tiff, raster: { ...tiff.raster!, dpiTagged: 72 } }, profile), 'size')).toBe('fail');
  });

  it('resolution: 300 dpi fails a 600 dpi minimum (and the pixels for 300 dpi are 1051 × 709)', () => {
    const r = preflightFile({ ...tiff, raster: { widthPx: 1051, heightPx: 709, dpi: 300, dpiTagged: 300 } }, profile);
    expect(status(r, 'size')).toBe('pass');
    expect(status(r, 'resolution')).toBe('fail');
    expect(r.results.find((x) => x.rule === 'resolution')!.actual).toBe('300 dpi');
  });

  it('column width and scaling: 366 mm is reduced to 183 mm (50%), so 10 pt text becomes 5 pt and fails 6 pt', () => {
    expect(placement(366, profile)).toEqual({ scale: 0.5, columnMm: 183, column: 'double' });
    expect(placement(89.4, profile).scale).toBe(1); // within 0.5 mm of the single column
    const wide = preflightFile({ ...tiff, widthMm: 366, raster: undefined, format: 'pdf', pageMm: { width: 366, height: 60 }, texts: [{ what: 'tick', sizePt: 10 }] }, profile);
    expect(status(wide, 'column_width')).toBe('fail');
    expect(status(wide, 'font_size')).toBe('fail');
    expect(wide.results.find((x) => x.rule === 'font_size')!.actual).toBe('smallest: tick 5 pt (10 pt × 0.5)');
  });

  it('font size: a 70% subscript of 8 pt text is 5.6 pt, below 6 pt; of 9 pt it is 6.3 pt and passes', () => {
    expect(status(preflightFile({ ...tiff, texts: [{ what: 'a', sizePt: 8 }, { what: 'a sub', sizePt: 8 * 0.7 }] }, profile), 'font_size')).toBe('fail');
    expect(status(preflightFile({ ...tiff, texts: [{ what: 'a', sizePt: 9 }, { what: 'a sub', sizePt: 9 * 0.7 }] }, profile), 'font_size')).toBe('pass');
  });

  it('line weight: 0.2 pt fails 0.25 pt', () => {
    expect(status(preflightFile({ ...tiff, lines: [{ what: 'tick', weightPt: 0.2 }] }, profile), 'line_weight')).toBe('fail');
  });

  it('colour mode and profile: an sRGB file fails a CMYK FOGRA39 profile twice; GRACoL in place of FOGRA39 fails the profile only', () => {
    const rgb = preflightFile({ ...tiff, colourSpace: 'rgb', icc: { description: 'sRGB', condition: 'srgb' } }, profile);
    expect([status(rgb, 'colour_mode'), status(rgb, 'icc_profile')]).toEqual(['fail', 'fail']);
    const gracol = preflightFile({ ...tiff, icc: { description: 'GRACoL', condition: 'gracol' } }, profile);
    expect([status(gracol, 'colour_mode'), status(gracol, 'icc_profile')]).toEqual(['pass', 'fail']);
    expect(status(preflightFile({ ...tiff, icc: null }, profile), 'icc_profile')).toBe('fail');
  });

  it('fonts: a vector file with a font not embedded fails; rasterised text passes', () => {
    const pdf: PreflightSubject = { ...tiff, file: 'section.pdf', format: 'pdf', raster: undefined, pageMm: { width: 89, height: 60 }, fonts: [{ name: 'Lato', embedded: true, subset: true }, { name: 'Helvetica', embedded: false, subset: false }] };
    expect(status(preflightFile(pdf, profile), 'fonts_embedded')).toBe('fail');
    expect(status(preflightFile({ ...pdf, fonts: [{ name: 'Lato', embedded: true, subset: true }] }, profile), 'fonts_embedded')).toBe('pass');
    expect(status(preflightFile({ ...pdf, pageMm: { width: 89.2, height: 60 } }, profile), 'size')).toBe('fail');
  });

  it('fonts: an embedded font without a glyph for ψ fails and names the character and its code point', () => {
    const pdf: PreflightSubject = { ...tiff, file: 'section.pdf', format: 'pdf', raster: undefined, pageMm: { width: 89, height: 60 }, fonts: [{ name: 'Lato', embedded: true, subset: true }] };
    const r = preflightFile({ ...pdf, unglyphed: ['ψ'] }, profile).results.find((x) => x.rule === 'fonts_embedded')!;
    expect(r.status).toBe('fail');
    expect(r.actual).toBe('Lato (embedded, subset); no glyph for "ψ" (U+03C8)');
    expect(status(preflightFile({ ...pdf, unglyphed: [] }, profile), 'fonts_embedded')).toBe('pass');
  });

  it('alt text: 126 characters fail a 125 limit; 125 pass; a missing long description fails', () => {
    expect(status(preflightFile({ ...tiff, altText: { short: 'x'.repeat(126), long: 'y' } }, profile), 'alt_text')).toBe('fail');
    expect(status(preflightFile({ ...tiff, altText: { short: 'x'.repeat(125), long: 'y' } }, profile), 'alt_text')).toBe('pass');
    expect(status(preflightFile({ ...tiff, altText: { short: 'x' } }, profile), 'alt_text')).toBe('fail');
  });

  it('format: a PNG fails a profile that takes TIFF only', () => {
    expect(status(preflightFile({ ...tiff, format: 'png' }, { ...profile, rasterFormats: ['tiff'] }), 'format')).toBe('fail');
  });
});

describe('preflightReport', () => {
  it('fails when any file fails and lists the failures one per line', () => {
    const rep = preflightReport([tiff, { ...tiff, file: 'b.tif', raster: { ...tiff.raster!, dpi: 300, dpiTagged: 300, widthPx: 1051, heightPx: 709 } }], profile, '2025-01-01T00:00:00.000Z');
    expect(rep.passed).toBe(false);
    expect(preflightFailures(rep)).toEqual(['b.tif: resolution: expected at least 600 dpi (combination art); has 300 dpi']);
    expect(preflightText(rep)).toMatch(/FAIL  resolution/);
  });
});

describe('svgPrintFacts', () => {
  it('reads class and inline font sizes (mm -> pt), 70% tspans, and stroke widths', () => {
    const svg = '<svg><style><![CDATA[text{font-family:"Lato";}\n.tick{font-size:2.5px;fill:#000;}\n]]></style>' +
      '<text class="tick" x="1">r / a<tspan baseline-shift="sub" font-size="70%">0</tspan></text><text font-size="3.5">T</text>' +
      '<path class="axes" d="M0 0L1 1" stroke="#000" stroke-width="0.25"/><rect fill="#fff" stroke="none"/></svg>';
    const f = svgPrintFacts(svg);
    // 2.5 mm = 7.087 pt; 70% of it 4.961 pt; 3.5 mm = 9.921 pt; 0.25 mm = 0.709 pt.
    expect(f.texts.map((t) => Math.round(t.sizePt * 1000) / 1000)).toEqual([7.087, 4.961, 9.921]);
    expect(f.lines).toEqual([{ what: 'path.axes', weightPt: mmToPt(0.25) }]);
  });
});

describe('parseDeliveryProfile', () => {
  it('accepts the default and names the field of each error', () => {
    expect(parseDeliveryProfile(DEFAULT_DELIVERY_PROFILE).ok).toBe(true);
    const bad = parseDeliveryProfile({ ...DEFAULT_DELIVERY_PROFILE, minDpi: 50, pressCondition: 'newsprint', fileNameTemplate: '{figure}/{colour}', extra: 1 });
    expect(bad.ok).toBe(false);
    const errors = (bad as { errors: string[] }).errors.join('\n');
    expect(errors).toMatch(/^minDpi: at least 72/m);
    expect(errors).toMatch(/^pressCondition: /m);
    expect(errors).toMatch(/^fileNameTemplate: no slashes/m);
    expect(errors).toMatch(/extra/);
  });
});

describe('plannedSubject: the file an export will write, preflighted before it is sent', () => {
  const parsed = recipeSchema.safeParse({ version: 1, label: '3d_z²', content: { Z: 1, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1 }] }, grid: { n: 32 }, surface: { rule: 'enclosed', fraction: 0.9 } });
  if (!parsed.success) throw new Error(parsed.error.message);
  const recipe = parsed.data;
  const alt = { short: 'A 3d_z² orbital', long: 'A 3d_z² orbital: two lobes along z and a ring around them.' };

  it('a CMYK TIFF of 89 mm at 600 dpi: 2102 px wide (89 / 25.4 × 600 = 2102.36), tagged 600 dpi, the press profile named', () => {
    const s = plannedSubject({ format: 'tiff', widthMm: 89, heightMm: 60, dpi: 600, colour: 'cmyk', pressCondition: 'fogra39' }, recipe, alt);
    expect(s.raster).toEqual({ widthPx: 2102, heightPx: 1417, dpi: 600, dpiTagged: 600 }); // 60 / 25.4 × 600 = 1417.32
    expect(s).toMatchObject({ file: 'figure.tif', colourSpace: 'cmyk', icc: { condition: 'fogra39' }, fonts: 'rasterised' });
    const r = preflightFile(s, DEFAULT_DELIVERY_PROFILE);
    expect(r.results.filter((x) => x.status === 'fail').map((x) => x.rule)).toEqual([]);
  });

  it('300 dpi against a 600 dpi profile, 200 mm against a 178 mm widest column, RGB against CMYK: each fails by name', () => {
    const s = plannedSubject({ format: 'png', widthMm: 200, heightMm: 60, dpi: 300 }, recipe, alt);
    const r = preflightFile(s, DEFAULT_DELIVERY_PROFILE);
    const failed = r.results.filter((x) => x.status === 'fail').map((x) => x.rule);
    expect(failed).toEqual(expect.arrayContaining(['resolution', 'column_width', 'colour_mode', 'icc_profile']));
    // 178 / 200 = 0.89: the figure would print at 89 %.
    expect(r.results.find((x) => x.rule === 'column_width')?.actual).toBe('200 mm is wider than every column: it would be reduced to 178 mm (89%)');
  });

  it('without alt text (no mesh yet) the alt-text rule fails rather than pass on nothing', () => {
    const r = preflightFile(plannedSubject({ format: 'png', widthMm: 88, heightMm: 60, dpi: 600 }, recipe, null), DEFAULT_DELIVERY_PROFILE);
    expect(r.results.find((x) => x.rule === 'alt_text')).toMatchObject({ status: 'fail', actual: 'no alt text; no long description' });
  });

  it('a vector companion is the very plot the export draws: page = asked size, text sizes read from its SVG', () => {
    const s = plannedSubject({ format: 'pdf', kind: 'radial', widthMm: 89, heightMm: 60, colour: 'cmyk', pressCondition: 'gracol' }, recipe, null);
    expect(s.pageMm).toEqual({ width: 89, height: 60 });
    expect(s.texts).toEqual(svgPrintFacts(figureSvg(recipe, { kind: 'radial', plane: 'xz', offset: 0, levels: 4, widthMm: 89, heightMm: 60 }, undefined)).texts);
    expect(s.texts.length).toBeGreaterThan(0);
    expect(s.altText.short).toMatch(/3d/);
  });
});
