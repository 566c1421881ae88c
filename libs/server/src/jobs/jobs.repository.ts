import { Injectable } from '@nestjs/common';
import { DataSource } from 'typeorm';
import type { AssetKind, AssetDto } from '@psiform/contracts';
import { JobEntity, type JobType } from './job.entity';
import { AssetEntity } from '../assets/asset.entity';
import { FigureEntity } from '../figures/figure.entity';
import { FigureVersionEntity } from '../figures/figure-version.entity';

export interface NewJob {
  type: JobType;
  publicationId: string;
  figureId: string | null;
  figureVersionId: string | null;
  requestedBy: string | null;
  /** Render/export parameters (jobs.params). */
  params?: Record<string, unknown> | null;
}

export interface NewAsset {
  figureVersionId: string | null;
  publicationId: string;
  kind: AssetKind;
  storageKey: string;
  bytes: number;
  sha256: string;
  stats: AssetDto['stats'];
}

export interface JobContext {
  job: JobEntity;
  figure: FigureEntity | null;
  version: FigureVersionEntity | null;
}

/**
 * Port for Job rows (api: create/read; worker: progress, completion). TypeormJobsStore is the only class
 * touching the jobs table; it takes a DataSource so the worker can build it without the api's Nest modules.
 */
export abstract class JobsStore {
  abstract insert(job: NewJob): Promise<JobEntity>;
  abstract setBullJobId(id: string, bullJobId: string): Promise<void>;
  abstract remove(id: string): Promise<void>;
  abstract findById(id: string): Promise<JobEntity | null>;
  abstract loadContext(id: string): Promise<JobContext | null>;
  abstract markActive(id: string, attempt: number, stage: string, progress: number): Promise<void>;
  abstract setStage(id: string, stage: string, progress: number): Promise<void>;
  /** Back to queued between attempts, keeping the last error readable. */
  abstract requeue(id: string, error: string): Promise<void>;
  abstract fail(id: string, error: string): Promise<void>;
  /** One transaction: asset rows find-or-create (ON CONFLICT DO NOTHING), then the job completed. Returns asset ids. */
  abstract complete(id: string, timings: Record<string, number>, assets: NewAsset[]): Promise<string[]>;
}

@Injectable()
export class TypeormJobsStore extends JobsStore {
  constructor(private readonly ds: DataSource) {
    super();
  }

  private get jobs() {
    return this.ds.getRepository(JobEntity);
  }

  insert(job: NewJob): Promise<JobEntity> {
    return this.jobs.save(this.jobs.create({ ...job, state: 'queued', stage: 'queued', progress: 0 }));
  }

  async setBullJobId(id: string, bullJobId: string): Promise<void> {
    await this.jobs.update({ id }, { bullJobId });
  }

  async remove(id: string): Promise<void> {
    await this.jobs.delete({ id });
  }

  findById(id: string): Promise<JobEntity | null> {
    return this.jobs.findOne({ where: { id } });
  }

  async loadContext(id: string): Promise<JobContext | null> {
    const job = await this.findById(id);
    if (!job) return null;
    const figure = job.figureId ? await this.ds.getRepository(FigureEntity).findOne({ where: { id: job.figureId } }) : null;
    const version = job.figureVersionId ? await this.ds.getRepository(FigureVersionEntity).findOne({ where: { id: job.figureVersionId } }) : null;
    return { job, figure, version };
  }

  async markActive(id: string, attempt: number, stage: string, progress: number): Promise<void> {
    await this.jobs.update({ id }, { state: 'active', attempts: attempt, stage, progress, error: null });
  }

  async setStage(id: string, stage: string, progress: number): Promise<void> {
    // Never moves a finished job backwards (a late duplicate delivery cannot undo a completion).
    await this.jobs
      .createQueryBuilder()
      .update()
      .set({ stage, progress })
      .where('id = :id AND state = :state', { id, state: 'active' })
      .execute();
  }

  async requeue(id: string, error: string): Promise<void> {
    await this.jobs
      .createQueryBuilder()
      .update()
      .set({ state: 'queued', stage: 'queued', progress: 0, error })
      .where('id = :id AND state <> :done', { id, done: 'completed' })
      .execute();
  }

  async fail(id: string, error: string): Promise<void> {
    await this.jobs
      .createQueryBuilder()
      .update()
      .set({ state: 'failed', error })
      .where('id = :id AND state <> :done', { id, done: 'completed' })
      .execute();
  }

  async complete(id: string, timings: Record<string, number>, assets: NewAsset[]): Promise<string[]> {
    return this.ds.transaction(async (em) => {
      const ids: string[] = [];
      for (const a of assets) {
        await em
          .createQueryBuilder()
          .insert()
          .into(AssetEntity)
          .values(a as never)
          .onConflict(`ON CONSTRAINT "uq_assets_version_kind_key" DO NOTHING`)
          .execute();
        const row = await em
          .getRepository(AssetEntity)
          .createQueryBuilder('a')
          .where('a.kind = :kind AND a.storage_key = :key', { kind: a.kind, key: a.storageKey })
          .andWhere(a.figureVersionId === null ? 'a.figure_version_id IS NULL' : 'a.figure_version_id = :v', { v: a.figureVersionId })
          .getOneOrFail();
        ids.push(row.id);
      }
      await em.getRepository(JobEntity).update({ id }, { state: 'completed', stage: 'done', progress: 100, error: null, timings, assetIds: ids });
      return ids;
    });
  }
}
