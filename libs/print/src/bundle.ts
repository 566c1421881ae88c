// Bundle: a zip of a figure's files with recipe.json, metadata.json and README.txt (the sheet).
// metadata.json describes EACH file inside from the file's own bytes (pixel size and dpi read from the PNG's
// IHDR and pHYs, millimetres from the SVG's root element, sha256 of the bytes), so the sheet cannot contradict
// the files it travels with.

import { sha256 } from '@noble/hashes/sha2';
import { strToU8, zipSync, type Zippable } from 'fflate';
import { metadataSheetText, type FigureMetadata } from './metadata';
import { readPngInfo } from './png';

const { round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export const BUNDLE_RESERVED = ['recipe.json', 'metadata.json', 'README.txt'] as const;

export interface BundleFile {
  name: string;
  bytes: Uint8Array;
  /** What the file is for, in a few words ("the figure", "radial distribution plot"); shown in the sheet. */
  role?: string;
}

/** One file of a bundle as metadata.json lists it. Raster sizes come from the file itself. */
export interface BundleFileEntry {
  name: string;
  /** Format by content (png, svg, glb, stl, json, txt, …); the extension agrees or the bundle is refused. */
  format: string;
  mediaType: string;
  role?: string;
  bytes: number;
  sha256: string;
  widthPx?: number;
  heightPx?: number;
  /** From the PNG's pHYs (pixels per metre × 0.0254, rounded). */
  dpi?: number;
  /** Physical size: pixels / dpi × 25.4 for rasters (0.01 mm), the root width/height for SVG. */
  widthMm?: number;
  heightMm?: number;
  /** Colour space the file declares: PNG sRGB chunk; TIFF photometric interpretation (RGB or CMYK). */
  colourSpace?: 'sRGB' | 'RGB' | 'CMYK';
  /** PDF: pages in the file. */
  pages?: number;
}

/**
 * How a format is read for the sheet. Keys are file extensions; a describer returns what it can read from the
 * bytes and throws (RangeError) when the bytes are not that format. Other formats (TIFF, PDF) add theirs here
 * or pass their own table to buildBundle.
 */
export type FileDescriber = (bytes: Uint8Array) => Omit<BundleFileEntry, 'name' | 'role' | 'bytes' | 'sha256'>;

const round2 = (x: number) => round(x * 100) / 100;
const decoder = new TextDecoder();

function describePng(bytes: Uint8Array): ReturnType<FileDescriber> {
  let info;
  try {
    info = readPngInfo(bytes);
  } catch (err) {
    throw new RangeError(`not a readable PNG: ${(err as Error).message}`, { cause: err });
  }
  const out: ReturnType<FileDescriber> = { format: 'png', mediaType: 'image/png', widthPx: info.width, heightPx: info.height };
  // pHYs unit 1 = pixels per metre (PNG specification §11.3.5.3); 1 in = 0.0254 m exactly.
  if (info.pHYs && info.pHYs.unit === 1 && info.pHYs.x > 0 && info.pHYs.x === info.pHYs.y) {
    const dpi = round(info.pHYs.x * 0.0254);
    out.dpi = dpi;
    out.widthMm = round2((info.width / dpi) * 25.4);
    out.heightMm = round2((info.height / dpi) * 25.4);
  }
  if (info.srgb !== undefined) out.colourSpace = 'sRGB';
  return out;
}

function describeSvg(bytes: Uint8Array): ReturnType<FileDescriber> {
  const head = decoder.decode(bytes.subarray(0, 4096));
  const root = /<svg\b[^>]*>/.exec(head);
  if (!root) throw new RangeError('not an SVG document (no <svg> element in the first 4 KB)');
  const attr = (name: string) => new RegExp(`\\s${name}="([0-9.]+)mm"`).exec(root[0])?.[1];
  const w = attr('width');
  const h = attr('height');
  return { format: 'svg', mediaType: 'image/svg+xml', ...(w && h ? { widthMm: Number(w), heightMm: Number(h) } : {}) };
}

/**
 * TIFF baseline (TIFF 6.0 §2 and §8): byte order, the first IFD, ImageWidth (256), ImageLength (257),
 * PhotometricInterpretation (262: 2 RGB, 5 separated = CMYK), XResolution (282, RATIONAL) and ResolutionUnit
 * (296: 2 inch, 3 centimetre).
 */
function describeTiff(bytes: Uint8Array): ReturnType<FileDescriber> {
  if (bytes.length < 8) throw new RangeError('not a TIFF file (too short)');
  const le = bytes[0] === 0x49 && bytes[1] === 0x49;
  if (!le && !(bytes[0] === 0x4d && bytes[1] === 0x4d)) throw new RangeError('not a TIFF file (no II or MM byte order)');
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const u16 = (o: number) => dv.getUint16(o, le);
  const u32 = (o: number) => dv.getUint32(o, le);
  if (u16(2) !== 42) throw new RangeError('not a TIFF file (magic 42 missing)');
  const ifd = u32(4);
  if (ifd + 2 > bytes.length) throw new RangeError('TIFF directory lies outside the file');
  const tags = new Map<number, number>();
  const n = u16(ifd);
  for (let i = 0; i < n; i++) {
    const e = ifd + 2 + 12 * i;
    if (e + 12 > bytes.length) throw new RangeError('TIFF directory is cut short');
    const tag = u16(e);
    const type = u16(e + 2);
    // SHORT values sit in the first two bytes of the value field; LONG and RATIONAL offsets fill it.
    if (tag === 282 && type === 5) {
      const off = u32(e + 8);
      tags.set(tag, u32(off) / u32(off + 4));
    } else tags.set(tag, type === 3 ? u16(e + 8) : u32(e + 8));
  }
  const w = tags.get(256);
  const h = tags.get(257);
  if (!w || !h) throw new RangeError('TIFF without ImageWidth/ImageLength');
  const out: ReturnType<FileDescriber> = { format: 'tiff', mediaType: 'image/tiff', widthPx: w, heightPx: h };
  const photometric = tags.get(262);
  if (photometric === 2) out.colourSpace = 'RGB';
  if (photometric === 5) out.colourSpace = 'CMYK';
  const res = tags.get(282);
  const unit = tags.get(296) ?? 2;
  if (res && res > 0 && (unit === 2 || unit === 3)) {
    const dpi = round(unit === 2 ? res : res * 2.54);
    out.dpi = dpi;
    out.widthMm = round2((w / dpi) * 25.4);
    out.heightMm = round2((h / dpi) * 25.4);
  }
  return out;
}

/** PDF (ISO 32000-1 §7.7.3.3): the first page's MediaBox in points (1/72 in), and the page count. */
function describePdf(bytes: Uint8Array): ReturnType<FileDescriber> {
  const text = new TextDecoder('latin1').decode(bytes);
  if (!text.startsWith('%PDF-')) throw new RangeError('not a PDF file (no %PDF- header)');
  const out: ReturnType<FileDescriber> = { format: 'pdf', mediaType: 'application/pdf' };
  const box = /\/MediaBox\s*\[\s*([-\d.]+)\s+([-\d.]+)\s+([-\d.]+)\s+([-\d.]+)\s*\]/.exec(text);
  if (box) {
    const [x0, y0, x1, y1] = box.slice(1).map(Number);
    out.widthMm = round2(((x1 - x0) / 72) * 25.4);
    out.heightMm = round2(((y1 - y0) / 72) * 25.4);
  }
  const pages = text.match(/\/Type\s*\/Page(?![a-z])/g);
  if (pages) out.pages = pages.length;
  return out;
}

function describeGlb(bytes: Uint8Array): ReturnType<FileDescriber> {
  // GLB header (glTF 2.0 specification §4.4): magic "glTF", version 2.
  if (bytes.length < 12 || decoder.decode(bytes.subarray(0, 4)) !== 'glTF') throw new RangeError('not a GLB file (no glTF magic)');
  return { format: 'glb', mediaType: 'model/gltf-binary' };
}

function plain(format: string, mediaType: string): FileDescriber {
  return () => ({ format, mediaType });
}

export const DEFAULT_DESCRIBERS: Record<string, FileDescriber> = {
  png: describePng,
  tif: describeTiff,
  tiff: describeTiff,
  pdf: describePdf,
  svg: describeSvg,
  glb: describeGlb,
  stl: plain('stl', 'model/stl'),
  ply: plain('ply', 'application/octet-stream'),
  obj: plain('obj', 'model/obj'),
  nrrd: plain('nrrd', 'application/octet-stream'),
  json: plain('json', 'application/json'),
  txt: plain('txt', 'text/plain; charset=utf-8'),
};

function hex(bytes: Uint8Array): string {
  let s = '';
  for (const b of bytes) s += b.toString(16).padStart(2, '0');
  return s;
}

/** sha256 of the bytes as 64 lower-case hex digits (FIPS 180-4, via @noble/hashes). */
export function sha256Hex(bytes: Uint8Array): string {
  return hex(sha256(bytes));
}

/** Describes one file from its bytes; throws a RangeError naming the file when its bytes are not its format. */
export function describeBundleFile(file: BundleFile, describers: Record<string, FileDescriber> = DEFAULT_DESCRIBERS): BundleFileEntry {
  const ext = /\.([A-Za-z0-9]+)$/.exec(file.name)?.[1]?.toLowerCase() ?? '';
  const describe = describers[ext];
  if (!describe) throw new RangeError(`${file.name}: no describer for .${ext} files (known: ${Object.keys(describers).join(', ')})`);
  let d: ReturnType<FileDescriber>;
  try {
    d = describe(file.bytes);
  } catch (err) {
    throw new RangeError(`${file.name}: ${(err as Error).message}`, { cause: err });
  }
  return { name: file.name, ...d, ...(file.role ? { role: file.role } : {}), bytes: file.bytes.length, sha256: sha256Hex(file.bytes) };
}

export interface BundleOptions {
  describers?: Record<string, FileDescriber>;
}

/**
 * Zip (fflate zipSync, deflate level 6) holding the files plus recipe.json, metadata.json (the metadata
 * without the recipe, with `files` describing every other entry) and README.txt. Entry times are
 * meta.generatedAt, so equal inputs give equal bytes. File names must be relative, use '/' only, and not
 * clash with each other or the reserved names.
 */
export function buildBundle(files: BundleFile[], meta: FigureMetadata, opts: BundleOptions = {}): Uint8Array {
  if (!Array.isArray(files)) throw new RangeError('files must be an array of { name, bytes }');
  const mtime = new Date(meta.generatedAt);
  if (Number.isNaN(mtime.getTime())) throw new RangeError('meta.generatedAt must be an ISO 8601 date-time');
  const entries: Zippable = {};
  const seen = new Set<string>(BUNDLE_RESERVED);
  const described: BundleFileEntry[] = [];
  for (const [i, file] of files.entries()) {
    const name = file?.name;
    if (typeof name !== 'string' || name === '' || name.startsWith('/') || name.includes('\\') || name.split('/').some((p) => p === '..' || p === '.' || p === '')) {
      throw new RangeError(`files[${i}].name must be a relative path without '..' (got ${JSON.stringify(name)})`);
    }
    if (seen.has(name)) throw new RangeError(`files[${i}].name ${JSON.stringify(name)} is reserved or repeated`);
    if (!(file.bytes instanceof Uint8Array)) throw new RangeError(`files[${i}].bytes must be a Uint8Array`);
    seen.add(name);
    described.push(describeBundleFile(file, opts.describers));
    // PNG and zipped formats do not shrink further; store them.
    const stored = /\.(png|glb|zip|woff2|jpe?g|tiff?)$/i.test(name);
    entries[name] = [file.bytes, { level: stored ? 0 : 6, mtime }];
  }
  const recipeBytes = strToU8(JSON.stringify(meta.recipe, null, 2) + '\n');
  described.push(describeBundleFile({ name: 'recipe.json', bytes: recipeBytes, role: 'the recipe: reproduces the figure with the same engine version' }));
  const sheet = strToU8(metadataSheetText(meta, described));
  const sheetEntry = describeBundleFile({ name: 'README.txt', bytes: sheet, role: 'this sheet in words' });
  const { recipe: _recipe, ...rest } = meta;
  entries['recipe.json'] = [recipeBytes, { level: 6, mtime }];
  entries['metadata.json'] = [strToU8(JSON.stringify({ ...rest, files: [...described, sheetEntry] }, null, 2) + '\n'), { level: 6, mtime }];
  entries['README.txt'] = [sheet, { level: 6, mtime }];
  return zipSync(entries);
}
