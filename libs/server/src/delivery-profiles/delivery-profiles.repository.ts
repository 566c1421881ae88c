import type { DataSource } from 'typeorm';
import type { DeliveryProfile, PreflightReport } from '@psiform/contracts';
import { DeliveryProfileEntity } from './delivery-profile.entity';

export abstract class DeliveryProfilesStore {
  abstract find(publicationId: string): Promise<DeliveryProfileEntity | null>;
  abstract save(publicationId: string, profile: DeliveryProfile, userId: string | null): Promise<DeliveryProfileEntity>;
}

export class TypeormDeliveryProfilesStore extends DeliveryProfilesStore {
  constructor(private readonly ds: DataSource) {
    super();
  }
  find(publicationId: string): Promise<DeliveryProfileEntity | null> {
    return this.ds.getRepository(DeliveryProfileEntity).findOneBy({ publicationId });
  }
  async save(publicationId: string, profile: DeliveryProfile, userId: string | null): Promise<DeliveryProfileEntity> {
    const repo = this.ds.getRepository(DeliveryProfileEntity);
    await repo.upsert({ publicationId, profile, updatedBy: userId, updatedAt: new Date() }, ['publicationId']);
    return (await repo.findOneBy({ publicationId }))!;
  }
}

/** Preflight reports stored with the assets of a figure version (stats.preflight), newest first. */
export abstract class PreflightReportsStore {
  abstract forFigure(figureId: string): Promise<{ versionNumber: number; rows: { assetId: string; kind: string; createdAt: Date; report: PreflightReport }[] } | null>;
}

export class TypeormPreflightReportsStore extends PreflightReportsStore {
  constructor(private readonly ds: DataSource) {
    super();
  }
  async forFigure(figureId: string) {
    const rows: { id: string; kind: string; created_at: Date; preflight: PreflightReport; number: number }[] = await this.ds.query(
      `SELECT a.id, a.kind, a.created_at, a.stats->'preflight' AS preflight, v.number
         FROM figures f JOIN figure_versions v ON v.figure_id = f.id AND v.number = f.current_version
         JOIN assets a ON a.figure_version_id = v.id
        WHERE f.id = $1 AND a.stats ? 'preflight'
        ORDER BY a.created_at DESC`,
      [figureId],
    );
    const version: { number: number }[] = await this.ds.query(`SELECT current_version AS number FROM figures WHERE id = $1`, [figureId]);
    if (!version.length) return null;
    return { versionNumber: Number(version[0].number), rows: rows.map((r) => ({ assetId: r.id, kind: r.kind, createdAt: r.created_at, report: r.preflight })) };
  }
}
