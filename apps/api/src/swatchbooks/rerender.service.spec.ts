import { parseRecipe } from '@psiform/contracts';
import { withPalette } from './rerender.service';

describe('withPalette', () => {
  const parsed = parseRecipe({ version: 1, content: { Z: 1, terms: [{ n: 2, l: 1, m: 0, basis: 'real', re: 1 }] }, grid: { n: 16 }, surface: { rule: 'enclosed', fraction: 0.9 } });
  if (!parsed.ok) throw new Error('fixture recipe invalid');
  const colors = { positive: '#b3402a', negative: '#245a86', background: '#f4f1ea', label: '#111111' };

  it('copies the phase colours and the swatchbook id into recipe.palette and the background into the stage', () => {
    const r = withPalette(parsed.recipe, 'sb-1', colors);
    expect(r.palette).toEqual({ swatchbookId: 'sb-1', positive: '#b3402a', negative: '#245a86' });
    expect(r.stage.background).toEqual({ transparent: false, color: '#f4f1ea' });
    expect(r.content).toBe(parsed.recipe.content);
    expect(parsed.recipe.palette.positive).not.toBe('#b3402a'); // the input is not mutated
  });

  it('keeps a transparent background transparent', () => {
    const transparent = { ...parsed.recipe, stage: { ...parsed.recipe.stage, background: { transparent: true, color: '#000000' } } };
    expect(withPalette(transparent, 'sb-1', colors).stage.background).toEqual({ transparent: true, color: '#000000' });
  });
});
