import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository, type EntityManager } from 'typeorm';
import type { FigureSortKey, FigureStatus, Recipe } from '@psiform/contracts';
import { FigureEntity } from './figure.entity';
import { FigureVersionEntity } from './figure-version.entity';
import { AssetEntity } from '../assets/asset.entity';
import { UserEntity } from '../users/user.entity';
import { requestJobIn, type NewJob } from '../jobs/jobs.repository';
import { upsertAssetsIn, type NewAsset } from '../assets/asset-store';
import type { JobEntity } from '../jobs/job.entity';
import { insertAudit, type NewAuditEntry } from '../audit/audit.repository';
import { HouseStyleEntity } from '../swatchbooks/house-style.entity';
import { SwatchbookEntity } from '../swatchbooks/swatchbook.entity';
import { NotFoundError } from '../common/domain-errors';
import type { PaletteColours } from './palette';

/** Columns the figure list can be sorted by (GET /api/figures?sort=). */

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
  sort: FigureSortKey;
  order: 'asc' | 'desc';
  offset: number;
  limit: number;
}

export interface FigureListRow {
  figure: FigureEntity;
  ownerName: string | null;
  label: string | null;
}

/**
 * What a figure write may do inside its transaction; the figure row is locked FOR UPDATE for its whole length, so a
 * concurrent submit (which takes the same lock) sees the write complete or not at all. FiguresService.saveVersion is
 * the one caller.
 */
export interface FigureWriteTx {
  readonly figure: FigureEntity;
  readonly current: FigureVersionEntity;
  /** The publication's enforced palette: a house style pinning a swatchbook without allowOverride; else null. */
  enforcedPalette(): Promise<PaletteColours | null>;
  /** Inserts version current + 1 and makes it current, status back to draft. Versions are only ever inserted. */
  addVersion(v: NewVersion): Promise<FigureVersionEntity>;
  setTitle(title: string): Promise<void>;
  audit(entry: Omit<NewAuditEntry, 'figureId'>): Promise<void>;
  /** A job request (row + outbox row) committed with this write. */
  requestJob(job: NewJob): Promise<JobEntity>;
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
  /** Runs `fn` under the figure's row lock in one transaction; NotFoundError when the figure does not exist. */
  abstract inFigureTransaction<T>(figureId: string, fn: (tx: FigureWriteTx) => Promise<T>): Promise<T>;
  /** The enforced palette of a publication (for a new figure); see FigureWriteTx.enforcedPalette. */
  abstract enforcedPalette(publicationId: string): Promise<PaletteColours | null>;
  /** Where a swatchbook a recipe names belongs (one publication, or a publisher's every publication); null if none. */
  abstract swatchbookHome(swatchbookId: string): Promise<Pick<SwatchbookEntity, 'publicationId' | 'publisher'> | null>;
  abstract list(filter: FigureListFilter): Promise<{ rows: FigureListRow[]; total: number }>;
  /** Points the figure at a thumbnail when the version is still its current one; false otherwise. */
  abstract setThumbnail(figureId: string, figureVersionId: string, assetId: string): Promise<boolean>;
}

/**
 * The figure row locked FOR UPDATE and its current version, inside the caller's transaction: the lock every figure
 * write and every review step takes, so they never interleave. NotFoundError when the figure does not exist.
 * (The figures feature owns figures and figure_versions: other features change them only through these functions.)
 */
export async function lockFigureIn(em: EntityManager, figureId: string): Promise<{ figure: FigureEntity; current: FigureVersionEntity }> {
  const figure = await em.getRepository(FigureEntity).createQueryBuilder('f').setLock('pessimistic_write').where('f.id = :id', { id: figureId }).getOne();
  if (!figure) throw new NotFoundError(`figure ${figureId} not found`);
  const current = await em.getRepository(FigureVersionEntity).findOneOrFail({ where: { figureId, number: figure.currentVersion } });
  return { figure, current };
}

/** A review step's new status (the row must be locked by lockFigureIn). */
export async function setFigureStatusIn(em: EntityManager, figure: FigureEntity, status: FigureStatus): Promise<void> {
  await em.getRepository(FigureEntity).update({ id: figure.id }, { status });
  figure.status = status;
}

/** The version becomes a proof: locked, never modified again (a trigger refuses any later update). */
export async function lockVersionIn(em: EntityManager, version: FigureVersionEntity): Promise<void> {
  await em.getRepository(FigureVersionEntity).update({ id: version.id }, { locked: true });
  version.locked = true;
}

async function enforcedPaletteIn(em: EntityManager, publicationId: string): Promise<PaletteColours | null> {
  const house = await em.getRepository(HouseStyleEntity).findOne({ where: { publicationId } });
  if (!house || house.allowOverride) return null;
  const book = await em.getRepository(SwatchbookEntity).findOne({ where: { id: house.swatchbookId } });
  if (!book) return null;
  return { swatchbookId: book.id, positive: book.colors.positive, negative: book.colors.negative, background: book.colors.background };
}

const SORT_COLUMNS: Record<FigureSortKey, string> = { updatedAt: 'f.updated_at', createdAt: 'f.created_at', title: 'f.title', status: 'f.status', versionNumber: 'f.current_version' };

@Injectable()
export class TypeormFiguresStore implements FiguresStore {
  constructor(
    @InjectRepository(FigureEntity) private readonly figureRows: Repository<FigureEntity>,
    @InjectRepository(FigureVersionEntity) private readonly versionRows: Repository<FigureVersionEntity>,
  ) {}
  /** Transactions, and the joins of reads, run on the manager of this feature's own repositories. */
  private get ds(): EntityManager { return this.figureRows.manager; }

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
      const [id] = await upsertAssetsIn(em, [{ ...asset, figureVersionId: fv.version.id }]);
      return { ...fv, asset: await em.getRepository(AssetEntity).findOneByOrFail({ id }) };
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

  inFigureTransaction<T>(figureId: string, fn: (tx: FigureWriteTx) => Promise<T>): Promise<T> {
    return this.ds.transaction(async (em) => {
      const figures = em.getRepository(FigureEntity);
      const { figure, current } = await lockFigureIn(em, figureId);
      const tx: FigureWriteTx = {
        figure,
        current,
        enforcedPalette: () => enforcedPaletteIn(em, figure.publicationId),
        addVersion: async (v) => {
          const repo = em.getRepository(FigureVersionEntity);
          const saved = await repo.save(repo.create({ ...v, figureId, number: figure.currentVersion + 1, locked: false }));
          await figures.update({ id: figureId }, { currentVersion: saved.number, status: 'draft' });
          figure.currentVersion = saved.number;
          figure.status = 'draft';
          return saved;
        },
        setTitle: async (title) => {
          await figures.update({ id: figureId }, { title });
          figure.title = title;
        },
        audit: (entry) => insertAudit(em, { ...entry, figureId }),
        requestJob: (job) => requestJobIn(em, job),
      };
      return fn(tx);
    });
  }

  enforcedPalette(publicationId: string): Promise<PaletteColours | null> {
    return enforcedPaletteIn(this.ds, publicationId);
  }

  swatchbookHome(swatchbookId: string) {
    return this.ds.getRepository(SwatchbookEntity).findOne({ where: { id: swatchbookId }, select: { id: true, publicationId: true, publisher: true } });
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

/** The tables this feature owns (TypeOrmModule.forFeature in its api module; the worker builds the store from them). */
export const FIGURES_ENTITIES = [FigureEntity, FigureVersionEntity];
