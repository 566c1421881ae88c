// The preset palettes shipped in assets/palettes pass Psiform's own swatchbook checks and print in gamut on every
// press condition in assets/icc (real profiles, see press.test.ts for their check against Little CMS).
import { readFileSync, readdirSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkSwatchbook, iccPressTransform, PHASE_DELTA_E_WARN } from '../src';

const ROOT = path.resolve(__dirname, '../../..');
const files = readdirSync(path.join(ROOT, 'assets/palettes')).filter((f) => f.endsWith('.json'));
const presses = [
  { id: 'fogra39', name: 'FOGRA39', tacPercent: 330, file: 'psiform-fogra39.icc' },
  { id: 'gracol', name: 'GRACoL', tacPercent: 320, file: 'psiform-gracol-tr006.icc' },
  { id: 'swop', name: 'SWOP', tacPercent: 300, file: 'psiform-swop-tr003.icc' },
].map(({ file, ...c }) => iccPressTransform(new Uint8Array(readFileSync(path.join(ROOT, 'assets/icc', file))), c));

describe('assets/palettes', () => {
  it('holds at least three presets', () => expect(files.length).toBeGreaterThanOrEqual(3));
  it.each(files)('%s is a swatchbook file that passes every check on every press condition', (f) => {
    const book = JSON.parse(readFileSync(path.join(ROOT, 'assets/palettes', f), 'utf8'));
    expect(book.format).toBe('psiform-swatchbook');
    expect(book.formatVersion).toBe(1);
    for (const press of presses) {
      const r = checkSwatchbook(book.colors, { press });
      expect(r.warnings, `${f} on ${press.condition.id}`).toEqual([]);
      expect(Math.min(r.figures.phaseDeltaE2000, r.figures.phaseDeltaE2000Protan, r.figures.phaseDeltaE2000Deutan, r.figures.phaseDeltaE2000Tritan)).toBeGreaterThanOrEqual(PHASE_DELTA_E_WARN);
      expect(r.figures.print?.swatches.every((s) => s.inGamut)).toBe(true);
    }
  });
});
