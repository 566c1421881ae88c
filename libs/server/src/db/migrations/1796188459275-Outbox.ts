import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Issue "One server core" (with "Stays up and stays scoped"): the transactional outbox. Job requests and mail notices
 * are rows written with the change that causes them; the relay moves them to BullMQ. Hand-written.
 */
export class Outbox1796188459275 implements MigrationInterface {
  name = 'Outbox1796188459275';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`
      CREATE TABLE "outbox" (
        "id" uuid PRIMARY KEY DEFAULT gen_random_uuid(),
        "name" varchar(40) NOT NULL,
        "payload" jsonb NOT NULL,
        "state" varchar(12) NOT NULL DEFAULT 'pending' CHECK ("state" IN ('pending', 'relayed', 'done', 'failed')),
        "max_attempts" int NULL CHECK ("max_attempts" IS NULL OR "max_attempts" >= 1),
        "relay_attempts" int NOT NULL DEFAULT 0,
        "last_error" text NULL,
        "due_at" timestamptz NOT NULL DEFAULT now(),
        "relayed_at" timestamptz NULL,
        "done_at" timestamptz NULL,
        "created_at" timestamptz NOT NULL DEFAULT now()
      )`);
    await q.query(`CREATE INDEX "ix_outbox_state_due" ON "outbox" ("state", "due_at")`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`DROP TABLE "outbox"`);
  }
}
