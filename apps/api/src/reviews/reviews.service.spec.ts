import { BadRequestException, ConflictException, ForbiddenException, NotFoundException } from '@nestjs/common';
import type { FigureStatus, MailNoticeJob, UserDto } from '@psiform/contracts';
import { ConflictError, GateBlockedError, InvalidInputError, type AppConfig, type FigureEntity, type FigureVersionEntity, type NewAuditEntry, ReviewsStore, type HouseRules, type ReviewTx, type ReviewRoundEntity, type CommentEntity, type PublicationsStore } from '@psiform/server';
import { MembershipService } from '../publications/membership.service';
import type { DeliveryProfilesService } from '../delivery-profiles/delivery-profiles.service';
import { ReviewsService } from './reviews.service';
import { toHttpException } from '../common/http-error.filter';

const PUB = 'pub-1';
const users: Record<string, { email: string; displayName: string }> = {
  ill: { email: 'ill@x.test', displayName: 'Ilse' },
  ed: { email: 'ed@x.test', displayName: 'Tomas' },
  ad: { email: 'ad@x.test', displayName: 'Priya' },
};
const caller = (id: string, role: UserDto['role']) => ({ id, role });

/** In-memory store: one figure, its versions, rounds and audit entries. A failed step rolls back (copy on entry). */
class FakeStore extends ReviewsStore {
  figure = { id: 'f1', publicationId: PUB, title: 'Figure 1.1 1s', ownerId: 'ill', status: 'draft' as FigureStatus, currentVersion: 1 } as FigureEntity;
  version = { id: 'v1', figureId: 'f1', number: 1, locked: false } as FigureVersionEntity;
  rounds: ReviewRoundEntity[] = [];
  audit: NewAuditEntry[] = [];
  /** Notices written in committed steps (the outbox rows). */
  notices: MailNoticeJob[] = [];
  rules: HouseRules | null = null;

  async findFigure(id: string) {
    return id === this.figure.id ? this.figure : null;
  }
  async findVersionById(id: string) {
    return id === this.version.id ? this.version : null;
  }
  async inFigureTransaction<T>(_id: string, fn: (tx: ReviewTx) => Promise<T>): Promise<T> {
    const saved = { status: this.figure.status, locked: this.version.locked, rounds: this.rounds.map((r) => ({ ...r })), audit: [...this.audit], notices: [...this.notices] };
    const tx: ReviewTx = {
      figure: this.figure,
      version: this.version,
      openRound: async () => this.rounds.find((r) => !r.closedAt) ?? null,
      startRound: async (by) => {
        const r = { id: `r${this.rounds.length + 1}`, figureId: 'f1', figureVersionId: this.version.id, submittedBy: by, submittedAt: new Date(), editorApprovedBy: null, editorApprovedAt: null, colourSignedOffBy: null, colourSignedOffAt: null, closedAt: null, outcome: null } as ReviewRoundEntity;
        this.rounds.push(r);
        return r;
      },
      saveRound: async (r) => {
        this.rounds = this.rounds.map((x) => (x.id === r.id ? r : x));
      },
      lockVersion: async () => {
        this.version.locked = true;
      },
      setStatus: async (s) => {
        this.figure.status = s;
      },
      audit: async (e) => {
        this.audit.push({ ...e, figureId: 'f1' });
      },
      notify: async (m) => {
        this.notices.push(m);
      },
      addComment: async (c) => ({ id: 'c1', figureId: 'f1', createdAt: new Date(), ...c }) as CommentEntity,
    };
    try {
      return await fn(tx);
    } catch (err) {
      this.figure.status = saved.status;
      this.version.locked = saved.locked;
      this.rounds = saved.rounds;
      this.audit = saved.audit;
      this.notices.splice(saved.notices.length); // rolled back: the step's notice is not sent
      throw err;
    }
  }
  async houseRules() {
    return this.rules;
  }
  async publicationTitle() {
    return 'Shells and Lobes';
  }
  async editorEmails() {
    return ['ed@x.test'];
  }
  async userInfo(id: string) {
    return users[id] ?? null;
  }
  async listComments() {
    return [];
  }
  async reviewDesk() {
    return [];
  }
}

function setup(members = ['ill', 'ed', 'ad'], failures: string[] = []) {
  const preflight = { figureId: 'f', versionNumber: 1, reports: [], failures, blocksApproval: failures.length > 0 };
  const store = new FakeStore();
  // The real access rules over a fake membership list: every publication exists, these users belong to it.
  const membership = new MembershipService({
    findById: async (id: string) => ({ id, publisher: 'P' }),
    isMember: async (_p: string, userId: string) => members.includes(userId),
  } as unknown as PublicationsStore);
  const config = { http: { publicBaseUrl: 'https://figures.example.org' } } as Pick<AppConfig, 'http'>;
  return { store, sent: store.notices, svc: new ReviewsService(store, membership, { preflightOf: async () => preflight } as unknown as DeliveryProfilesService, config) };
}

describe('ReviewsService', () => {
  it('submit: owner only, locks the version, opens a round, audits and notifies the editors', async () => {
    const { store, sent, svc } = setup(['ill', 'ed', 'other']);
    await expect(svc.submit(caller('other', 'illustrator'), 'f1')).rejects.toThrow(ForbiddenException);
    await expect(svc.submit(caller('stranger', 'illustrator'), 'f1')).rejects.toThrow(NotFoundException);
    const r = await svc.submit(caller('ill', 'illustrator'), 'f1');
    expect(r).toMatchObject({ fromStatus: 'draft', status: 'in_review', versionNumber: 1 });
    expect(store.version.locked).toBe(true);
    expect(store.rounds).toHaveLength(1);
    expect(store.audit).toEqual([expect.objectContaining({ action: 'submit', actorId: 'ill', fromStatus: 'draft', toStatus: 'in_review' })]);
    expect(sent).toEqual([expect.objectContaining({ to: ['ed@x.test'], subject: 'Proof ready for review: "Figure 1.1 1s"' })]);
  });

  it('preflight failures block approval (409 naming them) until an override with a written reason, which is audited', async () => {
    const { store, svc } = setup(['ill', 'ed'], ['tiff figure.tif: resolution: expected at least 600 dpi (combination art); has 300 dpi']);
    await svc.submit(caller('ill', 'illustrator'), 'f1');
    const blocked = await svc.approve(caller('ed', 'editor'), 'f1').catch((e: unknown) => e);
    expect(blocked).toBeInstanceOf(GateBlockedError);
    // The one filter's answer: 409 naming the gate and each failure.
    const http = toHttpException(blocked as GateBlockedError);
    expect(http).toBeInstanceOf(ConflictException);
    expect(http.getResponse()).toMatchObject({ statusCode: 409, gate: 'preflight', overridable: true, failures: [expect.stringContaining('300 dpi')] });
    expect(store.figure.status).toBe('in_review');
    const short = await svc.approve(caller('ed', 'editor'), 'f1', undefined, { reason: 'short' }).catch((e: unknown) => e);
    expect(short).toBeInstanceOf(InvalidInputError);
    expect(toHttpException(short as InvalidInputError)).toBeInstanceOf(BadRequestException);
    const r = await svc.approve(caller('ed', 'editor'), 'f1', undefined, { reason: 'The printer accepts 300 dpi for this plate; agreed by phone.' });
    expect(r.status).toBe('approved');
    const entry = store.audit.find((a) => a.action === 'preflight_override');
    expect(entry?.note).toMatch(/^preflight overridden: The printer accepts 300 dpi .* failures: tiff figure.tif: resolution/);
    expect(entry?.actorId).toBe('ed');
  });

  it('a step not allowed from the current state is 409 and changes nothing', async () => {
    const { store, sent, svc } = setup();
    const err = await svc.approve(caller('ed', 'editor'), 'f1').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ConflictError);
    expect(toHttpException(err as ConflictError)).toEqual(new ConflictException('cannot approve a figure that is draft: allowed only from in_review'));
    expect(store.audit).toEqual([]);
    expect(sent).toEqual([]);
  });

  it('request changes closes the round and tells the owner, with the note', async () => {
    const { store, sent, svc } = setup();
    await svc.submit(caller('ill', 'illustrator'), 'f1');
    await svc.requestChanges(caller('ed', 'editor'), 'f1', 'Lighten the negative lobe');
    expect(store.figure.status).toBe('changes_requested');
    expect(store.rounds[0]).toMatchObject({ outcome: 'changes_requested' });
    expect(sent[1]).toMatchObject({ to: ['ill@x.test'], subject: 'Changes requested on "Figure 1.1 1s"' });
    expect(sent[1].text).toContain('Lighten the negative lobe');
    expect(sent[1].text).toContain('Open the proof: https://figures.example.org/figures/f1/proof');
  });

  it('with colour sign-off required: editor approval waits; the second approval is 409; sign-off completes it', async () => {
    const { store, sent, svc } = setup();
    store.rules = { swatchbookId: 's', requireColourSignOff: true, allowOverride: false };
    await svc.submit(caller('ill', 'illustrator'), 'f1');
    const first = await svc.approve(caller('ed', 'editor'), 'f1');
    expect(first).toMatchObject({ status: 'in_review', missing: ['colour_signoff'] });
    expect(store.figure.status).toBe('in_review');
    await expect(svc.approve(caller('ed', 'editor'), 'f1')).rejects.toThrow(ConflictError); // 409 through the filter
    expect(sent).toHaveLength(1); // no approval notice yet
    const done = await svc.colourSignoff(caller('ad', 'art_director'), 'f1', 'ok');
    expect(done).toMatchObject({ status: 'approved', missing: [] });
    expect(store.rounds[0]).toMatchObject({ outcome: 'approved', editorApprovedBy: 'ed', colourSignedOffBy: 'ad' });
    expect(sent[1]).toMatchObject({ to: ['ill@x.test'], subject: 'Approved: "Figure 1.1 1s"' });
    expect(store.audit.map((a) => [a.action, a.toStatus])).toEqual([
      ['submit', 'in_review'],
      ['approve', 'in_review'],
      ['colour_signoff', 'approved'],
    ]);
  });
});
