// Real CMYK through the committed profiles (assets/icc), checked against Little CMS's own `transicc`
// (Debian liblcms2-utils, installed by `npm test`): same profile, relative colorimetric (-t1), no
// precalculated device link (-c0), so both sides evaluate the profile's tables directly.
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { IccError, checkSwatchbook, deltaE2000Lab, hexToLabD50, iccPressTransform, pressCheck, readIccProfile, type PressConditionInfo } from '../src';

const ICC = path.resolve(__dirname, '../../../assets/icc');
const ALL: (PressConditionInfo & { file: string })[] = [
  { id: 'fogra39', name: 'FOGRA39 (coated)', tacPercent: 330, file: 'psiform-fogra39.icc' },
  { id: 'gracol', name: 'GRACoL (coated #1, TR006)', tacPercent: 320, file: 'psiform-gracol-tr006.icc' },
  { id: 'swop', name: 'SWOP (coated #3, TR003)', tacPercent: 300, file: 'psiform-swop-tr003.icc' },
];
// Until every profile is built, test the ones present (the rebuild script makes all three; PROVENANCE.md lists them).
const CONDITIONS = ALL.filter((c) => existsSync(path.join(ICC, c.file)));
const SWATCHES = ['#c8553d', '#2f6690', '#1f5e5b', '#f8f5ee', '#1f1d1a', '#00ff00', '#0000ff', '#ff00ff', '#ffd400', '#808080', '#ffffff', '#000000', '#e0b0ff', '#6b8e23'];

function transicc(args: string[], lines: string[]): number[][] {
  const r = spawnSync('transicc', [...args, '-n'], { input: lines.join('\n') + '\n', encoding: 'utf8' });
  if (r.error) throw new Error(`transicc (Debian liblcms2-utils) is needed: ${r.error.message}`);
  return r.stdout.trim().split('\n').map((l) => l.trim().split(/\s+/).map(Number));
}
const rgb = (hex: string) => [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16)).join(' ');

describe.each(CONDITIONS)('$id profile against transicc', (c) => {
  const file = path.join(ICC, c.file);
  const bytes = new Uint8Array(readFileSync(file));
  const t = iccPressTransform(bytes, c);

  it('reads the header the rebuild script wrote', () => {
    const p = readIccProfile(bytes);
    expect(p.colourSpace).toBe('CMYK');
    expect(p.pcs).toBe('Lab ');
    expect(p.deviceClass).toBe('prtr');
    expect(p.description).toMatch(/^Psiform /);
    expect(p.copyright).toMatch(/Zlib/);
  });

  it('separates sRGB swatches to the CMYK transicc gives, within 1 percentage point per ink', () => {
    const ref = transicc(['-t1', '-c0', '-i', '*sRGB', '-o', file], SWATCHES.map(rgb));
    SWATCHES.forEach((hex, i) => {
      const ours = pressCheck(hex, t).cmyk;
      for (let k = 0; k < 4; k++) expect(Math.abs(ours[k] - ref[i][k]), `${hex} ink ${'CMYK'[k]}: ours ${ours} lcms ${ref[i]}`).toBeLessThanOrEqual(1);
    });
  });

  it('prints CMYK as the CIELAB transicc gives, within ΔE00 0.5', () => {
    const inks: [number, number, number, number][] = [[0, 0, 0, 0], [100, 0, 0, 0], [0, 100, 0, 0], [0, 0, 100, 0], [0, 0, 0, 100], [40, 30, 20, 10], [70, 10, 55, 35], [100, 100, 100, 100]];
    const ref = transicc(['-t1', '-c0', '-i', file, '-o', '*Lab'], inks.map((k) => k.join(' ')));
    inks.forEach((k, i) => {
      const ours = t.cmykToLab(k);
      expect(deltaE2000Lab(ours, ref[i] as [number, number, number]), `${k}: ours ${ours} lcms ${ref[i]}`).toBeLessThan(0.5);
    });
  });

  it('keeps total ink within the limit the profile was built with, and paper white unprinted', () => {
    for (const hex of SWATCHES) expect(pressCheck(hex, t).totalInk).toBeLessThanOrEqual(c.tacPercent + 0.5);
    expect(pressCheck('#ffffff', t).totalInk).toBeLessThan(1);
    const black = pressCheck('#000000', t);
    expect(black.cmyk[3]).toBeGreaterThan(85); // rich black: K carries it (ramp black generation)
  });

  it('calls pure sRGB green out of gamut and an earthy red in gamut, naming the condition', () => {
    const g = pressCheck('#00ff00', t);
    expect(g.inGamut).toBe(false);
    expect(g.deltaE00).toBeGreaterThan(10);
    const r = pressCheck('#c8553d', t);
    expect(r.inGamut).toBe(true);
    expect(r.deltaE00).toBeLessThan(3);
    expect(r.condition).toBe(c.name);
    expect(r.proofHex).toMatch(/^#[0-9a-f]{6}$/);
  });
});

describe('ICC reading errors', () => {
  it('refuses bytes that are not a profile', () => {
    expect(() => readIccProfile(new Uint8Array(200))).toThrow(IccError);
    const real = new Uint8Array(readFileSync(path.join(ICC, CONDITIONS[0].file)));
    expect(() => readIccProfile(real.slice(0, 4000))).toThrow(/truncated/);
  });
});

describe('deltaE2000Lab', () => {
  it('matches Sharma, Wu & Dalal (2005) table 1, pair 1 (2.0425) and is 0 for equal colours', () => {
    expect(deltaE2000Lab([50, 2.6772, -79.7751], [50, 0, -82.7485])).toBeCloseTo(2.0425, 4);
    expect(deltaE2000Lab([50, 10, 10], [50, 10, 10])).toBe(0);
  });
  it('sRGB white is L* 100 under D50 (Bradford-adapted, as ICC sRGB profiles are)', () => {
    const w = hexToLabD50('#ffffff');
    expect(w[0]).toBeCloseTo(100, 3);
    expect(Math.abs(w[1]) + Math.abs(w[2])).toBeLessThan(0.01);
  });
});

describe('checkSwatchbook with a press condition', () => {
  const { file, ...fogra } = ALL[0];
  const t = iccPressTransform(new Uint8Array(readFileSync(path.join(ICC, file))), fogra);
  it('reports each swatch on the profile and warns for the out-of-gamut one', () => {
    const r = checkSwatchbook({ positive: '#00ff00', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' }, { press: t });
    expect(r.figures.print?.condition).toEqual({ id: 'fogra39', name: 'FOGRA39 (coated)', tacPercent: 330 });
    expect(r.figures.print?.swatches.map((s) => s.name)).toEqual(['positive', 'negative', 'background', 'label']);
    expect(r.figures.outOfPrintGamut).toEqual(['positive']);
    const w = r.warnings.find((x) => x.code === 'out_of_print_gamut');
    expect(w?.message).toMatch(/FOGRA39/);
  });
  it('without a press condition makes no print claim', () => {
    const r = checkSwatchbook({ positive: '#00ff00', negative: '#2f6690', background: '#ffffff', label: '#1a1a1a' });
    expect(r.figures.print).toBeNull();
    expect(r.warnings.some((x) => x.code === 'out_of_print_gamut')).toBe(false);
  });
});
