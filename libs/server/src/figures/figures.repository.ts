import { ConflictException, Injectable } from '@nestjs/common';
import { DataSource, type EntityManager } from 'typeorm';
import type { FigureStatus, Recipe } from '@psiform/contracts';
import { FigureEntity } from './figure.entity';
import { FigureVersionEntity } from './figure-version.entity';
import { AssetEntity } from '../assets/asset.entity';
import { UserEntity } from '../users/user.entity';
import type { NewAsset } from '../jobs/jobs.repository';
import { isEditable } from '../reviews/review-transitions';

/** Columns the figure list can be sorted by (GET /api/figures?sort=). */
export const FIGURE_SORTS = ['updatedAt', 'createdAt', 'title', 'status'] as const;
export type FigureSort = (typeof FIGURE_SORTS)[number];

export interface NewVersion {
  recipe: Recipe;
  recipeHash: string;
  engineVersion: string;
  authorId: string;
}

export interface FigureListFilter {
  publicationIds: string[] | 'all';
  q?: string;
  status?: FigureStatus;
  sort: FigureSort;
  order: 'asc' | 'desc';
  offset: number;
  limit: number;
}

export interface FigureListRow {
  figure: FigureEntity;
  ownerName: string | null;
  label: string | null;
}

/** Port for figures and their versions; TypeormFiguresStore is the only class touching these tables. */
export abstract class FiguresStore {
  abstract create(figure: { publicationId: string; title: string; ownerId: string }, version: NewVersion): Promise<{ figure: FigureEntity; version: FigureVersionEntity }>;
  /** Figure, version 1 whose recipe refers to the asset (id chosen by the caller), and the asset, in one transaction. */
  abstract createWithAsset(
    figure: { publicationId: string; title: string; ownerId: string },
    version: NewVersion,
    asset: Omit<NewAsset, 'figureVersionId'> & { id: string },
  ): Promise<{ figure: FigureEntity; version: FigureVersionEntity; asset: AssetEntity }>;
  abstract findById(id: string): Promise<FigureEntity | null>;
  abstract findVersion(figureId: string, number: number): Promise<FigureVersionEntity | null>;
  abstract ownerName(userId: string): Promise<string | null>;
  /** Inserts version current+1 and makes it current (status back to draft); 409 if current moved meanwhile. */
  abstract addVersion(figureId: string, expectedCurrent: number, version: NewVersion): Promise<FigureVersionEntity>;
  abstract setTitle(figureId: string, title: string): Promise<void>;
  abstract list(filter: FigureListFilter): Promise<{ rows: FigureListRow[]; total: number }>;
  /** Points the figure at a thumbnail when the version is still its current one; false otherwise. */
  abstract setThumbnail(figureId: string, figureVersionId: string, assetId: string): Promise<boolean>;
}

const SORT_COLUMNS: Record<FigureSort, string> = { updatedAt: 'f.updated_at', createdAt: 'f.created_at', title: 'f.title', status: 'f.status' };

@Injectable()
export class TypeormFiguresStore extends FiguresStore {
  constructor(private readonly ds: DataSource) {
    super();
  }

  private async insertFigure(em: EntityManager, figure: { publicationId: string; title: string; ownerId: string }, version: NewVersion) {
    const f = await em.getRepository(FigureEntity).save(em.getRepository(FigureEntity).create({ ...figure, status: 'draft', currentVersion: 1 }));
    const v = await em.getRepository(FigureVersionEntity).save(em.getRepository(FigureVersionEntity).create({ ...version, figureId: f.id, number: 1, locked: false }));
    return { figure: f, version: v };
  }

  create(figure: { publicationId: string; title: string; ownerId: string }, version: NewVersion) {
    return this.ds.transaction((em) => this.insertFigure(em, figure, version));
  }

  createWithAsset(figure: { publicationId: string; title: string; ownerId: string }, version: NewVersion, asset: Omit<NewAsset, 'figureVersionId'> & { id: string }) {
    return this.ds.transaction(async (em) => {
      const fv = await this.insertFigure(em, figure, version);
      const repo = em.getRepository(AssetEntity);
      const a = await repo.save(repo.create({ ...asset, figureVersionId: fv.version.id }));
      return { ...fv, asset: a };
    });
  }

  findById(id: string) {
    return this.ds.getRepository(FigureEntity).findOne({ where: { id } });
  }

  findVersion(figureId: string, number: number) {
    return this.ds.getRepository(FigureVersionEntity).findOne({ where: { figureId, number } });
  }

  async ownerName(userId: string): Promise<string | null> {
    return (await this.ds.getRepository(UserEntity).findOne({ where: { id: userId }, select: { id: true, displayName: true } }))?.displayName ?? null;
  }

  addVersion(figureId: string, expectedCurrent: number, version: NewVersion): Promise<FigureVersionEntity> {
    return this.ds.transaction(async (em) => {
      const figures = em.getRepository(FigureEntity);
      const f = await figures.createQueryBuilder('f').setLock('pessimistic_write').where('f.id = :id', { id: figureId }).getOne();
      if (!f || f.currentVersion !== expectedCurrent) throw new ConflictException(`figure ${figureId} changed meanwhile; reload and try again`);
      // Checked again under the row lock: a submit that commits between the edit guard and here must not be undone.
      if (!isEditable(f.status)) throw new ConflictException(`cannot edit a figure that is ${f.status}: allowed only from draft or changes_requested`);
      const repo = em.getRepository(FigureVersionEntity);
      const v = await repo.save(repo.create({ ...version, figureId, number: expectedCurrent + 1, locked: false }));
      await figures.update({ id: figureId }, { currentVersion: v.number, status: 'draft' });
      return v;
    });
  }

  async setTitle(figureId: string, title: string): Promise<void> {
    await this.ds.getRepository(FigureEntity).update({ id: figureId }, { title });
  }

  async list(filter: FigureListFilter): Promise<{ rows: FigureListRow[]; total: number }> {
    if (filter.publicationIds !== 'all' && filter.publicationIds.length === 0) return { rows: [], total: 0 };
    const qb = this.ds
      .getRepository(FigureEntity)
      .createQueryBuilder('f')
      .leftJoin(UserEntity, 'u', 'u.id = f.owner_id')
      .leftJoin(FigureVersionEntity, 'v', 'v.figure_id = f.id AND v.number = f.current_version')
      .addSelect('u.display_name', 'owner_name')
      .addSelect(`v.recipe ->> 'label'`, 'label');
    if (filter.publicationIds !== 'all') qb.andWhere('f.publication_id IN (:...pubs)', { pubs: filter.publicationIds });
    if (filter.q) qb.andWhere(`f.title ILIKE :q ESCAPE '\\'`, { q: `%${filter.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%` });
    if (filter.status) qb.andWhere('f.status = :status', { status: filter.status });
    const dir = filter.order === 'asc' ? 'ASC' : 'DESC';
    qb.orderBy(SORT_COLUMNS[filter.sort], dir).addOrderBy('f.id', dir).offset(filter.offset).limit(filter.limit);
    const [{ entities, raw }, total] = await Promise.all([qb.getRawAndEntities(), qb.getCount()]);
    const rows = entities.map((figure, i) => ({ figure, ownerName: (raw[i]?.owner_name as string | undefined) ?? null, label: (raw[i]?.label as string | undefined) ?? null }));
    return { rows, total };
  }

  async setThumbnail(figureId: string, figureVersionId: string, assetId: string): Promise<boolean> {
    const [, count] = (await this.ds.query(
      `UPDATE figures f SET thumbnail_asset_id = $1
        FROM figure_versions v
       WHERE f.id = $2 AND v.id = $3 AND v.figure_id = f.id AND v.number = f.current_version`,
      [assetId, figureId, figureVersionId],
    )) as [unknown, number];
    return count > 0;
  }
}
