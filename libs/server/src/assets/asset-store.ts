import { createHash } from 'node:crypto';
import { Inject, Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { In, Repository, type EntityManager } from 'typeorm';
import type { AssetDto, AssetKind } from '@psiform/contracts';
import { ObjectStorage } from '../infra/storage/object-storage';
import { AssetEntity } from './asset.entity';

export interface NewAsset {
  figureVersionId: string | null;
  publicationId: string;
  kind: AssetKind;
  storageKey: string;
  bytes: number;
  sha256: string;
  stats: AssetDto['stats'];
}

/**
 * Asset rows written inside another feature's transaction (a job's completion, an upload's figure): find-or-create,
 * so a re-run or re-delivered job cannot duplicate a row (uq_assets_version_kind_key). Returns the ids in order.
 * The assets feature owns the table: every asset row is written here.
 */
export async function upsertAssetsIn(em: EntityManager, assets: readonly (NewAsset & { id?: string })[]): Promise<string[]> {
  const ids: string[] = [];
  for (const a of assets) {
    await em.createQueryBuilder().insert().into(AssetEntity).values(a as never).onConflict(`ON CONSTRAINT "uq_assets_version_kind_key" DO NOTHING`).execute();
    const row = await em
      .getRepository(AssetEntity)
      .createQueryBuilder('a')
      .where('a.kind = :kind AND a.storage_key = :key', { kind: a.kind, key: a.storageKey })
      .andWhere(a.figureVersionId === null ? 'a.figure_version_id IS NULL' : 'a.figure_version_id = :v', { v: a.figureVersionId })
      .getOneOrFail();
    ids.push(row.id);
  }
  return ids;
}

export interface StoredObject {
  key: string;
  bytes: number;
  sha256: string;
  /** True when an identical object was already there and nothing was written. */
  reused: boolean;
}

/** What names a stored file for download: its figure (or figure set), the version's label, the publication's template. */
export interface AssetNameFacts {
  kind: string;
  stats: Record<string, unknown> | null;
  publicationId: string;
  publicationTitle: string;
  figureTitle: string | null;
  versionNumber: number | null;
  recipe: unknown;
  setTitle: string | null;
  /** The publication's delivery-profile file-name template; null while it has no profile (the default's applies). */
  fileNameTemplate: string | null;
}

export const sha256Hex = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

/**
 * Port for asset bytes and asset metadata reads. One implementation serves mesh jobs now and render/export
 * jobs later: storeObject is idempotent (an object already at the key with the same sha256 is reused) and
 * writes with one PutObject of the whole buffer, which S3 makes visible atomically (a killed writer leaves
 * no half-written object).
 */
export abstract class AssetStore {
  abstract storeObject(key: string, bytes: Uint8Array, contentType: string): Promise<StoredObject>;
  abstract findById(id: string): Promise<AssetEntity | null>;
  /** In the order of ids. */
  abstract findByIds(ids: string[]): Promise<AssetEntity[]>;
  abstract findForVersion(figureVersionId: string): Promise<AssetEntity[]>;
  abstract keyReferenced(key: string): Promise<boolean>;
  /** opts.disposition: the Content-Disposition the storage answers the link with (e.g. an attachment's name). */
  abstract presignGet(key: string, expiresInSeconds: number, opts?: { disposition?: string }): Promise<string>;
  /** The facts a download name is made from (one read across the rows that describe the file); null if no such asset. */
  abstract nameFacts(id: string): Promise<AssetNameFacts | null>;
}

@Injectable()
export class S3AssetStore extends AssetStore {
  constructor(
    @Inject(ObjectStorage) private readonly storage: ObjectStorage,
    @InjectRepository(AssetEntity) private readonly assets: Repository<AssetEntity>,
  ) {
    super();
  }

  async storeObject(key: string, bytes: Uint8Array, contentType: string): Promise<StoredObject> {
    const sha256 = sha256Hex(bytes);
    const head = await this.storage.head(key);
    if (head && head.bytes === bytes.byteLength && head.metadata.sha256 === sha256) return { key, bytes: bytes.byteLength, sha256, reused: true };
    await this.storage.put(key, bytes, contentType, { sha256 });
    return { key, bytes: bytes.byteLength, sha256, reused: false };
  }

  findById(id: string): Promise<AssetEntity | null> {
    return this.assets.findOne({ where: { id } });
  }

  async findByIds(ids: string[]): Promise<AssetEntity[]> {
    if (ids.length === 0) return [];
    const rows = await this.assets.find({ where: { id: In(ids) } });
    const order = new Map(ids.map((id, i) => [id, i]));
    return rows.sort((a, b) => order.get(a.id)! - order.get(b.id)!);
  }

  findForVersion(figureVersionId: string): Promise<AssetEntity[]> {
    return this.assets.find({ where: { figureVersionId }, order: { createdAt: 'ASC', kind: 'ASC' } });
  }

  keyReferenced(key: string): Promise<boolean> {
    return this.assets.exists({ where: { storageKey: key } });
  }

  presignGet(key: string, expiresInSeconds: number, opts?: { disposition?: string }): Promise<string> {
    return this.storage.presignGet(key, expiresInSeconds, opts);
  }

  async nameFacts(id: string): Promise<AssetNameFacts | null> {
    const rows = (await this.assets.query(
      `SELECT a.kind, a.stats, a.publication_id AS "publicationId", p.title AS "publicationTitle",
              f.title AS "figureTitle", v.number AS "versionNumber", v.recipe, s.title AS "setTitle",
              d.profile->>'fileNameTemplate' AS "fileNameTemplate"
         FROM assets a
         JOIN publications p ON p.id = a.publication_id
         LEFT JOIN figure_versions v ON v.id = a.figure_version_id
         LEFT JOIN figures f ON f.id = v.figure_id
         LEFT JOIN figure_sets s ON s.png_asset_id = a.id
         LEFT JOIN delivery_profiles d ON d.publication_id = a.publication_id
        WHERE a.id = $1
        LIMIT 1`,
      [id],
    )) as AssetNameFacts[];
    return rows[0] ?? null;
  }
}

/** The table this feature owns (TypeOrmModule.forFeature in its api module). */
export const ASSETS_ENTITIES = [AssetEntity];
