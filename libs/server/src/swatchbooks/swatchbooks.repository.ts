import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { In, Repository, type EntityManager } from 'typeorm';
import type { SwatchbookColorsDto, SwatchbookVersionDto } from '@psiform/contracts';
import { FigureEntity } from '../figures/figure.entity';
import { FigureVersionEntity } from '../figures/figure-version.entity';
import { JobEntity } from '../jobs/job.entity';
import { SwatchbookEntity, SwatchbookVersionEntity } from './swatchbook.entity';
import { HouseStyleEntity } from './house-style.entity';
import { BatchEntity, BatchItemEntity } from './batch.entity';
import { ConflictError } from '../common/domain-errors';
import { joinUserName, rowsWithUserName } from '../users/user-names';
import { insertAudit, insertSubjectAudit, type NewAuditEntry, type NewSubjectAuditEntry } from '../audit/audit.repository';

/** The house style's rules (what PUT sets). */
export interface HouseStyleRules {
  publicationId: string;
  swatchbookId: string;
  requireColourSignOff: boolean;
  allowOverride: boolean;
  updatedBy: string;
}

/** A pin past failing colour checks: the written reason, who gave it and what it went past. */
export interface HouseStyleOverride {
  reason: string;
  by: string;
  failures: string[];
  swatchbookVersion: number;
}

/** Audit entries written in the transaction of a house-style change or a batch (the house style, its figures). */
export interface GateAudits {
  subject?: NewSubjectAuditEntry[];
  figures?: NewAuditEntry[];
}

async function writeAudits(em: EntityManager, audits: GateAudits | undefined): Promise<void> {
  for (const a of audits?.subject ?? []) await insertSubjectAudit(em, a);
  for (const a of audits?.figures ?? []) await insertAudit(em, a);
}

export interface SwatchbookChange {
  name?: string;
  colors?: SwatchbookColorsDto;
  locked?: boolean;
}

export interface FigureWithVersion {
  figure: FigureEntity;
  version: FigureVersionEntity;
}

/** A new swatchbook and its scope: exactly one of publicationId and publisher is set. */
export interface NewSwatchbook {
  name: string;
  ownerId: string;
  colors: SwatchbookColorsDto;
  publicationId: string | null;
  publisher: string | null;
}

/** Port for swatchbooks, house styles and batches; TypeormSwatchbooksStore is the only class touching them. */
export abstract class SwatchbooksStore {
  abstract create(s: NewSwatchbook, action: 'create' | 'import'): Promise<SwatchbookEntity>;
  abstract findById(id: string): Promise<SwatchbookEntity | null>;
  /** Swatchbooks of these publications and publishers ('all': every one, for admins). */
  abstract list(scope: 'all' | { publicationIds: string[]; publishers: string[] }): Promise<SwatchbookEntity[]>;
  /**
   * Applies the change and writes the next version snapshot in one transaction, under a row lock.
   * `requireUnlocked`: 409 when the swatchbook is locked (edits; not lock/unlock themselves).
   */
  abstract change(id: string, change: SwatchbookChange, authorId: string, action: SwatchbookVersionDto['action'], requireUnlocked: boolean): Promise<SwatchbookEntity | null>;
  abstract versions(id: string): Promise<SwatchbookVersionEntity[]>;
  abstract houseStyle(publicationId: string): Promise<HouseStyleEntity | null>;
  /** The house style with the name of whoever overrode its colour checks (null when nobody did, or they are gone). */
  abstract houseStyleView(publicationId: string): Promise<{ house: HouseStyleEntity; overrideByName: string | null } | null>;
  /**
   * Sets the rules and, in the same transaction, the colour override (`undefined` keeps it, `null` clears it) and the
   * audit entries of the change.
   */
  abstract putHouseStyle(h: HouseStyleRules, opts?: { override?: HouseStyleOverride | null; audits?: GateAudits }): Promise<HouseStyleEntity>;
  abstract figuresWithCurrentVersion(publicationId: string): Promise<FigureWithVersion[]>;
  /** The batch, its items and (an override of the colour checks) its audit entries, in one transaction. */
  abstract createBatch(
    b: { publicationId: string; swatchbookId: string; swatchbookVersion: number; requestedBy: string; overrideReason: string | null },
    items: Omit<BatchItemEntity, 'id' | 'batchId'>[],
    audits?: GateAudits,
  ): Promise<BatchEntity>;
  abstract findBatch(id: string): Promise<{ batch: BatchEntity; items: { item: BatchItemEntity; title: string; versionNumber: number | null; jobState: string | null }[] } | null>;
}

@Injectable()
export class TypeormSwatchbooksStore implements SwatchbooksStore {
  constructor(
    @InjectRepository(SwatchbookEntity) private readonly bookRows: Repository<SwatchbookEntity>,
    @InjectRepository(SwatchbookVersionEntity) private readonly bookVersionRows: Repository<SwatchbookVersionEntity>,
    @InjectRepository(HouseStyleEntity) private readonly houseRows: Repository<HouseStyleEntity>,
    @InjectRepository(BatchEntity) private readonly batchRows: Repository<BatchEntity>,
    @InjectRepository(BatchItemEntity) private readonly batchItemRows: Repository<BatchItemEntity>,
  ) {}
  /** Transactions, and the joins of reads, run on the manager of this feature's own repositories. */
  private get ds(): EntityManager { return this.bookRows.manager; }

  private async snapshot(em: EntityManager, s: SwatchbookEntity, action: SwatchbookVersionDto['action'], authorId: string | null) {
    const repo = em.getRepository(SwatchbookVersionEntity);
    await repo.insert({ swatchbookId: s.id, version: s.version, name: s.name, colors: s.colors, locked: s.locked, action, authorId });
  }

  create(s: NewSwatchbook, action: 'create' | 'import') {
    return this.ds.transaction(async (em) => {
      const repo = em.getRepository(SwatchbookEntity);
      const saved = await repo.save(repo.create({ ...s, locked: false, version: 1 }));
      await this.snapshot(em, saved, action, s.ownerId);
      return saved;
    });
  }

  findById(id: string) {
    return this.ds.getRepository(SwatchbookEntity).findOne({ where: { id } });
  }

  list(scope: 'all' | { publicationIds: string[]; publishers: string[] }) {
    const order = { name: 'ASC', createdAt: 'ASC' } as const;
    const repo = this.ds.getRepository(SwatchbookEntity);
    if (scope === 'all') return repo.find({ order });
    if (!scope.publicationIds.length && !scope.publishers.length) return Promise.resolve([]);
    return repo.find({ where: [{ publicationId: In(scope.publicationIds) }, { publisher: In(scope.publishers) }], order });
  }

  change(id: string, change: SwatchbookChange, authorId: string, action: SwatchbookVersionDto['action'], requireUnlocked: boolean) {
    return this.ds.transaction(async (em) => {
      const repo = em.getRepository(SwatchbookEntity);
      const s = await repo.createQueryBuilder('s').setLock('pessimistic_write').where('s.id = :id', { id }).getOne();
      if (!s) return null;
      if (requireUnlocked && s.locked) throw new ConflictError(`swatchbook "${s.name}" is locked; unlock it before editing`);
      if (change.locked !== undefined && change.locked === s.locked) return s; // nothing to record
      Object.assign(s, change);
      s.version += 1;
      const saved = await repo.save(s);
      await this.snapshot(em, saved, action, authorId);
      return saved;
    });
  }

  versions(id: string) {
    return this.ds.getRepository(SwatchbookVersionEntity).find({ where: { swatchbookId: id }, order: { version: 'ASC' } });
  }

  houseStyle(publicationId: string) {
    return this.ds.getRepository(HouseStyleEntity).findOne({ where: { publicationId } });
  }

  async houseStyleView(publicationId: string) {
    const [first] = await rowsWithUserName(
      joinUserName(this.ds.getRepository(HouseStyleEntity).createQueryBuilder('h'), 'h.override_by').where('h.publication_id = :publicationId', { publicationId }),
    );
    return first ? { house: first.row, overrideByName: first.userName } : null;
  }

  putHouseStyle(h: HouseStyleRules, opts: { override?: HouseStyleOverride | null; audits?: GateAudits } = {}) {
    return this.ds.transaction(async (em) => {
      const repo = em.getRepository(HouseStyleEntity);
      const o = opts.override;
      const override =
        o === undefined
          ? {}
          : o === null
            ? { overrideReason: null, overrideBy: null, overrideAt: null, overrideFailures: null, overrideSwatchbookVersion: null }
            : { overrideReason: o.reason, overrideBy: o.by, overrideAt: new Date(), overrideFailures: o.failures, overrideSwatchbookVersion: o.swatchbookVersion };
      await repo.upsert({ ...h, ...override }, ['publicationId']);
      await writeAudits(em, opts.audits);
      return repo.findOneOrFail({ where: { publicationId: h.publicationId } });
    });
  }

  async figuresWithCurrentVersion(publicationId: string): Promise<FigureWithVersion[]> {
    const figures = await this.ds.getRepository(FigureEntity).find({ where: { publicationId }, order: { createdAt: 'ASC', id: 'ASC' } });
    if (figures.length === 0) return [];
    const versions = await this.ds
      .getRepository(FigureVersionEntity)
      .createQueryBuilder('v')
      .innerJoin(FigureEntity, 'f', 'f.id = v.figure_id AND f.current_version = v.number')
      .where('f.publication_id = :publicationId', { publicationId })
      .getMany();
    const byFigure = new Map(versions.map((v) => [v.figureId, v]));
    return figures.filter((f) => byFigure.has(f.id)).map((figure) => ({ figure, version: byFigure.get(figure.id)! }));
  }

  createBatch(
    b: { publicationId: string; swatchbookId: string; swatchbookVersion: number; requestedBy: string; overrideReason: string | null },
    items: Omit<BatchItemEntity, 'id' | 'batchId'>[],
    audits?: GateAudits,
  ) {
    return this.ds.transaction(async (em) => {
      const batch = await em.getRepository(BatchEntity).save(em.getRepository(BatchEntity).create(b));
      if (items.length) await em.getRepository(BatchItemEntity).insert(items.map((i) => ({ ...i, batchId: batch.id })));
      await writeAudits(em, audits);
      return batch;
    });
  }

  async findBatch(id: string) {
    const batch = await this.ds.getRepository(BatchEntity).findOne({ where: { id } });
    if (!batch) return null;
    const raw = await this.ds
      .getRepository(BatchItemEntity)
      .createQueryBuilder('i')
      .innerJoin(FigureEntity, 'f', 'f.id = i.figure_id')
      .leftJoin(FigureVersionEntity, 'v', 'v.id = i.figure_version_id')
      .leftJoin(JobEntity, 'j', 'j.id = i.job_id')
      .addSelect('f.title', 'title')
      .addSelect('v.number', 'version_number')
      .addSelect('j.state', 'job_state')
      .where('i.batch_id = :id', { id })
      .orderBy('f.created_at', 'ASC')
      .getRawAndEntities();
    return {
      batch,
      items: raw.entities.map((item, k) => ({
        item,
        title: raw.raw[k].title as string,
        versionNumber: (raw.raw[k].version_number as number | null) ?? null,
        jobState: (raw.raw[k].job_state as string | null) ?? null,
      })),
    };
  }
}

/** The tables this feature owns (TypeOrmModule.forFeature in its api module; the worker builds the store from them). */
export const SWATCHBOOKS_ENTITIES = [SwatchbookEntity, SwatchbookVersionEntity, HouseStyleEntity, BatchEntity, BatchItemEntity];
