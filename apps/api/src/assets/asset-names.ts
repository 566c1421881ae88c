import { DataSource } from 'typeorm';
import { DeliveryProfilesStore } from '@psiform/server';
import { DEFAULT_DELIVERY_PROFILE, parseRecipe } from '@psiform/contracts';
import { fileFieldsFor, fileNameFor } from '@psiform/print';

/** What names a stored file: its figure (or figure set), the version's label, the publication. */
export interface AssetNameFacts {
  kind: string;
  stats: Record<string, unknown> | null;
  publicationId: string;
  publicationTitle: string;
  figureTitle: string | null;
  versionNumber: number | null;
  recipe: unknown;
  setTitle: string | null;
}

/**
 * Port for the facts a download name is made from, and the publication's file-name template: its delivery
 * profile's (libs/contracts print.ts), or the default profile's while it has none. Only TypeormAssetNames
 * touches the tables.
 */
export abstract class AssetNames {
  abstract facts(assetId: string): Promise<AssetNameFacts | null>;
  abstract templateFor(publicationId: string): Promise<string>;
}

export class TypeormAssetNames extends AssetNames {
  constructor(
    private readonly ds: DataSource,
    private readonly profiles: DeliveryProfilesStore,
  ) {
    super();
  }

  async facts(assetId: string): Promise<AssetNameFacts | null> {
    const rows = (await this.ds.query(
      `SELECT a.kind, a.stats, a.publication_id AS "publicationId", p.title AS "publicationTitle",
              f.title AS "figureTitle", v.number AS "versionNumber", v.recipe, s.title AS "setTitle"
         FROM assets a
         JOIN publications p ON p.id = a.publication_id
         LEFT JOIN figure_versions v ON v.id = a.figure_version_id
         LEFT JOIN figures f ON f.id = v.figure_id
         LEFT JOIN figure_sets s ON s.png_asset_id = a.id
        WHERE a.id = $1
        LIMIT 1`,
      [assetId],
    )) as AssetNameFacts[];
    return rows[0] ?? null;
  }

  async templateFor(publicationId: string): Promise<string> {
    return (await this.profiles.find(publicationId))?.profile.fileNameTemplate ?? DEFAULT_DELIVERY_PROFILE.fileNameTemplate;
  }
}

/** The download name of a stored file (fileNameFor through the publication's template). */
export function downloadName(f: AssetNameFacts, template: string): string {
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
    template,
  );
}
