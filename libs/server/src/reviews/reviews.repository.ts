import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { IsNull, Repository, type EntityManager } from 'typeorm';
import type { FigureStatus, MailNoticeJob } from '@psiform/contracts';
import { enqueueIn } from '../outbox/outbox.repository';
import { FigureEntity } from '../figures/figure.entity';
import { lockFigureIn, lockVersionIn, setFigureStatusIn } from '../figures/figures.repository';
import { FigureVersionEntity } from '../figures/figure-version.entity';
import { PublicationEntity } from '../publications/publication.entity';
import { MembershipEntity } from '../publications/membership.entity';
import { UserEntity } from '../users/user.entity';
import { joinUserName, rowsWithUserName } from '../users/user-names';
import { HouseStyleEntity } from '../swatchbooks/house-style.entity';
import { insertAudit, type NewAuditEntry } from '../audit/audit.repository';
import { ReviewRoundEntity } from './review-round.entity';
import { CommentEntity } from './comment.entity';

/** What a review step may do inside its transaction (the figure row is locked FOR UPDATE). */
export interface ReviewTx {
  readonly figure: FigureEntity;
  readonly version: FigureVersionEntity;
  openRound(): Promise<ReviewRoundEntity | null>;
  startRound(submittedBy: string): Promise<ReviewRoundEntity>;
  saveRound(round: ReviewRoundEntity): Promise<void>;
  /** The current version becomes a proof: locked, never modified again. */
  lockVersion(): Promise<void>;
  setStatus(status: FigureStatus): Promise<void>;
  audit(entry: Omit<NewAuditEntry, 'figureId'>): Promise<void>;
  /** A mail notice about this step, written to the outbox in the step's transaction: sent only if the step commits. */
  notify(notice: MailNoticeJob): Promise<void>;
  addComment(c: { figureVersionId: string | null; authorId: string; body: string; pinX: number | null; pinY: number | null }): Promise<CommentEntity>;
}

export interface HouseRules {
  swatchbookId: string;
  requireColourSignOff: boolean;
  allowOverride: boolean;
}

export interface ReviewDeskRow {
  figure: FigureEntity;
  publicationTitle: string;
  round: ReviewRoundEntity | null;
  submitterName: string | null;
  requireColourSignOff: boolean;
}

/** Port for review rounds, comments and figure status; TypeormReviewsStore is the only class touching them. */
export abstract class ReviewsStore {
  abstract findFigure(id: string): Promise<FigureEntity | null>;
  abstract findVersionById(id: string): Promise<FigureVersionEntity | null>;
  abstract inFigureTransaction<T>(figureId: string, fn: (tx: ReviewTx) => Promise<T>): Promise<T>;
  abstract houseRules(publicationId: string): Promise<HouseRules | null>;
  abstract publicationTitle(publicationId: string): Promise<string>;
  /** Emails of the active members whose role in the publication is editor. */
  abstract editorEmails(publicationId: string): Promise<string[]>;
  abstract userInfo(id: string): Promise<{ email: string; displayName: string } | null>;
  abstract listComments(figureId: string): Promise<{ comment: CommentEntity; authorName: string | null }[]>;
  /** Figures in one of `statuses` (default: in review) in the given publications, longest waiting first. */
  abstract reviewDesk(publicationIds: string[] | 'all', statuses?: FigureStatus[]): Promise<ReviewDeskRow[]>;
}

@Injectable()
export class TypeormReviewsStore implements ReviewsStore {
  constructor(
    @InjectRepository(ReviewRoundEntity) private readonly roundRows: Repository<ReviewRoundEntity>,
    @InjectRepository(CommentEntity) private readonly commentRows: Repository<CommentEntity>,
  ) {}
  /** Transactions, and the joins of reads, run on the manager of this feature's own repositories. */
  private get ds(): EntityManager { return this.roundRows.manager; }

  findFigure(id: string) {
    return this.ds.getRepository(FigureEntity).findOne({ where: { id } });
  }

  findVersionById(id: string) {
    return this.ds.getRepository(FigureVersionEntity).findOne({ where: { id } });
  }

  inFigureTransaction<T>(figureId: string, fn: (tx: ReviewTx) => Promise<T>): Promise<T> {
    return this.ds.transaction(async (em) => {
      const { figure, current } = await lockFigureIn(em, figureId);
      return fn(this.tx(em, figure, current));
    });
  }

  private tx(em: EntityManager, figure: FigureEntity, version: FigureVersionEntity): ReviewTx {
    const rounds = em.getRepository(ReviewRoundEntity);
    return {
      figure,
      version,
      openRound: () => rounds.findOne({ where: { figureId: figure.id, closedAt: IsNull() } }),
      startRound: (submittedBy) => rounds.save(rounds.create({ figureId: figure.id, figureVersionId: version.id, submittedBy, submittedAt: new Date() })),
      saveRound: async (round) => {
        await rounds.save(round);
      },
      lockVersion: () => lockVersionIn(em, version),
      setStatus: (status) => setFigureStatusIn(em, figure, status),
      audit: (entry) => insertAudit(em, { ...entry, figureId: figure.id }),
      notify: async (notice) => void (await enqueueIn(em, { name: 'notice', data: notice })),
      addComment: (c) => em.getRepository(CommentEntity).save(em.getRepository(CommentEntity).create({ ...c, figureId: figure.id })),
    };
  }

  async houseRules(publicationId: string): Promise<HouseRules | null> {
    const h = await this.ds.getRepository(HouseStyleEntity).findOne({ where: { publicationId } });
    return h ? { swatchbookId: h.swatchbookId, requireColourSignOff: h.requireColourSignOff, allowOverride: h.allowOverride } : null;
  }

  async publicationTitle(publicationId: string): Promise<string> {
    return (await this.ds.getRepository(PublicationEntity).findOne({ where: { id: publicationId } }))?.title ?? '';
  }

  async editorEmails(publicationId: string): Promise<string[]> {
    const rows = await this.ds
      .getRepository(UserEntity)
      .createQueryBuilder('u')
      .innerJoin(MembershipEntity, 'm', 'm.user_id = u.id AND m.publication_id = :publicationId', { publicationId })
      .where('m.role = :role AND u.active = true', { role: 'editor' })
      .orderBy('u.email')
      .getMany();
    return rows.map((u) => u.email);
  }

  async userInfo(id: string) {
    const u = await this.ds.getRepository(UserEntity).findOne({ where: { id } });
    return u ? { email: u.email, displayName: u.displayName } : null;
  }

  async listComments(figureId: string) {
    const rows = await rowsWithUserName(
      joinUserName(this.ds.getRepository(CommentEntity).createQueryBuilder('c'), 'c.author_id')
        .where('c.figure_id = :figureId', { figureId })
        .orderBy('c.created_at', 'ASC')
        .addOrderBy('c.id', 'ASC'),
    );
    return rows.map(({ row, userName }) => ({ comment: row, authorName: userName }));
  }

  async reviewDesk(publicationIds: string[] | 'all', statuses: FigureStatus[] = ['in_review']): Promise<ReviewDeskRow[]> {
    if (publicationIds !== 'all' && publicationIds.length === 0) return [];
    const qb = this.ds
      .getRepository(FigureEntity)
      .createQueryBuilder('f')
      .innerJoin(PublicationEntity, 'p', 'p.id = f.publication_id')
      .leftJoin(ReviewRoundEntity, 'r', 'r.figure_id = f.id AND r.closed_at IS NULL')
      .leftJoin(UserEntity, 'u', 'u.id = r.submitted_by')
      .leftJoin(HouseStyleEntity, 'h', 'h.publication_id = f.publication_id')
      .addSelect('p.title', 'publication_title')
      .addSelect('u.display_name', 'submitter_name')
      .addSelect('r.id', 'round_id')
      .addSelect('h.require_colour_signoff', 'require_signoff')
      .where('f.status IN (:...statuses)', { statuses });
    if (publicationIds !== 'all') qb.andWhere('f.publication_id IN (:...pubs)', { pubs: publicationIds });
    qb.orderBy('r.submitted_at', 'ASC', 'NULLS LAST').addOrderBy('f.updated_at', 'ASC').addOrderBy('f.id', 'ASC');
    const { entities, raw } = await qb.getRawAndEntities();
    const roundIds = raw.map((r) => r.round_id as string | null).filter((x): x is string => !!x);
    const rounds = roundIds.length ? await this.ds.getRepository(ReviewRoundEntity).createQueryBuilder('r').where('r.id IN (:...ids)', { ids: roundIds }).getMany() : [];
    const byId = new Map(rounds.map((r) => [r.id, r]));
    return entities.map((figure, i) => ({
      figure,
      publicationTitle: raw[i].publication_title as string,
      round: byId.get(raw[i].round_id as string) ?? null,
      submitterName: (raw[i].submitter_name as string | null) ?? null,
      requireColourSignOff: raw[i].require_signoff === true,
    }));
  }

}

/** The tables this feature owns (TypeOrmModule.forFeature in its api module; the worker builds the store from them). */
export const REVIEWS_ENTITIES = [ReviewRoundEntity, CommentEntity];
