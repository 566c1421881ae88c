import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Issue "the studio and every file say the same true thing": each publication chooses the one length unit of its
 * figures (Å or a0: scale bars, section-map axes, radial plots), and a figure set carries a caption printed under
 * its panels. Hand-written.
 */
export class FigureUnitsAndSetCaptions1765600000000 implements MigrationInterface {
  name = 'FigureUnitsAndSetCaptions1765600000000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "publications" ADD COLUMN "length_unit" varchar(10) NOT NULL DEFAULT 'angstrom'`);
    await q.query(`ALTER TABLE "publications" ADD CONSTRAINT "ck_publications_length_unit" CHECK ("length_unit" IN ('angstrom', 'bohr'))`);
    await q.query(`ALTER TABLE "figure_sets" ADD COLUMN "caption" text NULL`);
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "figure_sets" DROP COLUMN "caption"`);
    await q.query(`ALTER TABLE "publications" DROP CONSTRAINT "ck_publications_length_unit"`);
    await q.query(`ALTER TABLE "publications" DROP COLUMN "length_unit"`);
  }
}
