import type { MigrationInterface, QueryRunner } from 'typeorm';

/** Issue "Foundation": users, publications, memberships. Hand-written; synchronize stays off. */
export class Foundation1764633600000 implements MigrationInterface {
  name = 'Foundation1764633600000';

  async up(q: QueryRunner): Promise<void> {
    // gen_random_uuid() is built into PostgreSQL 13+.
    await q.query(`
      CREATE TABLE "users" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "email" varchar(320) NOT NULL,
        "display_name" varchar(120) NOT NULL,
        "password_hash" varchar(100) NOT NULL,
        "role" varchar(20) NOT NULL,
        "created_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_users" PRIMARY KEY ("id"),
        CONSTRAINT "uq_users_email" UNIQUE ("email"),
        CONSTRAINT "ck_users_email_lower" CHECK ("email" = lower("email")),
        CONSTRAINT "ck_users_role" CHECK ("role" IN ('illustrator', 'editor', 'art_director', 'admin'))
      )`);
    await q.query(`
      CREATE TABLE "publications" (
        "id" uuid NOT NULL DEFAULT gen_random_uuid(),
        "title" varchar(300) NOT NULL,
        "publisher" varchar(200) NOT NULL,
        "kind" varchar(20) NOT NULL,
        "description" text NOT NULL DEFAULT '',
        "created_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_publications" PRIMARY KEY ("id"),
        CONSTRAINT "ck_publications_kind" CHECK ("kind" IN ('book', 'journal_volume'))
      )`);
    await q.query(`
      CREATE TABLE "publication_members" (
        "publication_id" uuid NOT NULL,
        "user_id" uuid NOT NULL,
        "created_at" timestamptz NOT NULL DEFAULT now(),
        CONSTRAINT "pk_publication_members" PRIMARY KEY ("publication_id", "user_id"),
        CONSTRAINT "fk_members_publication" FOREIGN KEY ("publication_id") REFERENCES "publications"("id") ON DELETE CASCADE,
        CONSTRAINT "fk_members_user" FOREIGN KEY ("user_id") REFERENCES "users"("id") ON DELETE CASCADE
      )`);
    await q.query(`CREATE INDEX "ix_members_user" ON "publication_members" ("user_id")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "publication_members"`);
    await q.query(`DROP TABLE "publications"`);
    await q.query(`DROP TABLE "users"`);
  }
}
