import { createHash } from 'node:crypto';
import { canonicalJson, type Recipe } from '@psiform/contracts';

/** sha256 (hex) of the canonical JSON: equal recipes hash equally whatever their key order. */
export function recipeHash(recipe: Recipe): string {
  return createHash('sha256').update(canonicalJson(recipe)).digest('hex');
}
