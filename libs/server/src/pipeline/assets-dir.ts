import { existsSync } from 'node:fs';
import path from 'node:path';

/**
 * The repository's assets/ folder (ICC profiles, demo scenario, palettes), found by walking up from this file so
 * it works from src (tests) and dist alike, and wherever this module ends up. PSIFORM_ASSETS overrides it.
 */
export function assetsDir(): string {
  if (process.env.PSIFORM_ASSETS) return process.env.PSIFORM_ASSETS;
  let dir = __dirname;
  for (let i = 0; i < 8; i++) {
    if (existsSync(path.join(dir, 'assets', 'README.md'))) return path.join(dir, 'assets');
    dir = path.dirname(dir);
  }
  throw new Error(`assets/ not found above ${__dirname}; set PSIFORM_ASSETS`);
}

export function assetPath(rel: string): string {
  return path.join(assetsDir(), rel);
}
