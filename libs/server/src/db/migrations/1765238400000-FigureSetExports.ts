import type { MigrationInterface, QueryRunner } from 'typeorm';

/**
 * Issue "figure sets": a set's latest exported PNG. The PNG's asset row has no figure version (it belongs to the
 * set, publication = the set's); figure_sets.png_asset_id points at it (ON DELETE SET NULL). Hand-written.
 */
export class FigureSetExports1765238400000 implements MigrationInterface {
  name = 'FigureSetExports1765238400000';

  async up(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "figure_sets" ADD COLUMN "png_asset_id" uuid NULL`);
    await q.query(
      `ALTER TABLE "figure_sets" ADD CONSTRAINT "fk_figure_sets_png" FOREIGN KEY ("png_asset_id") REFERENCES "assets"("id") ON DELETE SET NULL`,
    );
  }

  async down(q: QueryRunner): Promise<void> {
    await q.query(`ALTER TABLE "figure_sets" DROP CONSTRAINT "fk_figure_sets_png"`);
    await q.query(`ALTER TABLE "figure_sets" DROP COLUMN "png_asset_id"`);
  }
}
