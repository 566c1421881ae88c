import { createHash } from 'node:crypto';
import { Injectable } from '@nestjs/common';
import { DataSource, In } from 'typeorm';
import { ObjectStorage } from '../infra/storage/object-storage';
import { AssetEntity } from './asset.entity';

export interface StoredObject {
  key: string;
  bytes: number;
  sha256: string;
  /** True when an identical object was already there and nothing was written. */
  reused: boolean;
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
}

@Injectable()
export class S3AssetStore extends AssetStore {
  constructor(
    private readonly storage: ObjectStorage,
    private readonly ds: DataSource,
  ) {
    super();
  }

  private get assets() {
    return this.ds.getRepository(AssetEntity);
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
}
