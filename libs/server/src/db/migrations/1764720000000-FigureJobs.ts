import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Issue "Figures become jobs": figures, versions, assets, jobs. Hand-written; synchronize stays off. */
export class FigureJobs1764720000000 implements MigrationInterface {
  name = 'FigureJobs1764720000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE "figures" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "publication_id" uuid NOT NULL,
        "title" varchar(200) NOT NULL,
        "owner_id" uuid NOT NULL,
        "status" varchar(20) NOT NULL DEFAULT 'draft',
        "current_version" int NOT NULL DEFAULT 1,
        "created_at" timestamptz NOT NULL DEFAULT now(),
        "updated_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_figures" PRIMARY KEY ("id"),
        CONSTRAINT "fk_figures_publication" FOREIGN KEY ("publication_id") REFERENCES "publications"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_figures_owner" FOREIGN KEY ("owner_id") REFERENCES "users"("id") ON DELETE RESTRICT,
        CONSTRAINT "ck_figures_status" CHECK ("status" IN ('draft', 'in_review', 'changes_requested', 'approved', 'released')),
        CONSTRAINT "ck_figures_title" CHECK (char_length("title") BETWEEN 1 AND 200),
        CONSTRAINT "ck_figures_current_version" CHECK ("current_version" >= 1)
      )`);
    await q.query(`CREATE INDEX "ix_figures_publication_updated" ON "figures" ("publication_id", "updated_at" DESC)`);
    await q.query(`
      CREATE TABLE "figure_versions" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "figure_id" uuid NOT NULL,
        "number" int NOT NULL,
        "recipe" jsonb NOT NULL,
        "recipe_hash" char(64) NOT NULL,
        "engine_version" varchar(80) NOT NULL,
        "author_id" uuid NOT NULL,
        "locked" boolean NOT NULL DEFAULT false,
        "created_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_figure_versions" PRIMARY KEY ("id"),
        CONSTRAINT "uq_figure_versions_number" UNIQUE ("figure_id", "number"),
        CONSTRAINT "fk_versions_figure" FOREIGN KEY ("figure_id") REFERENCES "figures"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_versions_author" FOREIGN KEY ("author_id") REFERENCES "users"("id") ON DELETE RESTRICT,
        CONSTRAINT "ck_versions_number" CHECK ("number" >= 1)
      )`);
    // A locked version (submitted for review: a proof) never changes; the service never updates versions,
    // and this trigger makes the database refuse it too.
    await q.query(`
      CREATE FUNCTION "psiform_refuse_locked_version_update"() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN
        IF OLD."locked" THEN RAISE EXCEPTION 'figure version % is locked and cannot change', OLD."id"; END IF;
        RETURN NEW;
      END $$`);
    await q.query(`
      CREATE TRIGGER "trg_figure_versions_locked" BEFORE UPDATE ON "figure_versions"
      FOR EACH ROW EXECUTE FUNCTION "psiform_refuse_locked_version_update"()`);
    // Storage keys are content-derived, so one object may serve several versions: the key alone is not
    // unique, the (version, kind, key) triple is (NULLS NOT DISTINCT, PostgreSQL 15+, so version-less
    // assets cannot repeat either).
    await q.query(`
      CREATE TABLE "assets" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "figure_version_id" uuid NULL,
        "publication_id" uuid NOT NULL,
        "kind" varchar(20) NOT NULL,
        "storage_key" varchar(500) NOT NULL,
        "bytes" bigint NOT NULL,
        "sha256" char(64) NOT NULL,
        "stats" jsonb NULL,
        "created_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_assets" PRIMARY KEY ("id"),
        CONSTRAINT "uq_assets_version_kind_key" UNIQUE NULLS NOT DISTINCT ("figure_version_id", "kind", "storage_key"),
        CONSTRAINT "fk_assets_version" FOREIGN KEY ("figure_version_id") REFERENCES "figure_versions"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_assets_publication" FOREIGN KEY ("publication_id") REFERENCES "publications"("id") ON DELETE CASCADE,
        CONSTRAINT "ck_assets_kind" CHECK ("kind" IN ('glb', 'stl', 'ply', 'obj', 'nrrd', 'png', 'svg', 'bundle')),
        CONSTRAINT "ck_assets_bytes" CHECK ("bytes" >= 0)
      )`);
    await q.query(`CREATE INDEX "ix_assets_storage_key" ON "assets" ("storage_key")`);
    await q.query(`
      CREATE TABLE "jobs" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "type" varchar(20) NOT NULL,
        "state" varchar(20) NOT NULL DEFAULT 'queued',
        "progress" int NOT NULL DEFAULT 0,
        "stage" varchar(40) NOT NULL DEFAULT 'queued',
        "error" text NULL,
        "timings" jsonb NULL,
        "figure_id" uuid NULL,
        "figure_version_id" uuid NULL,
        "publication_id" uuid NOT NULL,
        "requested_by" uuid NULL,
        "bull_job_id" varchar(100) NULL,
        "attempts" int NOT NULL DEFAULT 0,
        "asset_ids" uuid[] NOT NULL DEFAULT '{}',
        "created_at" timestamptz NOT NULL DEFAULT now(),
        "updated_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_jobs" PRIMARY KEY ("id"),
        CONSTRAINT "fk_jobs_figure" FOREIGN KEY ("figure_id") REFERENCES "figures"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_jobs_version" FOREIGN KEY ("figure_version_id") REFERENCES "figure_versions"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_jobs_publication" FOREIGN KEY ("publication_id") REFERENCES "publications"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_jobs_requested_by" FOREIGN KEY ("requested_by") REFERENCES "users"("id") ON DELETE SET NULL,
        CONSTRAINT "ck_jobs_type" CHECK ("type" IN ('mesh', 'render', 'export', 'upload_mesh')),
        CONSTRAINT "ck_jobs_state" CHECK ("state" IN ('queued', 'active', 'completed', 'failed')),
        CONSTRAINT "ck_jobs_progress" CHECK ("progress" BETWEEN 0 AND 100)
      )`);
    await q.query(`CREATE INDEX "ix_jobs_figure" ON "jobs" ("figure_id", "created_at" DESC)`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "jobs"`);
    await q.query(`DROP TABLE "assets"`);
    await q.query(`DROP TABLE "figure_versions"`);
    await q.query(`DROP FUNCTION "psiform_refuse_locked_version_update"()`);
    await q.query(`DROP TABLE "figures"`);
  }
}
