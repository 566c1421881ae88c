import { BadRequestException, ConflictException, ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import type { CommentDto, DeskState, FigureStatus, ReviewAction, ReviewDeskItemDto, ReviewTransitionDto, UserDto } from '@psiform/contracts';
import { MembershipService, guarded } from '../publications/membership.service';
import { NoticesService } from '../mail-notices/notices.service';
import { approvedNotice, changesRequestedNotice, submittedNotice, type NoticeFigure } from '../mail-notices/compose';
import { type FigureEntity, ReviewsStore, type ReviewTx, approvalOutcome, assertTransition, isEditable, TransitionConflict, type ApprovalPart, type CommentEntity } from '@psiform/server';
import { DeliveryProfilesService } from '../delivery-profiles/delivery-profiles.service';
import { decideGate, type GateDecision } from '../gates/gate';

type Caller = Pick<UserDto, 'id' | 'role'>;

interface StepResult {
  dto: ReviewTransitionDto;
  notify?: 'editors' | 'owner';
  figure: FigureEntity;
}

/**
 * The proof review: every step checks membership (404), ownership where needed (403) and the transition
 * table (409), then changes status, version lock, review round and audit log in ONE transaction; notices
 * are queued after the commit.
 */
@Injectable()
export class ReviewsService {
  constructor(
    private readonly store: ReviewsStore,
    private readonly membership: MembershipService,
    private readonly notices: NoticesService,
    private readonly preflight: DeliveryProfilesService,
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
    });
    await this.notify(r, user, 'editors');
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
    });
    await this.notify(r, user, 'owner', note);
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
    });
    if (r.dto.status === 'approved') await this.notify(r, user, 'owner', note);
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
  ): Promise<StepResult> {
    try {
      return await this.store.inFigureTransaction(id, async (tx) => {
        const from = tx.figure.status;
        assertTransition(action, from);
        const out = await fn(tx, from);
        return { figure: tx.figure, dto: { figureId: id, action, fromStatus: from, versionNumber: tx.version.number, ...out } };
      });
    } catch (err) {
      if (err instanceof TransitionConflict) throw new ConflictException(err.message);
      throw err;
    }
  }

  private async notify(r: StepResult, actor: Caller, who: 'editors' | 'owner', note?: string): Promise<void> {
    const f = r.figure;
    const [publicationTitle, by] = await Promise.all([this.store.publicationTitle(f.publicationId), this.store.userInfo(actor.id)]);
    const nf: NoticeFigure = { title: f.title, publicationTitle, versionNumber: r.dto.versionNumber, proofUrl: this.notices.proofUrl(f.id) };
    const byName = by?.displayName ?? 'Someone';
    if (who === 'editors') {
      await this.notices.send(submittedNotice(await this.store.editorEmails(f.publicationId), nf, byName));
      return;
    }
    const owner = await this.store.userInfo(f.ownerId);
    if (!owner) return;
    await this.notices.send(r.dto.status === 'approved' ? approvedNotice([owner.email], nf, byName, note) : changesRequestedNotice([owner.email], nf, byName, note ?? ''));
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

  // ---- edits made through PATCH /api/figures/:id (figures feature) -------------------------------------

  /**
   * Before a figure PATCH: 409 unless the figure is draft or changes_requested (a proof in review, an
   * approved or a released figure is not edited). Returns null when the caller cannot see the figure, so
   * the figures feature answers 404 itself.
   */
  async assertEditable(user: Caller, id: string): Promise<{ status: FigureStatus; versionNumber: number } | null> {
    const figure = await this.store.findFigure(id);
    if (!figure || !(await this.membership.canAccess(user, figure.publicationId))) return null;
    if (!isEditable(figure.status)) {
      throw new ConflictException(`cannot edit a figure that is ${figure.status}: allowed only from draft or changes_requested`);
    }
    return { status: figure.status, versionNumber: figure.currentVersion };
  }

  /** After a figure PATCH: a new version is the "revise" step (changes_requested -> draft) in the audit log. */
  async recordRevision(user: Caller, id: string, before: { status: FigureStatus; versionNumber: number }): Promise<void> {
    const figure = await this.store.findFigure(id);
    if (!figure || figure.currentVersion === before.versionNumber) return;
    await this.store.recordAudit({ figureId: id, actorId: user.id, action: 'revise', fromStatus: before.status, toStatus: figure.status, note: `version ${figure.currentVersion} created` });
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
