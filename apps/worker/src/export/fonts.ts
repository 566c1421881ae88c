import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import type { FontBytes } from '@psiform/print';

let cached: FontBytes | undefined;

/** Lato Regular and Bold (latin subset, woff2) from @fontsource/lato, the files the web client ships; read once. */
export function latoFonts(): FontBytes {
  if (cached) return cached;
  const dir = join(dirname(require.resolve('@fontsource/lato/package.json')), 'files');
  cached = {
    regular: new Uint8Array(readFileSync(join(dir, 'lato-latin-400-normal.woff2'))),
    bold: new Uint8Array(readFileSync(join(dir, 'lato-latin-700-normal.woff2'))),
  };
  return cached;
}
