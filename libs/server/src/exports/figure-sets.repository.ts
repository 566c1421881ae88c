import { Injectable } from '@nestjs/common';
import { DataSource } from 'typeorm';
import { FigureSetEntity } from './figure-set.entity';

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
}

@Injectable()
export class TypeormFigureSetsStore extends FigureSetsStore {
  constructor(private readonly ds: DataSource) {
    super();
  }

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
}
