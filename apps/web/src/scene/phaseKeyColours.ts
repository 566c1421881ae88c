// The phase key's colours: the very rule the figure's surfaces are coloured with (one rule for surfaces and key),
// or undefined for a figure coloured by the sign of ψ (which has the ψ > 0 / ψ < 0 legend instead).
import type { Recipe } from '@psiform/contracts';
import { usesPhaseKey, type PhaseColourAt } from '@psiform/print';
import { phaseWheelLinear } from './geometry';

const toSrgbByte = (lin: number) => {
  const c = lin <= 0.0031308 ? 12.92 * lin : 1.055 * lin ** (1 / 2.4) - 0.055;
  return Math.round(Math.min(1, Math.max(0, c)) * 255)
    .toString(16)
    .padStart(2, '0');
};

export function phaseKeyColours(recipe: Pick<Recipe, 'content' | 'phase' | 'palette'>): PhaseColourAt | undefined {
  let keyed = false;
  try {
    keyed = usesPhaseKey(recipe);
  } catch {
    return undefined; // a state the Composer is still being told about: no key until it is valid
  }
  if (!keyed) return undefined;
  return (angle) => `#${phaseWheelLinear(angle).map(toSrgbByte).join('')}`;
}
