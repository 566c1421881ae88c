import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Issue "Stays up and stays scoped": a swatchbook belongs to one publication, or to every publication of one
 * publisher (an organisation's house palettes), and is read and written only there. Existing swatchbooks move to
 * the publication whose house style pins them, else to a publication their owner belongs to, else (an owner with
 * no publication) to the oldest publication; hand-written, synchronize stays off.
 */
export class SwatchbookScope1796200000000 implements MigrationInterface {
  name = 'SwatchbookScope1796200000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "swatchbooks" ADD COLUMN "publication_id" uuid NULL, ADD COLUMN "publisher" varchar(200) NULL`);
    await q.query(`
      UPDATE "swatchbooks" s SET "publication_id" = COALESCE(
        (SELECT h."publication_id" FROM "house_styles" h WHERE h."swatchbook_id" = s."id" ORDER BY h."updated_at" LIMIT 1),
        (SELECT m."publication_id" FROM "publication_members" m WHERE m."user_id" = s."owner_id" ORDER BY m."publication_id" LIMIT 1),
        (SELECT p."id" FROM "publications" p ORDER BY p."created_at" LIMIT 1))`);
    // A swatchbook that still has no home (no publication exists at all) cannot be scoped: it is removed.
    await q.query(`DELETE FROM "swatchbooks" WHERE "publication_id" IS NULL`);
    await q.query(`
      ALTER TABLE "swatchbooks"
        ADD CONSTRAINT "fk_swatchbooks_publication" FOREIGN KEY ("publication_id") REFERENCES "publications"("id") ON DELETE CASCADE,
        ADD CONSTRAINT "ck_swatchbooks_scope" CHECK (("publication_id" IS NULL) <> ("publisher" IS NULL)),
        ADD CONSTRAINT "ck_swatchbooks_publisher" CHECK ("publisher" IS NULL OR char_length("publisher") BETWEEN 1 AND 200)`);
    await q.query(`CREATE INDEX "ix_swatchbooks_publication" ON "swatchbooks" ("publication_id")`);
    await q.query(`CREATE INDEX "ix_swatchbooks_publisher" ON "swatchbooks" ("publisher")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX "ix_swatchbooks_publisher"`);
    await q.query(`DROP INDEX "ix_swatchbooks_publication"`);
    await q.query(`ALTER TABLE "swatchbooks" DROP CONSTRAINT "ck_swatchbooks_publisher", DROP CONSTRAINT "ck_swatchbooks_scope", DROP CONSTRAINT "fk_swatchbooks_publication"`);
    await q.query(`ALTER TABLE "swatchbooks" DROP COLUMN "publisher", DROP COLUMN "publication_id"`);
  }
}
