// Print files: TIFF through sharp (libvips + Little CMS, registry packages only) and PDF companions through pdfkit
// (+ svg-to-pdfkit drawing the same SVG the SVG export writes, so a plot has one drawing). Each writer reads its
// file back and returns the facts preflight checks, so a report states what the file has, not what we asked for.
import { readFileSync } from 'node:fs';
import sharp from 'sharp';
import PDFDocument from 'pdfkit';
import SVGtoPDF from 'svg-to-pdfkit';
import { iccPressTransform, readIccProfile, hexToLabD50, type PressTransform } from '@psiform/colour';
import { pressCondition, type ColourMode, type PressConditionId, type Recipe } from '@psiform/contracts';
import { mmToPt, plannedSubject, readPngInfo, svgDrawnText, svgPrintFacts, uncoveredCharacters, wrapUncoveredRuns, type PreflightSubject } from '@psiform/print';
import { FALLBACK_FAMILY, facesCover, latoCovers, pdfFaces } from './fonts';
import { assetPath } from '@psiform/server';

const iccCache = new Map<string, Uint8Array>();
const transformCache = new Map<string, PressTransform>();

/** The committed profile of a press condition (assets/icc), read once. */
export function pressProfileBytes(id: PressConditionId): Uint8Array {
  const c = pressCondition(id);
  if (!c) throw new Error(`unknown press condition ${JSON.stringify(id)}`);
  let b = iccCache.get(id);
  if (!b) {
    b = new Uint8Array(readFileSync(assetPath(`icc/${c.iccFile}`)));
    iccCache.set(id, b);
  }
  return b;
}

export function pressTransformFor(id: PressConditionId): PressTransform {
  let t = transformCache.get(id);
  if (!t) {
    const c = pressCondition(id)!;
    t = iccPressTransform(pressProfileBytes(id), { id: c.id, name: c.name, tacPercent: c.tacPercent });
    transformCache.set(id, t);
  }
  return t;
}

/** What an embedded ICC profile is: one of our press conditions (by its bytes' description), sRGB, or other. */
export function identifyIcc(icc: Uint8Array | undefined): { description: string; condition: string } | null {
  if (!icc || icc.length < 132) return null;
  let description: string;
  try {
    description = readIccProfile(icc).description;
  } catch {
    return { description: 'unreadable profile', condition: 'other' };
  }
  for (const c of ['fogra39', 'gracol', 'swop'] as PressConditionId[]) {
    const ours = readIccProfile(pressProfileBytes(c)).description;
    if (description === ours) return { description, condition: c };
  }
  return { description, condition: /srgb/i.test(description) ? 'srgb' : 'other' };
}

export interface TiffOptions {
  dpi: number;
  colour: ColourMode;
  pressCondition: PressConditionId;
  /** Keep the alpha channel (only when asked: many journals refuse it). Otherwise flattened on `background`. */
  alpha: boolean;
  background: string;
}

/**
 * A TIFF from the finished PNG (the same pixels: same size, same arithmetic): LZW with horizontal predictor,
 * resolution in pixels per inch, flattened unless alpha is asked; RGB with sRGB embedded, or CMYK separated through
 * the press condition's profile (embedded). libvips takes the resolution in pixels per mm and writes it in inches.
 */
export async function encodeTiff(png: Uint8Array, o: TiffOptions): Promise<Uint8Array> {
  let img = sharp(png);
  if (!o.alpha || o.colour === 'cmyk') img = img.flatten({ background: o.background });
  img = o.colour === 'cmyk' ? img.withIccProfile(assetPath(`icc/${pressCondition(o.pressCondition)!.iccFile}`)) : img.withIccProfile('srgb');
  const out = await img.tiff({ compression: 'lzw', predictor: 'horizontal', xres: o.dpi / 25.4, yres: o.dpi / 25.4, resolutionUnit: 'inch' }).toBuffer();
  return new Uint8Array(out);
}

/** Facts read back from a TIFF for preflight (sharp's reader: size, density, space, alpha, embedded profile). */
export async function tiffFacts(tiff: Uint8Array): Promise<{ widthPx: number; heightPx: number; dpiTagged: number; colourSpace: 'rgb' | 'cmyk' | 'gray'; alpha: boolean; icc: { description: string; condition: string } | null; compression: string }> {
  const m = await sharp(tiff).metadata();
  const space = m.space === 'cmyk' ? 'cmyk' : m.space === 'b-w' ? 'gray' : 'rgb';
  return {
    widthPx: m.width ?? 0,
    heightPx: m.height ?? 0,
    // sharp reports density in pixels per inch when the file's unit is inches.
    dpiTagged: m.resolutionUnit === 'inch' ? (m.density ?? 0) : (m.density ?? 0) * 2.54,
    colourSpace: space,
    alpha: !!m.hasAlpha,
    icc: identifyIcc(m.icc ? new Uint8Array(m.icc) : undefined),
    compression: String((m as { compression?: string }).compression ?? ''),
  };
}

/** The colours of a CMYK TIFF as they print, back in sRGB for the screen (a soft proof through the same profile). */
export async function softProofPng(tiff: Uint8Array): Promise<Uint8Array> {
  return new Uint8Array(await sharp(tiff).toColourspace('srgb').png().toBuffer());
}

let srgbIcc: Buffer | undefined;
/** The sRGB profile libvips ships (what sharp embeds in RGB files), for RGB PDFs' output intent. */
async function srgbProfile(): Promise<Buffer> {
  if (!srgbIcc) {
    const m = await sharp({ create: { width: 1, height: 1, channels: 3, background: '#ffffff' } }).withIccProfile('srgb').png().toBuffer().then((b) => sharp(b).metadata());
    srgbIcc = m.icc!;
  }
  return srgbIcc;
}

export interface PdfOptions {
  svg: string;
  widthMm: number;
  heightMm: number;
  title: string;
  /** Alt text of the figure (the structure element's /Alt). */
  alt: string;
  colour: ColourMode;
  pressCondition: PressConditionId;
}

/**
 * A PDF companion: the SVG drawn as vector paths and text by svg-to-pdfkit into a page of exactly widthMm ×
 * heightMm, Lato (and DejaVu Sans for what Lato lacks) embedded and subset, tagged (Document > Figure with /Alt), TrimBox = MediaBox, and an output intent
 * carrying the press condition's profile (CMYK: colours separated through it by our ICC evaluator) or sRGB.
 * pdfkit has no output-intent API, so the dictionary is added by hand (ISO 15930 /GTS_PDFX, PDF 1.7 §14.11.5).
 */
export async function encodePdf(o: PdfOptions): Promise<Uint8Array> {
  const W = mmToPt(o.widthMm);
  const H = mmToPt(o.heightMm);
  const doc = new PDFDocument({ size: [W, H], margin: 0, tagged: true, lang: 'en-GB', displayTitle: true, pdfVersion: '1.7', autoFirstPage: true, info: { Title: o.title, Author: 'Psiform', Subject: o.alt, Creator: 'Psiform' } });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const f = pdfFaces();
  doc.registerFont('Lato', f.lato.regular);
  doc.registerFont('Lato-Bold', f.lato.bold);
  // pdfkit embeds a registered face only when a run is set in it, so files without Greek carry Lato alone.
  doc.registerFont('Fallback', f.fallback.regular);
  doc.registerFont('Fallback-Bold', f.fallback.bold);
  // svg-to-pdfkit sets each element in one font (no per-character fallback): runs Lato cannot draw get their own
  // tspan in the fallback face first (libs/print svg-fonts).
  const svg = wrapUncoveredRuns(o.svg, latoCovers, FALLBACK_FAMILY);
  const cmyk = o.colour === 'cmyk' ? pressTransformFor(o.pressCondition) : null;
  const toCmyk = new Map<string, number[]>();
  const colorCallback = (c: [number[], number] | null) => {
    if (!c || !cmyk) return c;
    const key = c[0].join(',');
    let v = toCmyk.get(key);
    if (!v) {
      const hex = '#' + c[0].map((x) => Math.max(0, Math.min(255, Math.round(x))).toString(16).padStart(2, '0')).join('');
      v = cmyk.labToCmyk(hexToLabD50(hex)).map((x) => Math.round(x * 10) / 10);
      toCmyk.set(key, v);
    }
    return [v, c[1]];
  };
  const root = doc.struct('Document');
  doc.addStructure(root);
  root.add(
    doc.struct('Figure', { alt: o.alt }, () => {
      const fontCallback = (family: string, bold: boolean) => (family.includes(FALLBACK_FAMILY) ? 'Fallback' : 'Lato') + (bold ? '-Bold' : '');
      SVGtoPDF(doc, svg, 0, 0, { width: W, height: H, preserveAspectRatio: 'none', fontCallback, colorCallback } as never);
    }),
  );
  root.end();
  const page = doc.page as unknown as { dictionary: { data: Record<string, unknown> } };
  page.dictionary.data.TrimBox = [0, 0, W, H];
  page.dictionary.data.BleedBox = [0, 0, W, H];
  const cond = pressCondition(o.pressCondition)!;
  const icc = cmyk ? Buffer.from(pressProfileBytes(o.pressCondition)) : await srgbProfile();
  const d = doc as unknown as { ref(data: Record<string, unknown>): { write(b: Buffer): void; end(): void }; _root: { data: Record<string, unknown> } };
  const profileRef = d.ref({ N: cmyk ? 4 : 3 });
  profileRef.write(icc);
  profileRef.end();
  const intent = d.ref({
    Type: 'OutputIntent',
    S: 'GTS_PDFX',
    OutputConditionIdentifier: new String(cmyk ? cond.name : 'sRGB IEC61966-2.1'),
    OutputCondition: new String(cmyk ? cond.name : 'sRGB IEC61966-2.1'),
    Info: new String(cmyk ? `${cond.name}; profile built from icc-profiles-free data (assets/icc)` : 'sRGB IEC61966-2.1'),
    RegistryName: new String('http://www.color.org'),
    DestOutputProfile: profileRef,
  });
  intent.end();
  d._root.data.OutputIntents = [intent];
  doc.end();
  return new Uint8Array(await done);
}

/**
 * Facts read back from one of our PDFs: page size (MediaBox), fonts (BaseFont names, embedded when their descriptor
 * has a font file), output intent profile. A plain scan of the uncompressed object dictionaries pdfkit writes; the
 * tests check the same files with poppler's pdffonts/pdfinfo and qpdf.
 */
export function pdfFacts(pdf: Uint8Array): { pageMm: { width: number; height: number } | null; fonts: { name: string; embedded: boolean; subset: boolean }[]; outputIntent: string | null } {
  const s = Buffer.from(pdf).toString('latin1');
  const mb = /\/MediaBox \[([\d.\s-]+)\]/.exec(s);
  const nums = mb ? mb[1].trim().split(/\s+/).map(Number) : null;
  const pageMm = nums && nums.length === 4 ? { width: ((nums[2] - nums[0]) * 25.4) / 72, height: ((nums[3] - nums[1]) * 25.4) / 72 } : null;
  const fonts: { name: string; embedded: boolean; subset: boolean }[] = [];
  for (const m of s.matchAll(/\/Type \/FontDescriptor([\s\S]*?)>>/g)) {
    const name = /\/FontName \/([^\s/>]+)/.exec(m[1])?.[1] ?? '?';
    fonts.push({ name: name.replace(/^[A-Z]{6}\+/, ''), embedded: /\/FontFile[23]? /.test(m[1]), subset: /^[A-Z]{6}\+/.test(name) });
  }
  // A PDF literal string: backslash escapes any character (PDF 1.7 §7.3.4.2).
  const raw = /\/OutputConditionIdentifier \(((?:\\.|[^\\)])*)\)/.exec(s)?.[1];
  const oi = raw === undefined ? null : raw.replace(/\\(.)/g, '$1');
  return { pageMm, fonts, outputIntent: oi };
}

/** Preflight facts of a PDF companion from the file and the SVG it draws (text sizes and line weights). */
export function pdfSubject(file: string, pdf: Uint8Array, o: PdfOptions, alt: { short?: string; long?: string }): PreflightSubject {
  const f = pdfFacts(pdf);
  const drawn = svgPrintFacts(o.svg);
  const cond = pressCondition(o.pressCondition)!;
  return {
    file,
    format: 'pdf',
    widthMm: o.widthMm,
    heightMm: o.heightMm,
    pageMm: f.pageMm ?? undefined,
    colourSpace: o.colour,
    icc: f.outputIntent ? { description: f.outputIntent, condition: f.outputIntent === cond.name ? cond.id : f.outputIntent.startsWith('sRGB') ? 'srgb' : 'other' } : null,
    texts: drawn.texts,
    lines: drawn.lines,
    fonts: f.fonts,
    unglyphed: uncoveredCharacters(svgDrawnText(o.svg), facesCover),
    altText: alt,
  };
}

/**
 * Preflight facts of a figure raster: the planned subject (@psiform/print plannedSubject: the 2D layer's text and
 * lines) with what the written file says (PNG read back with readPngInfo, TIFF with tiffFacts); text is pixels.
 */
export function rasterSubject(
  file: string,
  format: 'png' | 'tiff',
  read: { widthPx: number; heightPx: number; dpiTagged: number; colourSpace: 'rgb' | 'cmyk' | 'gray'; icc: { description: string; condition: string } | null },
  asked: { widthMm: number; heightMm: number; dpi: number },
  recipe: Recipe,
  alt: { short?: string; long?: string },
): PreflightSubject {
  const planned = plannedSubject({ format: 'png', ...asked }, recipe, null);
  return {
    ...planned,
    file,
    format,
    raster: { widthPx: read.widthPx, heightPx: read.heightPx, dpi: asked.dpi, dpiTagged: read.dpiTagged },
    colourSpace: read.colourSpace,
    icc: read.icc,
    altText: alt,
  };
}

/** A PNG's facts: IHDR size, pHYs (pixels per metre -> dpi), sRGB chunk. */
export function pngFacts(png: Uint8Array): { widthPx: number; heightPx: number; dpiTagged: number; colourSpace: 'rgb'; icc: { description: string; condition: string } | null } {
  const i = readPngInfo(png);
  const dpiTagged = i.pHYs && i.pHYs.unit === 1 ? i.pHYs.x * 0.0254 : 0;
  return { widthPx: i.width, heightPx: i.height, dpiTagged: Math.round(dpiTagged * 100) / 100, colourSpace: 'rgb', icc: i.srgb !== undefined ? { description: 'sRGB (PNG sRGB chunk)', condition: 'srgb' } : null };
}

/** An SVG companion's facts: page in mm from its width/height, text and lines from its elements, fonts embedded as data URIs. */
export function svgSubject(file: string, svg: string, widthMm: number, heightMm: number, alt: { short?: string; long?: string }): PreflightSubject {
  const w = /<svg\b[^>]*\bwidth="([\d.]+)mm"/.exec(svg);
  const h = /<svg\b[^>]*\bheight="([\d.]+)mm"/.exec(svg);
  const drawn = svgPrintFacts(svg);
  const embedded = (family: string) => new RegExp(`@font-face\\{font-family:"${family}"[^}]*src:url\\(data:`).test(svg);
  const fallback = embedded(FALLBACK_FAMILY);
  return {
    file,
    format: 'svg',
    widthMm,
    heightMm,
    pageMm: w && h ? { width: Number(w[1]), height: Number(h[1]) } : undefined,
    colourSpace: 'rgb',
    icc: { description: 'sRGB (SVG colours are sRGB by definition)', condition: 'srgb' },
    texts: drawn.texts,
    lines: drawn.lines,
    fonts: drawn.texts.length ? [{ name: 'Lato', embedded: embedded('Lato'), subset: false }, ...(fallback ? [{ name: FALLBACK_FAMILY, embedded: true, subset: false }] : [])] : [],
    unglyphed: uncoveredCharacters(svgDrawnText(svg), fallback ? facesCover : latoCovers),
    altText: alt,
  };
}
