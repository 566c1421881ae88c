// Bundle: a zip of a figure's files with recipe.json, metadata.json and README.txt (the sheet).

import { strToU8, zipSync, type Zippable } from 'fflate';
import { metadataSheetText, type FigureMetadata } from './metadata';

export const BUNDLE_RESERVED = ['recipe.json', 'metadata.json', 'README.txt'] as const;

export interface BundleFile {
  name: string;
  bytes: Uint8Array;
}

/**
 * Zip (fflate zipSync, deflate level 6) holding the files plus recipe.json, metadata.json (the metadata
 * without the recipe) and README.txt. Entry times are meta.generatedAt, so equal inputs give equal bytes.
 * File names must be relative, use '/' only, and not clash with each other or the reserved names.
 */
export function buildBundle(files: BundleFile[], meta: FigureMetadata): Uint8Array {
  if (!Array.isArray(files)) throw new RangeError('files must be an array of { name, bytes }');
  const mtime = new Date(meta.generatedAt);
  if (Number.isNaN(mtime.getTime())) throw new RangeError('meta.generatedAt must be an ISO 8601 date-time');
  const entries: Zippable = {};
  const seen = new Set<string>(BUNDLE_RESERVED);
  for (const [i, file] of files.entries()) {
    const name = file?.name;
    if (typeof name !== 'string' || name === '' || name.startsWith('/') || name.includes('\\') || name.split('/').some((p) => p === '..' || p === '.' || p === '')) {
      throw new RangeError(`files[${i}].name must be a relative path without '..' (got ${JSON.stringify(name)})`);
    }
    if (seen.has(name)) throw new RangeError(`files[${i}].name ${JSON.stringify(name)} is reserved or repeated`);
    if (!(file.bytes instanceof Uint8Array)) throw new RangeError(`files[${i}].bytes must be a Uint8Array`);
    seen.add(name);
    // PNG and zipped formats do not shrink further; store them.
    const stored = /\.(png|glb|zip|woff2|jpe?g)$/i.test(name);
    entries[name] = [file.bytes, { level: stored ? 0 : 6, mtime }];
  }
  const { recipe, ...rest } = meta;
  entries['recipe.json'] = [strToU8(JSON.stringify(recipe, null, 2) + '\n'), { level: 6, mtime }];
  entries['metadata.json'] = [strToU8(JSON.stringify(rest, null, 2) + '\n'), { level: 6, mtime }];
  entries['README.txt'] = [strToU8(metadataSheetText(meta)), { level: 6, mtime }];
  return zipSync(entries);
}
