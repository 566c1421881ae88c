import { Injectable } from '@nestjs/common';
import { COLOUR_OVERRIDE_ACTION, type BatchDto, type BatchItemDto, type UserDto } from '@psiform/contracts';
import { ConflictError, NotFoundError, SwatchbooksStore, withPalette, type GateAudits } from '@psiform/server';
import { MembershipService } from '../publications/membership.service';
import { FiguresService } from '../figures/figures.service';
import { decideGate } from '../gates/gate';
import { colourGate, houseStyleImpact } from './house-style-impact';

type Caller = Pick<UserDto, 'id' | 'role'>;

@Injectable()
export class RerenderService {
  constructor(
    private readonly store: SwatchbooksStore,
    private readonly membership: MembershipService,
    private readonly figures: FiguresService,
  ) {}

  /**
   * For every figure of the publication that uses the pinned swatchbook, is draft or changes_requested and is not
   * already in its colours (houseStyleImpact, the rule the confirmation shows): a new draft version with the
   * swatchbook's current colours and a mesh job for it, both through FiguresService.saveVersion (one transaction
   * under the figure's lock). Idempotent: a figure that already has the colours gets no new version and no job.
   * Gated by the swatchbook's colour checks (decideGate): error-level failures answer 409 before anything is written
   * unless `override: { reason }` is given; then each new version carries a 'colour_override' audit entry, and the
   * batch keeps the reason (audited on the house style with the batch).
   */
  async rerender(user: Caller, publicationId: string, override?: unknown): Promise<BatchDto> {
    await this.membership.requireAccess(user, publicationId);
    const house = await this.store.houseStyle(publicationId);
    if (!house) throw new ConflictError('this publication has no house style: pin a swatchbook first (PUT /api/publications/:id/house-style)');
    const book = await this.store.findById(house.swatchbookId);
    if (!book) throw new ConflictError('the pinned swatchbook no longer exists');
    const gate = colourGate(book.colors);
    const decision = decideGate(gate.name, gate.failures, override);
    const overrideNote = decision.overridden ? `batch re-render with swatchbook "${book.name}" v${book.version}: ${decision.auditNote}` : undefined;
    const rows = await this.store.figuresWithCurrentVersion(publicationId);
    const impact = houseStyleImpact(rows.map(({ figure, version }) => ({ figure, recipe: version.recipe })), book, 'rerender');
    const items: { figureId: string; status: 'queued' | 'skipped'; reason: string | null; jobId: string | null; figureVersionId: string | null }[] = [];
    for (const [i, { figure, version }] of rows.entries()) {
      const skip = (reason: string) => items.push({ figureId: figure.id, status: 'skipped', reason, jobId: null, figureVersionId: null });
      if (impact[i].effect !== 'rerender') {
        skip(impact[i].reason);
        continue;
      }
      const recipe = withPalette(version.recipe, { swatchbookId: book.id, ...book.colors });
      try {
        const saved = await this.figures.saveVersion(user, figure.id, {
          recipe,
          reason: 'rerender',
          expectedCurrent: figure.currentVersion,
          note: `re-rendered with swatchbook "${book.name}" v${book.version}`,
          mesh: true,
          override: overrideNote ? { action: COLOUR_OVERRIDE_ACTION, note: overrideNote } : undefined,
        });
        if (!saved.created) skip(`already has the colours of swatchbook "${book.name}" v${book.version}`);
        else items.push({ figureId: figure.id, status: 'queued', reason: null, jobId: saved.jobId ?? null, figureVersionId: saved.version.id });
      } catch (err) {
        if (!(err instanceof ConflictError)) throw err;
        skip('changed meanwhile');
      }
    }
    const audits: GateAudits | undefined = overrideNote
      ? { subject: [{ subjectKind: 'house_style', subjectId: publicationId, actorId: user.id, action: COLOUR_OVERRIDE_ACTION, note: overrideNote }] }
      : undefined;
    const batch = await this.store.createBatch(
      { publicationId, swatchbookId: book.id, swatchbookVersion: book.version, requestedBy: user.id, overrideReason: decision.overridden ? decision.reason : null },
      items,
      audits,
    );
    return this.get(user, batch.id);
  }

  async get(user: Caller, batchId: string): Promise<BatchDto> {
    const found = await this.store.findBatch(batchId);
    if (!found || !(await this.membership.canAccess(user, found.batch.publicationId))) throw new NotFoundError(`batch ${batchId} not found`);
    const { batch, items } = found;
    const jobs: BatchItemDto[] = [];
    const skipped: BatchItemDto[] = [];
    for (const { item, title, versionNumber, jobState } of items) {
      if (item.status === 'skipped') skipped.push({ figureId: item.figureId, title, status: 'skipped', reason: item.reason ?? undefined });
      else jobs.push({ figureId: item.figureId, title, status: 'queued', jobId: item.jobId ?? undefined, versionNumber: versionNumber ?? undefined, jobState: jobState ?? 'unknown' });
    }
    const completed = jobs.filter((j) => j.jobState === 'completed').length;
    const failed = jobs.filter((j) => j.jobState === 'failed').length;
    const state: BatchDto['state'] = completed + failed < jobs.length ? 'running' : failed > 0 ? 'failed' : 'completed';
    return {
      batchId: batch.id,
      publicationId: batch.publicationId,
      swatchbookId: batch.swatchbookId,
      swatchbookVersion: batch.swatchbookVersion,
      total: jobs.length,
      completed,
      failed,
      state,
      jobs,
      skipped,
      overrideReason: batch.overrideReason,
      createdAt: batch.createdAt.toISOString(),
    };
  }
}
