// Names of delivered files, made from the figure through ONE template: the publication's delivery profile's
// `fileNameTemplate` (libs/contracts print.ts: its words and its default). Everything that names a file
// (download links, the files inside a bundle) goes through fileNameFor.

import { DEFAULT_DELIVERY_PROFILE, FILE_NAME_TOKENS } from '@psiform/contracts';
import { plainText, typeset } from './typeset';

const { round } = Math; // module constants: see DEVELOPERS.md (numeric kernels)

export type FileNameToken = (typeof FILE_NAME_TOKENS)[number];

/** File formats a figure is delivered in, with their extensions. */
export const FILE_EXTENSIONS = { png: 'png', tiff: 'tif', pdf: 'pdf', svg: 'svg', glb: 'glb', stl: 'stl', ply: 'ply', obj: 'obj', nrrd: 'nrrd', bundle: 'zip', json: 'json', txt: 'txt' } as const;
export type FileFormat = keyof typeof FILE_EXTENSIONS;

export interface FileNameFields {
  /** The publication's title ({publication}: up to its first colon, "Shells and Lobes: Inorganic …" -> shells-and-lobes). */
  publication?: string;
  /** The figure's title ({figure}: up to its first colon, "Plate 4.7: the 3d_z² orbital" -> plate-4-7). */
  figure: string;
  /** Orbital label as the engine writes it ('3d_z²') ({label}). */
  label?: string;
  version?: number;
  format: FileFormat;
  /**
   * What the file is beyond its format, for files other than the figure image itself: radial, section-xz,
   * bundle, thumbnail ({kind}). When the template has no {kind}, a part is added before the extension, so
   * two different files of one figure never share a name.
   */
  part?: string;
  widthMm?: number;
  heightMm?: number;
  dpi?: number;
  /** rgb or cmyk ({colour}). */
  colour?: string;
}

/** The most a name may hold before its extension (common file systems take 255 bytes; we stay well inside). */
export const FILE_NAME_MAX = 120;

/** Lower-case ASCII slug: letters, digits and single hyphens; '²' -> 2, 'Å' -> a (NFKD folds accents and scripts). */
export function slug(text: string, max = 40): string {
  const s = plainText(typeset(text))
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '');
  if (s.length <= max) return s;
  const cut = s.slice(0, max);
  const at = cut.lastIndexOf('-');
  return (at > max / 2 ? cut.slice(0, at) : cut).replace(/-+$/g, '');
}

/**
 * Slug of an orbital label: as slug(), but a signed m subscript is spelt out so that 2p(m=+1) and 2p(m=−1)
 * stay apart (2p-mplus1, 2p-mminus1).
 */
export function labelSlug(label: string, max = 24): string {
  const runs = typeset(label).map((r) => {
    const m = r.script === 'sub' ? /^([+−-])(\d+)$/.exec(r.text) : null;
    return m ? { text: ` m${m[1] === '+' ? 'plus' : 'minus'}${m[2]}`, script: 'base' as const } : r;
  });
  return slug(plainText(runs), max);
}

function mm(x: number): string {
  return String(Number(x.toFixed(1)));
}

/**
 * The file name for a delivered file: the template's words filled in; a segment of the template (the text
 * between '_' or '-' separators, e.g. "{widthMm}x{heightMm}mm") whose word has no value for this file is left out
 * with its separator (a mesh has no size, an SVG no dpi); unsafe characters replaced; at most FILE_NAME_MAX
 * characters; then the extension of the format.
 * e.g. fileNameFor({publication: 'Shells and Lobes', figure: 'Plate 4.7', label: '3d_z²', format: 'png',
 * widthMm: 180, heightMm: 120, dpi: 600}, '{figure}_{label}_{widthMm}x{heightMm}mm_{dpi}dpi')
 * -> 'plate-4-7_3dz2_180x120mm_600dpi.png'.
 */
export function fileNameFor(fields: FileNameFields, template: string = DEFAULT_DELIVERY_PROFILE.fileNameTemplate): string {
  if (typeof template !== 'string' || template.trim() === '') throw new RangeError('file-name template must be a non-empty text');
  const unknown = [...template.matchAll(/\{([^}]*)\}/g)].map((m) => m[1]).filter((w) => !(FILE_NAME_TOKENS as readonly string[]).includes(w));
  if (unknown.length) throw new RangeError(`file-name template has unknown words ${unknown.map((w) => `{${w}}`).join(', ')} (known: ${FILE_NAME_TOKENS.map((w) => `{${w}}`).join(', ')})`);
  const ext = FILE_EXTENSIONS[fields.format];
  if (!ext) throw new RangeError(`format must be one of ${Object.keys(FILE_EXTENSIONS).join(', ')} (got ${String(fields.format)})`);
  const values: Record<FileNameToken, string> = {
    publication: fields.publication ? slug(fields.publication.split(':')[0] || fields.publication, 32) : '',
    figure: slug(fields.figure.split(':')[0] || fields.figure),
    label: fields.label ? labelSlug(fields.label) : '',
    version: fields.version !== undefined ? `v${fields.version}` : '',
    kind: fields.part ? slug(fields.part, 24) : '',
    widthMm: fields.widthMm !== undefined ? mm(fields.widthMm) : '',
    heightMm: fields.heightMm !== undefined ? mm(fields.heightMm) : '',
    dpi: fields.dpi !== undefined ? String(round(fields.dpi)) : '',
    colour: fields.colour ? slug(fields.colour, 8) : '',
  };
  // Split the TEMPLATE (not the values, which contain hyphens) into segments and their separators.
  const pieces = template.split(/([_-])/);
  const kept: string[] = [];
  for (let i = 0; i < pieces.length; i += 2) {
    const seg = pieces[i];
    const words = [...seg.matchAll(/\{([a-zA-Z]+)\}/g)].map((m) => m[1] as FileNameToken);
    const filled = seg.replace(/\{([a-zA-Z]+)\}/g, (_, w: FileNameToken) => values[w]);
    // A segment stays when it has text and every word in it has a value; it brings the separator before it.
    if (filled !== '' && words.every((w) => values[w] !== '')) kept.push((kept.length && i > 0 ? pieces[i - 1] : '') + filled);
  }
  let name = kept.join('');
  if (fields.part && !/\{kind\}/.test(template)) name += `_${values.kind}`;
  name = name
    .replace(/[^A-Za-z0-9._-]+/g, '-')
    .replace(/([_.-])[_.-]+/g, '$1')
    .replace(/^[_.-]+|[_.-]+$/g, '');
  if (name.length > FILE_NAME_MAX) name = name.slice(0, FILE_NAME_MAX).replace(/[_.-]+$/g, '');
  return `${name || 'figure'}.${ext}`;
}

/** A Content-Disposition value for an attachment (RFC 6266, with the RFC 8187 form for the UTF-8 name). */
export function attachmentDisposition(fileName: string): string {
  const ascii = fileName.replace(/[^\x20-\x7e]/g, '_').replace(/["\\]/g, '_');
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}

/**
 * The name fields of a stored file from its kind and the stats its job wrote (png: widthMm, heightMm, dpi,
 * thumbnail; svg: svg radial|section, plane, widthMm, heightMm). One mapping for download links and bundles.
 */
export function fileFieldsFor(kind: string, stats: Record<string, unknown> | null | undefined): Pick<FileNameFields, 'format' | 'part' | 'widthMm' | 'heightMm' | 'dpi' | 'colour'> {
  const s = stats ?? {};
  const n = (k: string) => (typeof s[k] === 'number' && Number.isFinite(s[k]) ? (s[k] as number) : undefined);
  const size = { widthMm: n('widthMm'), heightMm: n('heightMm') };
  switch (kind) {
    case 'png':
    case 'tiff':
      if (s.thumbnail === true) return { format: kind, part: 'thumbnail' };
      return { format: kind, ...size, dpi: n('dpi'), colour: typeof s.colourMode === 'string' ? s.colourMode : kind === 'png' ? 'rgb' : undefined };
    case 'pdf':
      return { format: 'pdf', ...size, part: typeof s.part === 'string' ? s.part : undefined };
    case 'svg':
      return { format: 'svg', ...size, part: s.svg === 'section' ? `section ${typeof s.plane === 'string' ? s.plane : ''}`.trim() : s.svg === 'radial' ? 'radial' : 'companion' };
    case 'bundle':
      return { format: 'bundle', part: 'bundle' };
    default:
      if (kind in FILE_EXTENSIONS) return { format: kind as FileFormat };
      throw new RangeError(`no file name for assets of kind ${JSON.stringify(kind)}`);
  }
}
