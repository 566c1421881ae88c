import { BadRequestException } from '@nestjs/common';
import { formatRecipeIssues, parseRecipe, type Recipe } from '@psiform/contracts';

/** Validates a recipe document (defaults filled in) or throws 400 with one `recipe.<path>: <reason>` per issue. */
export function validateRecipe(doc: unknown): Recipe {
  const r = parseRecipe(doc);
  if (r.ok) return r.recipe;
  throw new BadRequestException(
    formatRecipeIssues(r.issues).map((line, i) => (r.issues[i].path === '(root)' ? `recipe: ${r.issues[i].message}` : `recipe.${line}`)),
  );
}

