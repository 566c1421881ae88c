import { readFileSync } from 'node:fs';
import { iccPressTransform, pressCheck, type PressSwatch, type PressTransform } from '@psiform/colour';
import { pressCondition, PRESS_CONDITIONS, type PressConditionId } from '@psiform/contracts';
import { assetPath } from '@psiform/server';

const cache = new Map<string, PressTransform>();

/** The press condition's transform from its committed profile (assets/icc), built once per process. */
export function pressTransform(id: PressConditionId): PressTransform {
  let t = cache.get(id);
  if (!t) {
    const c = pressCondition(id)!;
    t = iccPressTransform(new Uint8Array(readFileSync(assetPath(`icc/${c.iccFile}`))), { id: c.id, name: c.name, tacPercent: c.tacPercent });
    cache.set(id, t);
  }
  return t;
}

export function checkColours(id: PressConditionId, colours: Record<string, string>): { condition: (typeof PRESS_CONDITIONS)[number]; swatches: (PressSwatch & { name: string })[] } {
  const t = pressTransform(id);
  return { condition: pressCondition(id)!, swatches: Object.entries(colours).map(([name, hex]) => ({ name, ...pressCheck(hex, t) })) };
}
