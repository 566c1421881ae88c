import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Issue "The workflows a publisher runs on", part 1: accounts that are invited (no password yet), deactivated, or
 * active; one-time links (invitation, password reset) stored only as a SHA-256 of the token; a role per
 * publication membership (the publication's length unit is FigureUnitsAndSetCaptions'); audit entries about users, publications and house
 * styles in the one audit table. Hand-written.
 */
export class PeopleAndPublications1765584000000 implements MigrationInterface {
  name = 'PeopleAndPublications1765584000000';

  async up(q: QueryRunner): Promise<void> {
    // Users: an invited account has no password hash until its link is used.
    await q.query(`ALTER TABLE "users" ALTER COLUMN "password_hash" DROP NOT NULL`);
    await q.query(`ALTER TABLE "users" ADD COLUMN "active" boolean NOT NULL DEFAULT true`);
    // Tokens issued before this instant are refused (deactivation, password change): JWTs carry iat in seconds.
    await q.query(`ALTER TABLE "users" ADD COLUMN "tokens_valid_after" timestamptz NULL`);

    await q.query(`
      CREATE TABLE "user_links" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "user_id" uuid NOT NULL,
        "purpose" varchar(10) NOT NULL,
        "token_hash" char(64) NOT NULL,
        "expires_at" timestamptz NOT NULL,
        "used_at" timestamptz NULL,
        "created_by" uuid NULL,
        "created_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_user_links" PRIMARY KEY ("id"),
        CONSTRAINT "uq_user_links_token_hash" UNIQUE ("token_hash"),
        CONSTRAINT "fk_user_links_user" FOREIGN KEY ("user_id") REFERENCES "users"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_user_links_created_by" FOREIGN KEY ("created_by") REFERENCES "users"("id") ON DELETE SET NULL,
        CONSTRAINT "ck_user_links_purpose" CHECK ("purpose" IN ('invite', 'reset')),
        CONSTRAINT "ck_user_links_hash" CHECK ("token_hash" ~ '^[0-9a-f]{64}$')
      )`);
    await q.query(`CREATE INDEX "ix_user_links_user" ON "user_links" ("user_id", "created_at")`);

    // A member's role in the publication; rows written without one take the user's own role.
    await q.query(`ALTER TABLE "publication_members" ADD COLUMN "role" varchar(20) NULL`);
    await q.query(`UPDATE "publication_members" m SET "role" = u."role" FROM "users" u WHERE u."id" = m."user_id"`);
    await q.query(`
      CREATE FUNCTION "psiform_member_role_default"() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF NEW."role" IS NULL THEN
          SELECT "role" INTO NEW."role" FROM "users" WHERE "id" = NEW."user_id";
        END IF;
        RETURN NEW;
      END $$`);
    await q.query(`CREATE TRIGGER "tr_members_role_default" BEFORE INSERT ON "publication_members" FOR EACH ROW EXECUTE FUNCTION "psiform_member_role_default"()`);
    await q.query(`ALTER TABLE "publication_members" ALTER COLUMN "role" SET NOT NULL`);
    await q.query(`ALTER TABLE "publication_members" ADD CONSTRAINT "ck_members_role" CHECK ("role" IN ('illustrator', 'editor', 'art_director', 'admin'))`);

    // The one audit table also records changes to users, publications and house styles.
    await q.query(`ALTER TABLE "audit_entries" ALTER COLUMN "figure_id" DROP NOT NULL`);
    await q.query(`ALTER TABLE "audit_entries" ADD COLUMN "subject_kind" varchar(20) NOT NULL DEFAULT 'figure'`);
    await q.query(`ALTER TABLE "audit_entries" ADD COLUMN "subject_id" uuid NULL`);
    await q.query(`
      ALTER TABLE "audit_entries" ADD CONSTRAINT "ck_audit_subject" CHECK (
        ("subject_kind" = 'figure' AND "figure_id" IS NOT NULL)
        OR ("subject_kind" IN ('user', 'publication', 'house_style') AND "figure_id" IS NULL AND "subject_id" IS NOT NULL))`);
    await q.query(`CREATE INDEX "ix_audit_subject_seq" ON "audit_entries" ("subject_kind", "subject_id", "seq") WHERE "subject_id" IS NOT NULL`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP INDEX "ix_audit_subject_seq"`);
    await q.query(`DELETE FROM "audit_entries" WHERE "subject_kind" <> 'figure'`);
    await q.query(`ALTER TABLE "audit_entries" DROP CONSTRAINT "ck_audit_subject"`);
    await q.query(`ALTER TABLE "audit_entries" DROP COLUMN "subject_id"`);
    await q.query(`ALTER TABLE "audit_entries" DROP COLUMN "subject_kind"`);
    await q.query(`ALTER TABLE "audit_entries" ALTER COLUMN "figure_id" SET NOT NULL`);
    await q.query(`DROP TRIGGER "tr_members_role_default" ON "publication_members"`);
    await q.query(`DROP FUNCTION "psiform_member_role_default"()`);
    await q.query(`ALTER TABLE "publication_members" DROP COLUMN "role"`);
    await q.query(`DROP TABLE "user_links"`);
    await q.query(`ALTER TABLE "users" DROP COLUMN "tokens_valid_after"`);
    await q.query(`ALTER TABLE "users" DROP COLUMN "active"`);
    await q.query(`UPDATE "users" SET "password_hash" = '!' WHERE "password_hash" IS NULL`);
    await q.query(`ALTER TABLE "users" ALTER COLUMN "password_hash" SET NOT NULL`);
  }
}
