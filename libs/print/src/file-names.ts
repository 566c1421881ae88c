// Names of delivered files, made from the figure through ONE template. A publication's delivery profile may
// bring its own template later (it is a plain value: pass it to fileNameFor); everything that names a file
// (download links, the files inside a bundle) goes through here.

import { plainLabel, plainText, typeset } from './typeset';

/**
 * Placeholders:
 * - {title}: the figure title up to its first colon, as a slug ("Plate 4.7: the 3d_z² orbital" -> plate-4-7);
 * - {label}: the orbital label as a slug (3d_z² -> 3dz2, sp³ #2 -> sp3-2, 2p(m=−1) -> 2p-mminus1);
 * - {part}: what the file is beyond its format (radial, section-xz, bundle, thumbnail; empty for the main image);
 * - {size}: the physical size, 180x120mm (empty for files without one, such as meshes);
 * - {dpi}: 600dpi (empty for vector and 3D files);
 * - {version}: v3.
 * Empty placeholders drop out with their separator; the extension comes from the format.
 */
export const DEFAULT_FILE_NAME_TEMPLATE = '{title}_{label}_{part}_{size}_{dpi}';

export const FILE_NAME_PLACEHOLDERS = ['title', 'label', 'part', 'size', 'dpi', 'version'] as const;
export type FileNamePlaceholder = (typeof FILE_NAME_PLACEHOLDERS)[number];

/** File formats a figure is delivered in, with their extensions. */
export const FILE_EXTENSIONS = { png: 'png', svg: 'svg', glb: 'glb', stl: 'stl', ply: 'ply', obj: 'obj', nrrd: 'nrrd', bundle: 'zip', json: 'json', txt: 'txt' } as const;
export type FileFormat = keyof typeof FILE_EXTENSIONS;

export interface FileNameFields {
  title: string;
  /** Orbital label as the engine writes it ('3d_z²'). */
  label?: string;
  format: FileFormat;
  part?: string;
  widthMm?: number;
  heightMm?: number;
  dpi?: number;
  version?: number;
}

/** The most a name may hold before its extension (common file systems take 255 bytes; we stay well inside). */
export const FILE_NAME_MAX = 120;

/** Lower-case ASCII slug: letters, digits and single hyphens; '²' -> 2, 'Å' -> a (NFKD folds accents and scripts). */
export function slug(text: string, max = 40): string {
  const s = plainLabel(text)
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

/** Checks a template: known placeholders only, at least {title} or {label}, nothing that could leave a folder. */
export function templateProblem(template: unknown): string | null {
  if (typeof template !== 'string' || template.trim() === '') return 'must be a non-empty text such as {title}_{label}_{size}_{dpi}';
  if (template.length > 200) return 'must be at most 200 characters';
  const unknown = [...template.matchAll(/\{([^}]*)\}/g)].map((m) => m[1]).filter((p) => !(FILE_NAME_PLACEHOLDERS as readonly string[]).includes(p));
  if (unknown.length) return `has unknown placeholders ${unknown.map((p) => `{${p}}`).join(', ')} (known: ${FILE_NAME_PLACEHOLDERS.map((p) => `{${p}}`).join(', ')})`;
  if (!/\{(title|label)\}/.test(template)) return 'must contain {title} or {label}, so files of different figures differ';
  if (/[/\\]|\.\./.test(template.replace(/\{[^}]*\}/g, ''))) return 'must not contain /, \\ or ..';
  return null;
}

/**
 * The file name for a delivered file: the template filled in, unsafe characters replaced, empty placeholders
 * removed with their separators, at most FILE_NAME_MAX characters, plus the extension of the format.
 * e.g. fileNameFor({title: 'Plate 4.7', label: '3d_z²', format: 'png', widthMm: 180, heightMm: 120, dpi: 600})
 * -> 'plate-4-7_3dz2_180x120mm_600dpi.png'.
 */
export function fileNameFor(fields: FileNameFields, template: string = DEFAULT_FILE_NAME_TEMPLATE): string {
  const problem = templateProblem(template);
  if (problem) throw new RangeError(`file-name template ${problem}`);
  const ext = FILE_EXTENSIONS[fields.format];
  if (!ext) throw new RangeError(`format must be one of ${Object.keys(FILE_EXTENSIONS).join(', ')} (got ${String(fields.format)})`);
  const values: Record<FileNamePlaceholder, string> = {
    title: slug(fields.title.split(':')[0] || fields.title),
    label: fields.label ? labelSlug(fields.label) : '',
    part: fields.part ? slug(fields.part, 24) : '',
    size: fields.widthMm !== undefined && fields.heightMm !== undefined ? `${mm(fields.widthMm)}x${mm(fields.heightMm)}mm` : '',
    dpi: fields.dpi !== undefined ? `${Math.round(fields.dpi)}dpi` : '',
    version: fields.version !== undefined ? `v${fields.version}` : '',
  };
  let name = template.replace(/\{([a-z]+)\}/g, (_, k: FileNamePlaceholder) => values[k]);
  // Only safe characters; separators that an empty placeholder left doubled or hanging are removed.
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
