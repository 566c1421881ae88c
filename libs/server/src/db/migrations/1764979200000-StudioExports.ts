import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Issue "The studio": job parameters for render/export jobs, figure thumbnails, figure sets. Hand-written. */
export class StudioExports1764979200000 implements MigrationInterface {
  name = 'StudioExports1764979200000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "jobs" ADD COLUMN "params" jsonb NULL`);
    await q.query(`ALTER TABLE "figures" ADD COLUMN "thumbnail_asset_id" uuid NULL`);
    await q.query(
      `ALTER TABLE "figures" ADD CONSTRAINT "fk_figures_thumbnail" FOREIGN KEY ("thumbnail_asset_id") REFERENCES "assets"("id") ON DELETE SET NULL`,
    );
    await q.query(`
      CREATE TABLE "figure_sets" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "publication_id" uuid NOT NULL,
        "title" varchar(200) NOT NULL,
        "figure_ids" uuid[] NOT NULL,
        "columns" int NOT NULL,
        "created_by" uuid NULL,
        "created_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_figure_sets" PRIMARY KEY ("id"),
        CONSTRAINT "fk_figure_sets_publication" FOREIGN KEY ("publication_id") REFERENCES "publications"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_figure_sets_created_by" FOREIGN KEY ("created_by") REFERENCES "users"("id") ON DELETE SET NULL,
        CONSTRAINT "ck_figure_sets_title" CHECK (char_length("title") BETWEEN 1 AND 200),
        CONSTRAINT "ck_figure_sets_columns" CHECK ("columns" BETWEEN 1 AND 6),
        CONSTRAINT "ck_figure_sets_figures" CHECK (cardinality("figure_ids") BETWEEN 1 AND 12)
      )`);
    await q.query(`CREATE INDEX "ix_figure_sets_publication" ON "figure_sets" ("publication_id", "created_at" DESC)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "figure_sets"`);
    await q.query(`ALTER TABLE "figures" DROP CONSTRAINT "fk_figures_thumbnail"`);
    await q.query(`ALTER TABLE "figures" DROP COLUMN "thumbnail_asset_id"`);
    await q.query(`ALTER TABLE "jobs" DROP COLUMN "params"`);
  }
}
