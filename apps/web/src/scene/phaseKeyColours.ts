// The phase key's colours: the one phase-colouring rule (@psiform/colour phaseHex, as phaseColoursInto colours the
// surfaces) on the figure's palette and its swatchbook's wheel, or undefined for a figure coloured by the sign of ψ
// (which has the ψ > 0 / ψ < 0 legend instead).
import type { Recipe } from '@psiform/contracts';
import { phaseHex } from '@psiform/colour';
import { usesPhaseKey, type PhaseColourAt } from '@psiform/print';

export function phaseKeyColours(recipe: Pick<Recipe, 'content' | 'phase' | 'palette'>): PhaseColourAt | undefined {
  let keyed: boolean;
  try {
    keyed = usesPhaseKey(recipe);
  } catch {
    return undefined; // a state the Composer is still being told about: no key until it is valid
  }
  if (!keyed) return undefined;
  const palette = recipe.palette;
  return (angle) => phaseHex(palette, 'argument', 'complex', angle);
}
