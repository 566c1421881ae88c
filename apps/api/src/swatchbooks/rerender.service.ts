import { ConflictException, Injectable, NotFoundException } from '@nestjs/common';
import type { BatchDto, BatchItemDto, FigureStatus, Recipe, UserDto } from '@psiform/contracts';
import { MembershipService } from '../publications/membership.service';
import { JobsService } from '../jobs/jobs.service';
import { ENGINE_VERSION, SwatchbooksStore, recipeHash } from '@psiform/server';
import type { SwatchbookColorsDto } from '@psiform/contracts';

type Caller = Pick<UserDto, 'id' | 'role'>;

/** Only figures still being worked on are re-rendered; proofs in review, approved and released ones stay as they are. */
export const RERENDERABLE: readonly FigureStatus[] = ['draft', 'changes_requested'];

/** The recipe with the swatchbook's colours copied in (phases, and the background unless transparent). */
export function withPalette(recipe: Recipe, swatchbookId: string, colors: SwatchbookColorsDto): Recipe {
  return {
    ...recipe,
    palette: { ...recipe.palette, swatchbookId, positive: colors.positive, negative: colors.negative },
    stage: { ...recipe.stage, background: recipe.stage.background.transparent ? recipe.stage.background : { ...recipe.stage.background, color: colors.background } },
  };
}

@Injectable()
export class RerenderService {
  constructor(
    private readonly store: SwatchbooksStore,
    private readonly membership: MembershipService,
    private readonly jobs: JobsService,
  ) {}

  /**
   * For every figure of the publication that uses the pinned swatchbook and is draft or changes_requested:
   * a new draft version with the swatchbook's current colours, and a mesh job for it. Others are listed as skipped.
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
      const recipe = withPalette(version.recipe, book.id, book.colors);
      const v = await this.store.addRerenderVersion(figure.id, figure.currentVersion, RERENDERABLE, {
        recipe,
        recipeHash: recipeHash(recipe),
        engineVersion: ENGINE_VERSION,
        authorId: user.id,
        auditNote: `re-rendered with swatchbook "${book.name}" v${book.version}`,
      });
      if (!v) {
        skip('changed meanwhile');
        continue;
      }
      try {
        const job = await this.jobs.enqueue({ type: 'mesh', params: {}, publicationId, figureId: figure.id, figureVersionId: v.id, requestedBy: user.id });
        items.push({ figureId: figure.id, status: 'queued', reason: null, jobId: job.id, figureVersionId: v.id });
      } catch (err) {
        // The new version stays (it is the figure's current draft); its mesh can be queued again later.
        skip(`version ${v.number} created but its mesh job was not queued: ${(err as Error).message}`);
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
