// TIFF and PDF writers, read back by tools no one here wrote (Debian: libtiff-tools `tiffinfo`, poppler-utils
// `pdffonts` / `pdfinfo -box`, `qpdf --check`; installed by `npm test`), plus our own read-back used by preflight.
import { spawnSync } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { DEFAULT_DELIVERY_PROFILE, parseRecipe, type DeliveryProfile } from '@psiform/contracts';
import { encodeRgbaPng, exportPixelSize, figureSvg, plannedSubject, plotAlt, preflightFile, sectionMapSvg, type PreflightSubject } from '@psiform/print';
import { encodePdf, encodeTiff, pdfFacts, pdfSubject, pngFacts, rasterSubject, tiffFacts } from './print-files';

// sharp, pdfkit and the Debian readers on the shared 2-core machine: a loaded run has taken over 5 s per file.
jest.setTimeout(60_000);

function tool(cmd: string, args: string[]): { code: number; out: string } {
  const r = spawnSync(cmd, args, { encoding: 'utf8' });
  if (r.error) throw new Error(`${cmd} is needed (Debian package; npm test installs it): ${r.error.message}`);
  return { code: r.status ?? 1, out: `${r.stdout}${r.stderr}` };
}
const tmp = (name: string, bytes: Uint8Array) => {
  const p = `${tmpdir()}/psiform-print-${process.pid}-${name}`;
  writeFileSync(p, bytes);
  return p;
};

// 89 mm at 600 dpi: 89 / 25.4 × 600 = 2102.36 -> 2102 px (the same arithmetic as the PNG); 20 mm -> 472 px.
const size = exportPixelSize({ widthMm: 89, heightMm: 20, dpi: 600 });
function testPng(alpha = 255): Uint8Array {
  const rgba = new Uint8Array(size.width * size.height * 4);
  for (let i = 0; i < size.width * size.height; i++) rgba.set([0xc8, 0x55, 0x3d, alpha], i * 4);
  return encodeRgbaPng(size.width, size.height, rgba, { dpi: 600, filter: 'none' });
}

describe('encodeTiff', () => {
  it('CMYK: tiffinfo reads separated, LZW, 600 pixels/inch, 2102 px wide, with the FOGRA39 profile embedded', async () => {
    expect(size.width).toBe(2102);
    const tif = await encodeTiff(testPng(), { dpi: 600, colour: 'cmyk', pressCondition: 'fogra39', alpha: false, background: '#ffffff' });
    const info = tool('tiffinfo', [tmp('cmyk.tif', tif)]).out;
    expect(info).toMatch(/Image Width: 2102 Image Length: 472/);
    expect(info).toMatch(/Photometric Interpretation: separated/);
    expect(info).toMatch(/Compression Scheme: LZW/);
    expect(info).toMatch(/Resolution: 600, 600 pixels\/inch/);
    expect(info).toMatch(/Samples\/Pixel: 4/);
    expect(info).toMatch(/ICC Profile: <present>, 120296 bytes/); // the size of assets/icc/psiform-fogra39.icc
    const read = await tiffFacts(tif);
    expect(read).toMatchObject({ widthPx: 2102, heightPx: 472, colourSpace: 'cmyk', alpha: false, icc: { condition: 'fogra39' } });
    expect(read.dpiTagged).toBeCloseTo(600, 6);
  });

  it('RGB: photometric RGB with the sRGB profile, no alpha unless asked', async () => {
    const flat = await encodeTiff(testPng(128), { dpi: 600, colour: 'rgb', pressCondition: 'fogra39', alpha: false, background: '#ffffff' });
    const info = tool('tiffinfo', [tmp('rgb.tif', flat)]).out;
    expect(info).toMatch(/Photometric Interpretation: RGB color/);
    expect(info).toMatch(/Samples\/Pixel: 3/);
    expect(info).toMatch(/ICC Profile: <present>/);
    expect((await tiffFacts(flat)).icc?.condition).toBe('srgb');
    const withAlpha = await encodeTiff(testPng(128), { dpi: 600, colour: 'rgb', pressCondition: 'fogra39', alpha: true, background: '#ffffff' });
    expect(tool('tiffinfo', [tmp('rgba.tif', withAlpha)]).out).toMatch(/Samples\/Pixel: 4/);
  });

  it('the PNG and the TIFF have the same pixel size and resolution', async () => {
    const png = testPng();
    const tif = await tiffFacts(await encodeTiff(png, { dpi: 600, colour: 'rgb', pressCondition: 'fogra39', alpha: false, background: '#ffffff' }));
    const p = pngFacts(png);
    expect([tif.widthPx, tif.heightPx]).toEqual([p.widthPx, p.heightPx]);
    expect(p.dpiTagged).toBeCloseTo(600, 0); // pHYs 23622 px/m = 599.999 dpi
  });
});

describe('encodePdf', () => {
  const svg = sectionMapSvg({ state: { Z: 1, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1, im: 0 }] }, plane: 'xz', offset: 0, extent: 20, n: 101, levels: 4, palette: { positive: '#1f5e5b', negative: '#a86a1c', background: '#ffffff', label: '#1f1d1a' }, widthMm: 89, heightMm: 60, unit: 'angstrom' });
  const opts = { svg, widthMm: 89, heightMm: 60, title: 'Section map of 3d_z²', alt: 'Section map of 3d_z² in the xz plane', colour: 'cmyk' as const, pressCondition: 'fogra39' as const };

  it('section map: only embedded subset fonts, the requested page size, qpdf finds no errors, tagged, output intent', async () => {
    const pdf = await encodePdf(opts);
    const file = tmp('section.pdf', pdf);
    const fonts = tool('pdffonts', [file]).out.trim().split('\n').slice(2);
    expect(fonts.length).toBeGreaterThan(0);
    for (const line of fonts) {
      expect(line).toMatch(/^[A-Z]{6}\+(Lato-|DejaVuSans)/); // subset prefix
      expect(line).toMatch(/\syes\s+yes\s+yes\s/); // emb, sub, uni
    }
    const box = tool('pdfinfo', ['-box', file]).out;
    // 89 × 60 mm = 252.283 × 170.079 pt (1 pt = 25.4 / 72 mm).
    expect(box).toMatch(/Page size:\s+252\.28\d? x 170\.07\d pts/);
    expect(box).toMatch(/TrimBox:\s+0\.00\s+0\.00\s+252\.28\s+170\.08/);
    expect(box).toMatch(/Tagged:\s+yes/);
    const q = tool('qpdf', ['--check', file]);
    expect(q.code).toBe(0);
    expect(q.out).toMatch(/No syntax or stream encoding errors/);
    expect(Buffer.from(pdf).toString('latin1')).toMatch(/\/S \/GTS_PDFX/);
    const f = pdfFacts(pdf);
    expect(f.outputIntent).toBe('FOGRA39 (ISO 12647-2 coated)');
    const report = preflightFile(pdfSubject('section.pdf', pdf, opts, { short: opts.alt, long: opts.alt }), DEFAULT_DELIVERY_PROFILE);
    for (const id of ['size', 'fonts_embedded', 'colour_mode', 'icc_profile']) expect(report.results.find((r) => r.rule === id)?.status).toBe('pass');
  });

  it('ψ, which Lato lacks, is set in embedded DejaVu Sans: pdffonts lists it, pdftotext reads ψ back, preflight passes', async () => {
    expect(svg).toContain('ψ &gt; 0'); // the section map's key
    const pdf = await encodePdf(opts);
    const file = tmp('psi.pdf', pdf);
    const fonts = tool('pdffonts', [file]).out;
    expect(fonts).toMatch(/^[A-Z]{6}\+Lato-Regular\s.*\syes\s+yes\s+yes\s/m);
    expect(fonts).toMatch(/^[A-Z]{6}\+DejaVuSans\s.*\syes\s+yes\s+yes\s/m);
    const text = tool('pdftotext', [file, '-']).out;
    expect(text).toMatch(/ψ ?> ?0/); // pdftotext drops the space at the font change
    expect(text).toMatch(/ψ ?< ?0/);
    const subject = pdfSubject('section.pdf', pdf, opts, { short: opts.alt, long: opts.alt });
    expect(subject.unglyphed).toEqual([]);
    expect(subject.fonts).toEqual(expect.arrayContaining([{ name: 'DejaVuSans', embedded: true, subset: true }]));
  });

  it('a label with a character neither face has fails preflight, naming it', async () => {
    const odd = svg.replace('ψ &gt; 0', '\u{1F700} &gt; 0'); // U+1F700 ALCHEMICAL SYMBOL FOR QUINTESSENCE: in neither font
    const o = { ...opts, svg: odd };
    const report = preflightFile(pdfSubject('odd.pdf', await encodePdf(o), o, { short: o.alt, long: o.alt }), DEFAULT_DELIVERY_PROFILE);
    const r = report.results.find((x) => x.rule === 'fonts_embedded')!;
    expect(r.status).toBe('fail');
    expect(r.actual).toContain('U+1F700');
  });

  it('a 148 × 210 mm page is 419.53 × 595.28 pt in pdfinfo', async () => {
    const pdf = await encodePdf({ ...opts, widthMm: 148, heightMm: 210, colour: 'rgb' });
    // 148 mm = 419.53 pt, 210 mm = 595.28 pt.
    expect(tool("pdfinfo", [tmp("a5.pdf", pdf)]).out).toMatch(/Page size:\s+419\.5\d* x 595\.2\d* pts/);
  });
});

describe('the preflight the export dialog shows before an export is the one the written file gets', () => {
  const parsed = parseRecipe({ version: 1, content: { Z: 1, terms: [{ n: 3, l: 2, m: 0, basis: 'real', re: 1 }] }, grid: { n: 32 }, surface: { rule: 'enclosed', fraction: 0.9 }, canvas: { widthMm: 89, heightMm: 20, dpi: 600 } });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
  const recipe = parsed.recipe;
  const alt = { short: 'A 3d_z² orbital', long: 'A 3d_z² orbital: two lobes along z and a ring in the xy plane.' };
  // A profile that fails on purpose where a hand count says so: 1200 dpi minimum (600 < 1200), a 60 mm widest
  // column (89 mm > 60 mm: the figure would be reduced to 67%).
  const strict: DeliveryProfile = { ...DEFAULT_DELIVERY_PROFILE, minDpi: 1200, columnWidthsMm: [{ name: 'narrow', widthMm: 60 }] };
  const verdicts = (s: PreflightSubject, profile: DeliveryProfile) => preflightFile(s, profile).results.map((r) => [r.rule, r.status, r.rule === 'icc_profile' ? '' : r.actual]);

  for (const profile of [DEFAULT_DELIVERY_PROFILE, strict]) {
    it(`CMYK TIFF, 89 × 20 mm at 600 dpi (${profile === strict ? 'strict' : 'default'} profile): planned and written agree rule by rule`, async () => {
      const planned = plannedSubject({ format: 'tiff', widthMm: 89, heightMm: 20, dpi: 600, colour: 'cmyk', pressCondition: 'fogra39' }, recipe, alt);
      const tif = await encodeTiff(testPng(), { dpi: 600, colour: 'cmyk', pressCondition: 'fogra39', alpha: false, background: '#ffffff' });
      const written = rasterSubject('figure.tif', 'tiff', await tiffFacts(tif), { widthMm: 89, heightMm: 20, dpi: 600 }, recipe, alt);
      expect(planned.raster).toEqual({ widthPx: 2102, heightPx: 472, dpi: 600, dpiTagged: 600 });
      expect(verdicts(planned, profile)).toEqual(verdicts(written, profile));
    });
  }

  it('strict profile: the planned TIFF fails resolution and column width, exactly as counted by hand', () => {
    const r = preflightFile(plannedSubject({ format: 'tiff', widthMm: 89, heightMm: 20, dpi: 600, colour: 'cmyk', pressCondition: 'fogra39' }, recipe, alt), strict);
    const failed = r.results.filter((x) => x.status === 'fail').map((x) => x.rule);
    expect(failed).toEqual(expect.arrayContaining(['resolution', 'column_width']));
    expect(r.results.find((x) => x.rule === 'resolution')?.actual).toBe('600 dpi');
  });

  it('section-map PDF: planned and written agree rule by rule (page, fonts, colour, profile, text sizes)', async () => {
    const planned = plannedSubject({ format: 'pdf', kind: 'section', plane: 'xz', widthMm: 89, heightMm: 60, colour: 'cmyk', pressCondition: 'fogra39' }, recipe, null);
    const svg = figureSvg(recipe, { kind: 'section', plane: 'xz', offset: 0, levels: 4, widthMm: 89, heightMm: 60 }, undefined);
    const o = { svg, widthMm: 89, heightMm: 60, title: plotAlt(svg).short, alt: plotAlt(svg).short, colour: 'cmyk' as const, pressCondition: 'fogra39' as const };
    const written = pdfSubject('section.pdf', await encodePdf(o), o, plotAlt(svg));
    const v = (s: PreflightSubject) => preflightFile(s, DEFAULT_DELIVERY_PROFILE).results.map((r) => [r.rule, r.status]);
    expect(v(planned)).toEqual(v(written));
    expect(planned.texts).toEqual(written.texts);
  });
});
