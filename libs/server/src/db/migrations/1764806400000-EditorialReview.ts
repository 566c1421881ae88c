import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Issue "Editorial review and swatchbooks": swatchbooks and their history, house styles, review rounds,
 * comments, the audit log and batch re-renders. Hand-written; synchronize stays off.
 */
export class EditorialReview1764806400000 implements MigrationInterface {
  name = 'EditorialReview1764806400000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE "swatchbooks" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "name" varchar(120) NOT NULL,
        "owner_id" uuid NOT NULL,
        "colors" jsonb NOT NULL,
        "locked" boolean NOT NULL DEFAULT false,
        "version" int NOT NULL DEFAULT 1,
        "created_at" timestamptz NOT NULL DEFAULT now(),
        "updated_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_swatchbooks" PRIMARY KEY ("id"),
        CONSTRAINT "fk_swatchbooks_owner" FOREIGN KEY ("owner_id") REFERENCES "users"("id") ON DELETE RESTRICT,
        CONSTRAINT "ck_swatchbooks_name" CHECK (char_length("name") BETWEEN 1 AND 120),
        CONSTRAINT "ck_swatchbooks_version" CHECK ("version" >= 1)
      )`);
    await q.query(`
      CREATE TABLE "swatchbook_versions" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "swatchbook_id" uuid NOT NULL,
        "version" int NOT NULL,
        "name" varchar(120) NOT NULL,
        "colors" jsonb NOT NULL,
        "locked" boolean NOT NULL,
        "action" varchar(20) NOT NULL,
        "author_id" uuid NULL,
        "created_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_swatchbook_versions" PRIMARY KEY ("id"),
        CONSTRAINT "uq_swatchbook_versions" UNIQUE ("swatchbook_id", "version"),
        CONSTRAINT "fk_swatchbook_versions_book" FOREIGN KEY ("swatchbook_id") REFERENCES "swatchbooks"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_swatchbook_versions_author" FOREIGN KEY ("author_id") REFERENCES "users"("id") ON DELETE SET NULL,
        CONSTRAINT "ck_swatchbook_versions_action" CHECK ("action" IN ('create', 'update', 'lock', 'unlock', 'import'))
      )`);
    await q.query(`
      CREATE TABLE "house_styles" (
        "publication_id" uuid NOT NULL,
        "swatchbook_id" uuid NOT NULL,
        "require_colour_signoff" boolean NOT NULL DEFAULT false,
        "allow_override" boolean NOT NULL DEFAULT false,
        "updated_by" uuid NULL,
        "updated_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_house_styles" PRIMARY KEY ("publication_id"),
        CONSTRAINT "fk_house_styles_publication" FOREIGN KEY ("publication_id") REFERENCES "publications"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_house_styles_swatchbook" FOREIGN KEY ("swatchbook_id") REFERENCES "swatchbooks"("id") ON DELETE RESTRICT,
        CONSTRAINT "fk_house_styles_updated_by" FOREIGN KEY ("updated_by") REFERENCES "users"("id") ON DELETE SET NULL
      )`);
    // One open round per figure: submit opens it, request-changes or approval closes it.
    await q.query(`
      CREATE TABLE "review_rounds" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "figure_id" uuid NOT NULL,
        "figure_version_id" uuid NOT NULL,
        "submitted_by" uuid NULL,
        "submitted_at" timestamptz NOT NULL DEFAULT now(),
        "editor_approved_by" uuid NULL,
        "editor_approved_at" timestamptz NULL,
        "colour_signed_off_by" uuid NULL,
        "colour_signed_off_at" timestamptz NULL,
        "closed_at" timestamptz NULL,
        "outcome" varchar(20) NULL,
        CONSTRAINT "pk_review_rounds" PRIMARY KEY ("id"),
        CONSTRAINT "fk_review_rounds_figure" FOREIGN KEY ("figure_id") REFERENCES "figures"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_review_rounds_version" FOREIGN KEY ("figure_version_id") REFERENCES "figure_versions"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_review_rounds_submitted_by" FOREIGN KEY ("submitted_by") REFERENCES "users"("id") ON DELETE SET NULL,
        CONSTRAINT "fk_review_rounds_editor" FOREIGN KEY ("editor_approved_by") REFERENCES "users"("id") ON DELETE SET NULL,
        CONSTRAINT "fk_review_rounds_colour" FOREIGN KEY ("colour_signed_off_by") REFERENCES "users"("id") ON DELETE SET NULL,
        CONSTRAINT "ck_review_rounds_outcome" CHECK ("outcome" IS NULL OR "outcome" IN ('changes_requested', 'approved'))
      )`);
    await q.query(`CREATE UNIQUE INDEX "uq_review_rounds_open" ON "review_rounds" ("figure_id") WHERE "closed_at" IS NULL`);
    await q.query(`
      CREATE TABLE "comments" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "figure_id" uuid NOT NULL,
        "figure_version_id" uuid NULL,
        "author_id" uuid NOT NULL,
        "body" text NOT NULL,
        "pin_x" double precision NULL,
        "pin_y" double precision NULL,
        "created_at" timestamptz NOT NULL DEFAULT clock_timestamp(),
        CONSTRAINT "pk_comments" PRIMARY KEY ("id"),
        CONSTRAINT "fk_comments_figure" FOREIGN KEY ("figure_id") REFERENCES "figures"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_comments_version" FOREIGN KEY ("figure_version_id") REFERENCES "figure_versions"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_comments_author" FOREIGN KEY ("author_id") REFERENCES "users"("id") ON DELETE CASCADE,
        CONSTRAINT "ck_comments_body" CHECK (char_length("body") BETWEEN 1 AND 4000),
        CONSTRAINT "ck_comments_pin" CHECK (("pin_x" IS NULL AND "pin_y" IS NULL) OR ("pin_x" BETWEEN 0 AND 1 AND "pin_y" BETWEEN 0 AND 1))
      )`);
    await q.query(`CREATE INDEX "ix_comments_figure" ON "comments" ("figure_id", "created_at")`);
    // seq orders entries written in one transaction (now() is the same for all of them).
    await q.query(`
      CREATE TABLE "audit_entries" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "seq" bigserial NOT NULL,
        "figure_id" uuid NOT NULL,
        "actor_id" uuid NULL,
        "action" varchar(30) NOT NULL,
        "from_status" varchar(20) NULL,
        "to_status" varchar(20) NULL,
        "note" text NULL,
        "at" timestamptz NOT NULL DEFAULT clock_timestamp(),
        CONSTRAINT "pk_audit_entries" PRIMARY KEY ("id"),
        CONSTRAINT "fk_audit_figure" FOREIGN KEY ("figure_id") REFERENCES "figures"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_audit_actor" FOREIGN KEY ("actor_id") REFERENCES "users"("id") ON DELETE SET NULL
      )`);
    await q.query(`CREATE INDEX "ix_audit_figure_seq" ON "audit_entries" ("figure_id", "seq")`);
    await q.query(`
      CREATE TABLE "batches" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "publication_id" uuid NOT NULL,
        "swatchbook_id" uuid NOT NULL,
        "swatchbook_version" int NOT NULL,
        "requested_by" uuid NULL,
        "created_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_batches" PRIMARY KEY ("id"),
        CONSTRAINT "fk_batches_publication" FOREIGN KEY ("publication_id") REFERENCES "publications"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_batches_swatchbook" FOREIGN KEY ("swatchbook_id") REFERENCES "swatchbooks"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_batches_requested_by" FOREIGN KEY ("requested_by") REFERENCES "users"("id") ON DELETE SET NULL
      )`);
    await q.query(`
      CREATE TABLE "batch_items" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "batch_id" uuid NOT NULL,
        "figure_id" uuid NOT NULL,
        "status" varchar(20) NOT NULL,
        "reason" text NULL,
        "job_id" uuid NULL,
        "figure_version_id" uuid NULL,
        CONSTRAINT "pk_batch_items" PRIMARY KEY ("id"),
        CONSTRAINT "fk_batch_items_batch" FOREIGN KEY ("batch_id") REFERENCES "batches"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_batch_items_figure" FOREIGN KEY ("figure_id") REFERENCES "figures"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_batch_items_job" FOREIGN KEY ("job_id") REFERENCES "jobs"("id") ON DELETE SET NULL,
        CONSTRAINT "fk_batch_items_version" FOREIGN KEY ("figure_version_id") REFERENCES "figure_versions"("id") ON DELETE SET NULL,
        CONSTRAINT "ck_batch_items_status" CHECK ("status" IN ('queued', 'skipped'))
      )`);
    await q.query(`CREATE INDEX "ix_batch_items_batch" ON "batch_items" ("batch_id")`);
  }

  async down(q: QueryRunner): Promise<void> {
    for (const t of ['batch_items', 'batches', 'audit_entries', 'comments', 'review_rounds', 'house_styles', 'swatchbook_versions', 'swatchbooks']) {
      await q.query(`DROP TABLE "${t}"`);
    }
  }
}
