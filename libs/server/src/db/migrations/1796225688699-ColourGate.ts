import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Issue "Colour checks that gate": a house style pinned past failing colour checks keeps the written reason, who gave
 * it, when, the failures it went past and the swatchbook version they were found in (shown on every affected proof);
 * a batch re-render that went past them keeps its reason. Hand-written, synchronize stays off.
 */
export class ColourGate1796225688699 implements MigrationInterface {
  name = 'ColourGate1796225688699';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      ALTER TABLE "house_styles"
        ADD COLUMN "override_reason" text NULL,
        ADD COLUMN "override_by" uuid NULL,
        ADD COLUMN "override_at" timestamptz NULL,
        ADD COLUMN "override_failures" jsonb NULL,
        ADD COLUMN "override_swatchbook_version" int NULL,
        ADD CONSTRAINT "fk_house_styles_override_by" FOREIGN KEY ("override_by") REFERENCES "users"("id") ON DELETE SET NULL,
        ADD CONSTRAINT "ck_house_styles_override" CHECK (("override_reason" IS NULL) = ("override_at" IS NULL))`);
    await q.query(`ALTER TABLE "batches" ADD COLUMN "override_reason" text NULL`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "batches" DROP COLUMN "override_reason"`);
    await q.query(`
      ALTER TABLE "house_styles"
        DROP CONSTRAINT "ck_house_styles_override",
        DROP CONSTRAINT "fk_house_styles_override_by",
        DROP COLUMN "override_reason",
        DROP COLUMN "override_by",
        DROP COLUMN "override_at",
        DROP COLUMN "override_failures",
        DROP COLUMN "override_swatchbook_version"`);
  }
}
