import { parseRecipe } from '@psiform/contracts';
import { withPalette } from './palette';

describe('withPalette (the house palette and batch re-renders)', () => {
  const parsed = parseRecipe({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 16 }, surface: { rule: 'enclosed', fraction: 0.9 } });
  if (!parsed.ok) throw new Error('fixture recipe invalid');
  const colours = { swatchbookId: 'sb-1', positive: '#b3402a', negative: '#245a86', background: '#f4f1ea' };

  it('copies the phase colours and the swatchbook id into recipe.palette and the background into the stage', () => {
    const r = withPalette(parsed.recipe, colours);
    expect(r.palette).toEqual({ swatchbookId: 'sb-1', positive: '#b3402a', negative: '#245a86' });
    expect(r.stage.background).toEqual({ transparent: false, color: '#f4f1ea' });
    expect(r.content).toBe(parsed.recipe.content);
    expect(parsed.recipe.palette.positive).not.toBe('#b3402a'); // the input is not mutated
  });

  it('keeps a transparent background transparent', () => {
    const transparent = { ...parsed.recipe, stage: { ...parsed.recipe.stage, background: { transparent: true, color: '#000000' } } };
    expect(withPalette(transparent, colours).stage.background).toEqual({ transparent: true, color: '#000000' });
  });

  it('is idempotent: applying the same colours twice gives the same recipe', () => {
    const once = withPalette(parsed.recipe, colours);
    expect(withPalette(once, colours)).toEqual(once);
  });
});
