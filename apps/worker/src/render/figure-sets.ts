import type { DataSource } from 'typeorm';
import { FigureVersionEntity } from '@psiform/server';

/** What a figure-set render job needs from the database; the only worker code touching figure_sets. */
export class FigureSetStore {
  constructor(private readonly ds: DataSource) {}

  /** The panels' figure versions in the given order; a missing one is null. */
  async versions(ids: string[]): Promise<(FigureVersionEntity | null)[]> {
    if (ids.length === 0) return [];
    const rows = await this.ds.getRepository(FigureVersionEntity).createQueryBuilder('v').where('v.id IN (:...ids)', { ids }).getMany();
    return ids.map((id) => rows.find((r) => r.id === id) ?? null);
  }

  /** Points the set at its newest PNG; false when the set is gone. */
  async setPng(setId: string, assetId: string): Promise<boolean> {
    const [, count] = (await this.ds.query(`UPDATE figure_sets SET png_asset_id = $1 WHERE id = $2`, [assetId, setId])) as [unknown, number];
    return count > 0;
  }
}
