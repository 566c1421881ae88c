// Starting points of a new figure in the Composer (our own selection): each a complete recipe, so a preset is
// just a different first draft. The Library's "New figure" opens the Composer with them.
import { parseRecipe, RECIPE_DEFAULTS, RECIPE_VERSION, type Recipe, type RecipeInput } from '@psiform/contracts';
import { parseOrbitalLabel, prettyLabel } from '@psiform/orbitals';

export interface ComposerPreset {
  id: string;
  /** Display name (typeset in the UI). */
  name: string;
  note: string;
  recipe(): Recipe;
}

function fromLabel(key: string, Z = 1): Recipe {
  const parsed = parseOrbitalLabel(key);
  return build({ label: prettyLabel(key), content: { Z, terms: parsed.state.terms } });
}

function build(over: Partial<RecipeInput> & Pick<RecipeInput, 'content'>): Recipe {
  const r = parseRecipe({
    version: RECIPE_VERSION,
    grid: { n: RECIPE_DEFAULTS.gridN, extent: 'auto' },
    surface: { rule: 'enclosed', fraction: RECIPE_DEFAULTS.fraction },
    ...over,
  });
  if (!r.ok) throw new Error(`preset recipe invalid: ${r.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}`);
  return r.recipe;
}

export const COMPOSER_PRESETS: ComposerPreset[] = [
  { id: '2pz', name: '2p_z', note: 'two lobes of opposite sign', recipe: () => fromLabel('2pz') },
  { id: '3dz2', name: '3d_z²', note: 'lobes along z with a ring', recipe: () => fromLabel('3dz2') },
  { id: '3dxy', name: '3d_xy', note: 'a four-lobed cloverleaf', recipe: () => fromLabel('3dxy') },
  { id: '2p+1', name: '2p(m=+1)', note: 'complex: a ring coloured by phase', recipe: () => fromLabel('2p+1') },
  { id: 'sp3', name: 'sp³ #1', note: 'a hybrid', recipe: () => fromLabel('sp3#1') },
  { id: 'he-1s', name: '1s of He⁺', note: 'an ion, Z = 2', recipe: () => fromLabel('1s', 2) },
];

/** The first draft of a new figure: the preset asked for, else the first one. */
export function presetRecipe(id: string | null | undefined): Recipe {
  return (COMPOSER_PRESETS.find((p) => p.id === id) ?? COMPOSER_PRESETS[0]).recipe();
}
