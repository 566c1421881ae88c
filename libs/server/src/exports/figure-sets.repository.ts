import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository, type EntityManager } from 'typeorm';
import { FigureSetEntity } from './figure-set.entity';
import { FigureVersionEntity } from '../figures/figure-version.entity';

export interface NewFigureSet {
  publicationId: string;
  title: string;
  figureIds: string[];
  columns: number;
  caption?: string | null;
  createdBy: string;
}

/** Port for figure_sets; only TypeormFigureSetsStore touches the table. */
export abstract class FigureSetsStore {
  abstract insert(set: NewFigureSet): Promise<FigureSetEntity>;
  abstract findById(id: string): Promise<FigureSetEntity | null>;
  /** A publication's sets, newest first (at most 100). */
  abstract listForPublication(publicationId: string): Promise<FigureSetEntity[]>;
  /** The panels' figure versions in the given order (a set render job); a missing one is null. */
  abstract versions(ids: string[]): Promise<(FigureVersionEntity | null)[]>;
  /** Points the set at its newest PNG; false when the set is gone. */
  abstract setPng(setId: string, assetId: string): Promise<boolean>;
}

@Injectable()
export class TypeormFigureSetsStore implements FigureSetsStore {
  constructor(@InjectRepository(FigureSetEntity) private readonly setRows: Repository<FigureSetEntity>) {}
  /** Transactions, and the joins of reads, run on the manager of this feature's own repositories. */
  private get ds(): EntityManager { return this.setRows.manager; }

  insert(set: NewFigureSet): Promise<FigureSetEntity> {
    const repo = this.ds.getRepository(FigureSetEntity);
    return repo.save(repo.create(set));
  }

  findById(id: string): Promise<FigureSetEntity | null> {
    return this.ds.getRepository(FigureSetEntity).findOne({ where: { id } });
  }

  listForPublication(publicationId: string): Promise<FigureSetEntity[]> {
    return this.ds.getRepository(FigureSetEntity).find({ where: { publicationId }, order: { createdAt: 'DESC' }, take: 100 });
  }

  async versions(ids: string[]): Promise<(FigureVersionEntity | null)[]> {
    if (ids.length === 0) return [];
    const rows = await this.ds.getRepository(FigureVersionEntity).createQueryBuilder('v').where('v.id IN (:...ids)', { ids }).getMany();
    return ids.map((id) => rows.find((r) => r.id === id) ?? null);
  }

  async setPng(setId: string, assetId: string): Promise<boolean> {
    const res = await this.ds.getRepository(FigureSetEntity).update({ id: setId }, { pngAssetId: assetId });
    return (res.affected ?? 0) > 0;
  }
}

/** The tables this feature owns (TypeOrmModule.forFeature in its api module; the worker builds the store from them). */
export const FIGURE_SETS_ENTITIES = [FigureSetEntity];
