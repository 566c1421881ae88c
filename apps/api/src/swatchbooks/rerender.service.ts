import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import type { BatchDto, BatchItemDto, FigureStatus, UserDto } from '@psiform/contracts';
import { ConflictError, SwatchbooksStore, withPalette } from '@psiform/server';
import { MembershipService } from '../publications/membership.service';
import { FiguresService } from '../figures/figures.service';

type Caller = Pick<UserDto, 'id' | 'role'>;

/** Only figures still being worked on are re-rendered; proofs in review, approved and released ones stay as they are. */
export const RERENDERABLE: readonly FigureStatus[] = ['draft', 'changes_requested'];

@Injectable()
export class RerenderService {
  constructor(
    private readonly store: SwatchbooksStore,
    private readonly membership: MembershipService,
    private readonly figures: FiguresService,
  ) {}

  /**
   * For every figure of the publication that uses the pinned swatchbook and is draft or changes_requested:
   * a new draft version with the swatchbook's current colours and a mesh job for it, both through
   * FiguresService.saveVersion (one transaction under the figure's lock). Idempotent: a figure that already has the
   * swatchbook's current colours gets no new version and no job. Others are listed as skipped, with the reason.
   */
  async rerender(user: Caller, publicationId: string): Promise<BatchDto> {
    await this.membership.requireAccess(user, publicationId);
    const house = await this.store.houseStyle(publicationId);
    if (!house) throw new ConflictException('this publication has no house style: pin a swatchbook first (PUT /api/publications/:id/house-style)');
    const book = await this.store.findById(house.swatchbookId);
    if (!book) throw new ConflictException('the pinned swatchbook no longer exists');
    const items: { figureId: string; status: 'queued' | 'skipped'; reason: string | null; jobId: string | null; figureVersionId: string | null }[] = [];
    for (const { figure, version } of await this.store.figuresWithCurrentVersion(publicationId)) {
      const skip = (reason: string) => items.push({ figureId: figure.id, status: 'skipped', reason, jobId: null, figureVersionId: null });
      if (version.recipe.palette?.swatchbookId !== book.id) {
        skip('does not use the pinned swatchbook');
        continue;
      }
      if (!RERENDERABLE.includes(figure.status)) {
        skip(`status is ${figure.status}: only draft and changes_requested figures are re-rendered`);
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
        });
        if (!saved.created) skip(`already has the colours of swatchbook "${book.name}" v${book.version}`);
        else items.push({ figureId: figure.id, status: 'queued', reason: null, jobId: saved.jobId ?? null, figureVersionId: saved.version.id });
      } catch (err) {
        if (!(err instanceof ConflictError)) throw err;
        skip('changed meanwhile');
      }
    }
    const batch = await this.store.createBatch({ publicationId, swatchbookId: book.id, swatchbookVersion: book.version, requestedBy: user.id }, items);
    return this.get(user, batch.id);
  }

  async get(user: Caller, batchId: string): Promise<BatchDto> {
    const found = await this.store.findBatch(batchId);
    if (!found || !(await this.membership.canAccess(user, found.batch.publicationId))) throw new NotFoundException(`batch ${batchId} not found`);
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
      createdAt: batch.createdAt.toISOString(),
    };
  }
}
