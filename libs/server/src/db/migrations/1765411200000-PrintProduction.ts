import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Issue "Print production": TIFF, PDF and soft-proof assets, and one delivery profile per publication (the art
 * director's rules for deliverables, validated by libs/contracts deliveryProfileSchema; stored as jsonb so the
 * report copies it whole). Hand-written.
 */
export class PrintProduction1765411200000 implements MigrationInterface {
  name = 'PrintProduction1765411200000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "assets" DROP CONSTRAINT "ck_assets_kind"`);
    await q.query(`ALTER TABLE "assets" ADD CONSTRAINT "ck_assets_kind" CHECK ("kind" IN ('glb', 'stl', 'ply', 'obj', 'nrrd', 'png', 'svg', 'bundle', 'tiff', 'pdf', 'softproof'))`);
    await q.query(`
      CREATE TABLE "delivery_profiles" (
        "publication_id" uuid NOT NULL,
        "profile" jsonb NOT NULL,
        "updated_by" uuid NULL,
        "updated_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_delivery_profiles" PRIMARY KEY ("publication_id"),
        CONSTRAINT "fk_delivery_profiles_publication" FOREIGN KEY ("publication_id") REFERENCES "publications"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_delivery_profiles_updated_by" FOREIGN KEY ("updated_by") REFERENCES "users"("id") ON DELETE SET NULL
      )`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "delivery_profiles"`);
    await q.query(`DELETE FROM "assets" WHERE "kind" IN ('tiff', 'pdf', 'softproof')`);
    await q.query(`ALTER TABLE "assets" DROP CONSTRAINT "ck_assets_kind"`);
    await q.query(`ALTER TABLE "assets" ADD CONSTRAINT "ck_assets_kind" CHECK ("kind" IN ('glb', 'stl', 'ply', 'obj', 'nrrd', 'png', 'svg', 'bundle'))`);
  }
}
