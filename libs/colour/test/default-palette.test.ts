import { readFileSync } from 'node:fs';
import path from 'node:path';
import { PSIFORM_PALETTE, recipeSchema } from '@psiform/contracts';
import { describe, expect, it } from 'vitest';
import { checkSwatchbook, contrastRatio, deltaE2000, PHASE_DELTA_E_WARN, simulateCvd, WCAG_AA_GRAPHICS } from '../src';

// Psiform's default phase colours (libs/contracts PSIFORM_PALETTE) must pass our own swatchbook checks.
describe("Psiform's default palette", () => {
  const { positive, negative, label } = PSIFORM_PALETTE;
  const backgrounds = { default: PSIFORM_PALETTE.background, white: '#ffffff', paper: '#f8f5ee' };

  it("is the brand's Verdigris and Ochre swatchbook (assets/palettes), so the two never drift apart", () => {
    const book = JSON.parse(readFileSync(path.resolve(__dirname, '../../../assets/palettes/verdigris-and-ochre.json'), 'utf8'));
    expect({ positive: book.colors.positive, negative: book.colors.negative }).toEqual({ positive, negative });
  });

  it('is what a recipe gets when it names no swatchbook', () => {
    const r = recipeSchema.parse({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 32 }, surface: { rule: 'enclosed', fraction: 0.9 } });
    expect(r.palette).toEqual({ swatchbookId: null, positive, negative });
    expect(r.stage.background.color).toBe(PSIFORM_PALETTE.background);
  });

  it('phases differ by ΔE00 ≥ 20 for normal vision and under every simulated dichromacy (Machado et al. 2009)', () => {
    expect(deltaE2000(positive, negative)).toBeGreaterThanOrEqual(PHASE_DELTA_E_WARN);
    for (const kind of ['protanopia', 'deuteranopia', 'tritanopia'] as const) {
      expect({ kind, ok: deltaE2000(simulateCvd(positive, kind), simulateCvd(negative, kind)) >= PHASE_DELTA_E_WARN }).toEqual({ kind, ok: true });
    }
  });

  it('each phase has contrast ≥ 3:1 (WCAG 2.1 1.4.11) on the default, white and paper backgrounds, and checkSwatchbook raises no phase warning', () => {
    for (const [name, bg] of Object.entries(backgrounds)) {
      for (const c of [positive, negative]) expect({ name, c, ok: contrastRatio(c, bg) >= WCAG_AA_GRAPHICS }).toEqual({ name, c, ok: true });
      const check = checkSwatchbook({ positive, negative, background: bg, label });
      expect(check.warnings.filter((w) => w.code === 'phases_too_similar' || w.code === 'phase_background_contrast_low' || w.code === 'label_contrast_low')).toEqual([]);
    }
  });

  it('is not the red/blue pair: the positive phase is a green-blue (verdigris), the negative an orange-yellow (ochre)', () => {
    const hue = (hex: string) => {
      const [r, g, b] = [1, 3, 5].map((i) => parseInt(hex.slice(i, i + 2), 16) / 255);
      const max = Math.max(r, g, b);
      const min = Math.min(r, g, b);
      const d = max - min;
      const h = max === r ? ((g - b) / d) % 6 : max === g ? (b - r) / d + 2 : (r - g) / d + 4;
      return (h * 60 + 360) % 360;
    };
    expect(hue(positive)).toBeGreaterThan(150);
    expect(hue(positive)).toBeLessThan(200);
    expect(hue(negative)).toBeGreaterThan(25);
    expect(hue(negative)).toBeLessThan(50);
  });
});
