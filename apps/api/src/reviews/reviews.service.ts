import { BadRequestException, ConflictException, ForbiddenException, Inject, Injectable, NotFoundException } from '@nestjs/common';
import type { CommentDto, DeskState, FigureStatus, MailNoticeJob, ReviewAction, ReviewDeskItemDto, ReviewTransitionDto, UserDto } from '@psiform/contracts';
import { MembershipService, guarded } from '../publications/membership.service';
import { approvedNotice, changesRequestedNotice, proofUrl, submittedNotice, type NoticeFigure } from '../mail-notices/compose';
import { APP_CONFIG, type AppConfig, type FigureEntity, ReviewsStore, type ReviewTx, approvalOutcome, assertTransition, TransitionConflict, type ApprovalPart, type CommentEntity } from '@psiform/server';
import { DeliveryProfilesService } from '../delivery-profiles/delivery-profiles.service';
import { decideGate, type GateDecision } from '../gates/gate';

type Caller = Pick<UserDto, 'id' | 'role'>;

interface StepResult {
  dto: ReviewTransitionDto;
  figure: FigureEntity;
}

/** Who hears of a step: the publication's editors or the figure's owner; `when` filters on the step's outcome. */
interface NoticePlan {
  actor: Caller;
  who: 'editors' | 'owner';
  note?: string;
  when?: (dto: ReviewTransitionDto) => boolean;
}

/**
 * The proof review: every step checks membership (404), ownership where needed (403) and the transition
 * table (409), then changes status, version lock, review round, audit log and its mail notice (an outbox row) in
 * ONE transaction: a notice is sent exactly when its step commits, even if Redis is down at that moment.
 */
@Injectable()
export class ReviewsService {
  constructor(
    private readonly store: ReviewsStore,
    private readonly membership: MembershipService,
    private readonly preflight: DeliveryProfilesService,
    @Inject(APP_CONFIG) private readonly config: Pick<AppConfig, 'http'>,
  ) {}

  /** The figure for members of its publication (admins: all); 404 otherwise. */
  async requireFigure(user: Caller, id: string): Promise<FigureEntity> {
    const figure = await this.store.findFigure(id);
    if (!figure || !(await this.membership.canAccess(user, figure.publicationId))) throw new NotFoundException(`figure ${id} not found`);
    return figure;
  }

  async submit(user: Caller, id: string): Promise<ReviewTransitionDto> {
    const figure = await this.requireFigure(user, id);
    await this.membership.authorize(user, 'figure.submit', guarded.figure(figure));
    const r = await this.step(id, 'submit', async (tx, from) => {
      await tx.lockVersion();
      await tx.startRound(user.id);
      await tx.setStatus('in_review');
      await tx.audit({ actorId: user.id, action: 'submit', fromStatus: from, toStatus: 'in_review', note: `version ${tx.version.number} submitted as a proof` });
      return { status: 'in_review', missing: [], message: `version ${tx.version.number} is now a proof in review` };
    }, { actor: user, who: 'editors' });
    return r.dto;
  }

  async requestChanges(user: Caller, id: string, note: string): Promise<ReviewTransitionDto> {
    await this.requireFigure(user, id);
    const r = await this.step(id, 'request_changes', async (tx, from) => {
      const round = await tx.openRound();
      if (round) {
        round.closedAt = new Date();
        round.outcome = 'changes_requested';
        await tx.saveRound(round);
      }
      await tx.setStatus('changes_requested');
      await tx.audit({ actorId: user.id, action: 'request_changes', fromStatus: from, toStatus: 'changes_requested', note });
      return { status: 'changes_requested', missing: [], message: 'changes requested; a new version (or a resubmission) goes back to review' };
    }, { actor: user, who: 'owner', note });
    return r.dto;
  }

  /**
   * Approval is gated by preflight: failures in the current version's reports block it (409 naming them) unless the
   * editor gives `override.reason`, which is audited ('preflight_override') in the same transaction.
   */
  async approve(user: Caller, id: string, note?: string, override?: unknown): Promise<ReviewTransitionDto> {
    await this.requireFigure(user, id);
    const pf = await this.preflight.preflightOf(id);
    const gate = decideGate('preflight', pf.failures, override);
    return this.approvalPart(user, id, 'approve', note, gate);
  }

  colourSignoff(user: Caller, id: string, note?: string): Promise<ReviewTransitionDto> {
    return this.approvalPart(user, id, 'colour_signoff', note);
  }

  private async approvalPart(user: Caller, id: string, action: 'approve' | 'colour_signoff', note?: string, gate?: GateDecision): Promise<ReviewTransitionDto> {
    const figure = await this.requireFigure(user, id);
    const rules = await this.store.houseRules(figure.publicationId);
    const requireColourSignOff = rules?.requireColourSignOff ?? false;
    const r = await this.step(id, action, async (tx, from) => {
      const round = (await tx.openRound()) ?? (await tx.startRound(user.id));
      const now = new Date();
      if (gate?.overridden) await tx.audit({ actorId: user.id, action: 'preflight_override', fromStatus: from, toStatus: from, note: gate.auditNote });
      if (action === 'approve') {
        if (round.editorApprovedBy) throw new TransitionConflict('an editor has already approved this proof; it is waiting for the colour sign-off');
        round.editorApprovedBy = user.id;
        round.editorApprovedAt = now;
      } else {
        if (round.colourSignedOffBy) throw new TransitionConflict("this proof's colour is already signed off; it is waiting for an editor's approval");
        round.colourSignedOffBy = user.id;
        round.colourSignedOffAt = now;
      }
      const outcome = approvalOutcome({ requireColourSignOff, editorApproved: !!round.editorApprovedBy, colourSignedOff: !!round.colourSignedOffBy });
      if (outcome.status === 'approved') {
        round.closedAt = now;
        round.outcome = 'approved';
        await tx.setStatus('approved');
      }
      await tx.saveRound(round);
      const what = action === 'approve' ? 'editor approval' : 'colour sign-off';
      await tx.audit({ actorId: user.id, action, fromStatus: from, toStatus: outcome.status, note: note ?? (outcome.missing.length ? `${what} recorded; waiting for ${describe(outcome.missing)}` : null) });
      return {
        status: outcome.status,
        missing: outcome.missing,
        message: outcome.status === 'approved' ? `version ${tx.version.number} approved` : `${what} recorded; still in review until ${describe(outcome.missing)}`,
      };
    }, { actor: user, who: 'owner', note, when: (dto) => dto.status === 'approved' });
    return r.dto;
  }

  async release(user: Caller, id: string): Promise<ReviewTransitionDto> {
    await this.requireFigure(user, id);
    const r = await this.step(id, 'release', async (tx, from) => {
      await tx.setStatus('released');
      await tx.audit({ actorId: user.id, action: 'release', fromStatus: from, toStatus: 'released', note: `version ${tx.version.number} released` });
      return { status: 'released', missing: [], message: `version ${tx.version.number} released` };
    });
    return r.dto;
  }

  /** Runs one step under the figure's row lock; the transition table is checked against the locked row. */
  private async step(
    id: string,
    action: ReviewAction,
    fn: (tx: ReviewTx, from: FigureStatus) => Promise<{ status: FigureStatus; missing: ApprovalPart[]; message: string }>,
    notice?: NoticePlan,
  ): Promise<StepResult> {
    // A TransitionConflict (a ConflictError) answers 409 through the domain-error filter.
    return this.store.inFigureTransaction(id, async (tx) => {
        const from = tx.figure.status;
        assertTransition(action, from);
        const out = await fn(tx, from);
        const dto: ReviewTransitionDto = { figureId: id, action, fromStatus: from, versionNumber: tx.version.number, ...out };
        if (notice && (notice.when?.(dto) ?? true)) {
          const mail = await this.composeNotice(tx.figure, dto, notice);
          if (mail) await tx.notify(mail);
        }
        return { figure: tx.figure, dto };
      });
  }

  /** The notice of a step (null when nobody is to hear of it). */
  private async composeNotice(f: FigureEntity, dto: ReviewTransitionDto, plan: NoticePlan): Promise<MailNoticeJob | null> {
    const [publicationTitle, by] = await Promise.all([this.store.publicationTitle(f.publicationId), this.store.userInfo(plan.actor.id)]);
    const nf: NoticeFigure = { title: f.title, publicationTitle, versionNumber: dto.versionNumber, proofUrl: proofUrl(this.config.http.publicBaseUrl, f.id) };
    const byName = by?.displayName ?? 'Someone';
    let mail: MailNoticeJob;
    if (plan.who === 'editors') mail = submittedNotice(await this.store.editorEmails(f.publicationId), nf, byName);
    else {
      const owner = await this.store.userInfo(f.ownerId);
      if (!owner) return null;
      mail = dto.status === 'approved' ? approvedNotice([owner.email], nf, byName, plan.note) : changesRequestedNotice([owner.email], nf, byName, plan.note ?? '');
    }
    return mail.to.length > 0 ? mail : null;
  }

  // ---- comments --------------------------------------------------------------------------------------

  async addComment(user: Caller, id: string, body: { body: string; versionId?: string; pin?: { x: number; y: number } }): Promise<CommentDto> {
    const figure = await this.requireFigure(user, id);
    if (body.versionId) {
      const v = await this.store.findVersionById(body.versionId);
      if (!v || v.figureId !== figure.id) throw new BadRequestException(['versionId: not a version of this figure']);
    }
    const c = await this.store.inFigureTransaction(id, async (tx) => {
      const comment = await tx.addComment({ figureVersionId: body.versionId ?? null, authorId: user.id, body: body.body, pinX: body.pin?.x ?? null, pinY: body.pin?.y ?? null });
      await tx.audit({ actorId: user.id, action: 'comment', fromStatus: tx.figure.status, toStatus: tx.figure.status, note: body.body });
      return comment;
    });
    return toCommentDto(c, (await this.store.userInfo(user.id))?.displayName ?? null);
  }

  async listComments(user: Caller, id: string): Promise<CommentDto[]> {
    await this.requireFigure(user, id);
    return (await this.store.listComments(id)).map(({ comment, authorName }) => toCommentDto(comment, authorName));
  }

  // ---- review desk -----------------------------------------------------------------------------------

  /**
   * The desk: proofs in the caller's publications in one state (in review by default), narrowed to one publication
   * (404 unless the caller may see it) and to those that have waited at least minAgeHours.
   */
  async reviewDesk(user: Caller, filter: { publicationId?: string; state?: DeskState; minAgeHours?: number } = {}, now = new Date()): Promise<ReviewDeskItemDto[]> {
    let pubs: string[] | 'all' = user.role === 'admin' ? 'all' : (await this.membership.visiblePublications(user)).map((p) => p.id);
    if (filter.publicationId) {
      await this.membership.requireAccess(user, filter.publicationId);
      pubs = [filter.publicationId];
    }
    const rows = await this.store.reviewDesk(pubs, [filter.state ?? 'in_review']);
    const items = rows.map(({ figure, publicationTitle, round, submitterName, requireColourSignOff }) => {
      const submittedAt = round?.submittedAt ?? figure.updatedAt;
      return {
        figureId: figure.id,
        title: figure.title,
        status: figure.status,
        publicationId: figure.publicationId,
        publicationTitle,
        versionNumber: figure.currentVersion,
        submittedBy: submitterName,
        submittedAt: submittedAt.toISOString(),
        ageHours: Math.round(((now.getTime() - submittedAt.getTime()) / 3_600_000) * 10) / 10,
        editorApproved: !!round?.editorApprovedBy,
        colourSignedOff: !!round?.colourSignedOffBy,
        requireColourSignOff,
      };
    });
    return filter.minAgeHours === undefined ? items : items.filter((i) => i.ageHours >= filter.minAgeHours!);
  }
}

function describe(missing: ApprovalPart[]): string {
  return missing.map((m) => (m === 'editor_approval' ? "an editor's approval" : "an art director's colour sign-off")).join(' and ');
}

function toCommentDto(c: CommentEntity, authorName: string | null): CommentDto {
  return {
    id: c.id,
    figureId: c.figureId,
    versionId: c.figureVersionId,
    authorId: c.authorId,
    authorName: authorName ?? undefined,
    body: c.body,
    pin: c.pinX === null || c.pinY === null ? null : { x: c.pinX, y: c.pinY },
    createdAt: c.createdAt.toISOString(),
  };
}
