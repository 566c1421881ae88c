import { DEFAULT_DELIVERY_PROFILE, parseRecipe } from '@psiform/contracts';
import { fileFieldsFor, fileNameFor } from '@psiform/print';
import type { AssetNameFacts } from '@psiform/server';

/** The download name of a stored file: fileNameFor through the publication's template (the default profile's while it has none). */
export function downloadName(f: AssetNameFacts): string {
  const parsed = f.recipe ? parseRecipe(f.recipe) : null;
  const label = parsed?.ok ? parsed.recipe.label : undefined;
  return fileNameFor(
    {
      publication: f.publicationTitle,
      figure: f.figureTitle ?? f.setTitle ?? 'figure',
      label: f.setTitle && !f.figureTitle ? undefined : label,
      version: f.versionNumber ?? undefined,
      ...fileFieldsFor(f.kind, f.stats),
    },
    f.fileNameTemplate ?? DEFAULT_DELIVERY_PROFILE.fileNameTemplate,
  );
}
