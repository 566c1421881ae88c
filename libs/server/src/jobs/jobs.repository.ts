import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository, type EntityManager } from 'typeorm';
import type { JobItem, JobOf, TrackedJobName } from '@psiform/contracts';
import { enqueueIn } from '../outbox/outbox.repository';
import { JobEntity } from './job.entity';
import { upsertAssetsIn, type NewAsset } from '../assets/asset-store';
import { FigureEntity } from '../figures/figure.entity';
import { FigureVersionEntity } from '../figures/figure-version.entity';

interface NewJobBase {
  publicationId: string;
  figureId: string | null;
  figureVersionId: string | null;
  requestedBy: string | null;
  /** BullMQ tries (default: the job name's, JOB_OPTIONS). */
  maxAttempts?: number;
}

/** A job request: its type and the parameters the job contract declares for it (stored in jobs.params too). */
export type NewJob = { [N in TrackedJobName]: NewJobBase & { type: N; params: JobOf<N>['params'] } }[TrackedJobName];

/**
 * A Job row and its outbox row in the caller's transaction (the one enqueue path): committed together with the change
 * that asks for the job, or not at all. The relay puts it on the queue; the row's bull_job_id is the outbox row id.
 */
export async function requestJobIn(em: EntityManager, job: NewJob): Promise<JobEntity> {
  const { maxAttempts, ...fields } = job;
  const repo = em.getRepository(JobEntity);
  const row = await repo.save(repo.create({ ...fields, state: 'queued', stage: 'queued', progress: 0 }));
  const item = { name: job.type, data: { jobId: row.id, params: job.params } } as JobItem;
  row.bullJobId = await enqueueIn(em, item, { maxAttempts });
  await repo.update({ id: row.id }, { bullJobId: row.bullJobId });
  return row;
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
  /** Job row + outbox row in one transaction (requestJobIn). */
  abstract request(job: NewJob): Promise<JobEntity>;
  /** Queued rows not touched for `olderThanMs` (the sweeper checks their queue entry). */
  abstract staleQueued(olderThanMs: number, limit: number): Promise<JobEntity[]>;
  /** A queued row whose queue entry is gone gets a fresh outbox row (under its row lock); false if it moved on meanwhile. */
  abstract redriveQueued(id: string): Promise<boolean>;
  abstract findById(id: string): Promise<JobEntity | null>;
  abstract loadContext(id: string): Promise<JobContext | null>;
  abstract markActive(id: string, attempt: number, stage: string, progress: number): Promise<void>;
  abstract setStage(id: string, stage: string, progress: number): Promise<void>;
  /** Back to queued between attempts, keeping the last error readable. */
  abstract requeue(id: string, error: string): Promise<void>;
  abstract fail(id: string, error: string): Promise<void>;
  /** One transaction: asset rows find-or-create (upsertAssetsIn), then the job completed. Returns asset ids. */
  abstract complete(id: string, timings: Record<string, number>, assets: NewAsset[]): Promise<string[]>;
}

@Injectable()
export class TypeormJobsStore implements JobsStore {
  constructor(@InjectRepository(JobEntity) private readonly jobRows: Repository<JobEntity>) {}
  /** Transactions, and the joins of reads, run on the manager of this feature's own repositories. */
  private get ds(): EntityManager { return this.jobRows.manager; }

  request(job: NewJob): Promise<JobEntity> {
    return this.ds.transaction((em) => requestJobIn(em, job));
  }

  staleQueued(olderThanMs: number, limit: number): Promise<JobEntity[]> {
    return this.jobRows
      .createQueryBuilder('j')
      .where(`j.state = 'queued' AND j.updated_at <= now() - (:ms || ' milliseconds')::interval`, { ms: String(olderThanMs) })
      .orderBy('j.updated_at', 'ASC')
      .limit(limit)
      .getMany();
  }

  redriveQueued(id: string): Promise<boolean> {
    return this.ds.transaction(async (em) => {
      const row = await em.getRepository(JobEntity).createQueryBuilder('j').setLock('pessimistic_write').setOnLocked('skip_locked').where('j.id = :id', { id }).getOne();
      if (!row || row.state !== 'queued') return false;
      const params = row.params ?? {};
      const bullJobId = await enqueueIn(em, { name: row.type, data: { jobId: row.id, params } } as JobItem);
      // updated_at moves on, so the sweeper looks at this row again only after another full wait.
      await em.getRepository(JobEntity).update({ id }, { bullJobId });
      return true;
    });
  }

  findById(id: string): Promise<JobEntity | null> {
    return this.jobRows.findOne({ where: { id } });
  }

  async loadContext(id: string): Promise<JobContext | null> {
    const job = await this.findById(id);
    if (!job) return null;
    const figure = job.figureId ? await this.ds.getRepository(FigureEntity).findOne({ where: { id: job.figureId } }) : null;
    const version = job.figureVersionId ? await this.ds.getRepository(FigureVersionEntity).findOne({ where: { id: job.figureVersionId } }) : null;
    return { job, figure, version };
  }

  async markActive(id: string, attempt: number, stage: string, progress: number): Promise<void> {
    await this.jobRows.update({ id }, { state: 'active', attempts: attempt, stage, progress, error: null });
  }

  async setStage(id: string, stage: string, progress: number): Promise<void> {
    // Never moves a finished job backwards (a late duplicate delivery cannot undo a completion).
    await this.jobRows
      .createQueryBuilder()
      .update()
      .set({ stage, progress })
      .where('id = :id AND state = :state', { id, state: 'active' })
      .execute();
  }

  requeue(id: string, error: string): Promise<void> {
    return this.unlessCompleted(id, { state: 'queued', stage: 'queued', progress: 0, error });
  }

  fail(id: string, error: string): Promise<void> {
    return this.unlessCompleted(id, { state: 'failed', error });
  }

  /** A completed row is final: a late retry or failure report never changes it. */
  private async unlessCompleted(id: string, set: Partial<Pick<JobEntity, 'state' | 'stage' | 'progress' | 'error'>>): Promise<void> {
    await this.jobRows.createQueryBuilder().update().set(set).where('id = :id AND state <> :done', { id, done: 'completed' }).execute();
  }

  async complete(id: string, timings: Record<string, number>, assets: NewAsset[]): Promise<string[]> {
    return this.ds.transaction(async (em) => {
      const ids = await upsertAssetsIn(em, assets);
      await em.getRepository(JobEntity).update({ id }, { state: 'completed', stage: 'done', progress: 100, error: null, timings, assetIds: ids });
      return ids;
    });
  }
}

/** The tables this feature owns (TypeOrmModule.forFeature in its api module; the worker builds the store from them). */
export const JOBS_ENTITIES = [JobEntity];
