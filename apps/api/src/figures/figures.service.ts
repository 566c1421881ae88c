import { BadRequestException, Injectable, NotFoundException } from '@nestjs/common';
import type { CreateJobResponse, FigureDto, FigureSummaryDto, LengthUnit, Page, Recipe, UserDto } from '@psiform/contracts';
import { MembershipService, guarded } from '../publications/membership.service';
import { AssetStore, toAssetDto, ENGINE_VERSION, FiguresStore, type NewVersion, type FigureEntity, toFigureVersionDto, type FigureVersionEntity, recipeHash } from '@psiform/server';
import { LINK_TTL_SECONDS } from '../assets/assets.service';
import { JobsService } from '../jobs/jobs.service';
import type { CreateFigureBody, ListFiguresQuery, UpdateFigureBody } from './figures.dto';
import { validateRecipe } from './recipe-input';

type Caller = Pick<UserDto, 'id' | 'role'>;

/**
 * One length unit per figure, the publication's choice: every version saved states its lengths (scale bar,
 * section-map axes, radial plot) in the publication's unit.
 */
export function inLengthUnit(recipe: Recipe, unit: LengthUnit | undefined): Recipe {
  if (!unit || recipe.annotations.scaleBar.unit === unit) return recipe;
  // A fixed bar length was chosen in the old unit; the bar picks a round length in the new one instead.
  const { length: _old, ...bar } = recipe.annotations.scaleBar;
  return { ...recipe, annotations: { ...recipe.annotations, scaleBar: { ...bar, unit } } };
}

@Injectable()
export class FiguresService {
  constructor(
    private readonly store: FiguresStore,
    private readonly membership: MembershipService,
    private readonly assets: AssetStore,
    private readonly jobs: JobsService,
  ) {}

  async create(user: Caller, body: CreateFigureBody): Promise<FigureDto> {
    const publication = await this.membership.requireAccess(user, body.publicationId);
    const recipe = inLengthUnit(validateRecipe(body.recipe), publication.lengthUnit);
    await this.checkSource(recipe, body.publicationId);
    const { figure, version } = await this.store.create({ publicationId: body.publicationId, title: body.title, ownerId: user.id }, this.newVersion(recipe, user));
    return this.toDto(figure, version);
  }

  async get(user: Caller, id: string): Promise<FigureDto> {
    const figure = await this.requireFigure(user, id);
    return this.toDto(figure, await this.currentVersion(figure));
  }

  /**
   * Title changes touch the figure only. A recipe that differs from the current one becomes a new draft
   * version (number + 1) and the current one; existing versions are never modified, locked or not.
   */
  async update(user: Caller, id: string, body: UpdateFigureBody): Promise<FigureDto> {
    const figure = await this.requireFigure(user, id);
    await this.membership.authorize(user, 'figure.edit', guarded.figure(figure));
    let version = await this.currentVersion(figure);
    const recipe = body.recipe === undefined ? undefined : inLengthUnit(validateRecipe(body.recipe), (await this.membership.requireAccess(user, figure.publicationId)).lengthUnit);
    if (recipe) {
      await this.checkSource(recipe, figure.publicationId);
      const next = this.newVersion(recipe, user);
      if (next.recipeHash !== version.recipeHash || version.locked) version = await this.store.addVersion(figure.id, figure.currentVersion, next);
    }
    if (body.title !== undefined && body.title !== figure.title) await this.store.setTitle(figure.id, body.title);
    const fresh = await this.store.findById(figure.id);
    return this.toDto(fresh!, version);
  }

  async list(user: Caller, q: ListFiguresQuery): Promise<Page<FigureSummaryDto>> {
    const page = q.page ?? 1;
    const pageSize = q.pageSize ?? 20;
    let publicationIds: string[] | 'all';
    if (q.publicationId) {
      await this.membership.requireAccess(user, q.publicationId);
      publicationIds = [q.publicationId];
    } else {
      publicationIds = user.role === 'admin' ? 'all' : (await this.membership.visiblePublications(user)).map((p) => p.id);
    }
    const { rows, total } = await this.store.list({
      publicationIds,
      q: q.q?.trim() || undefined,
      status: q.status,
      sort: q.sort ?? 'updatedAt',
      order: q.order ?? 'desc',
      offset: (page - 1) * pageSize,
      limit: pageSize,
    });
    const thumbnailUrls = await this.thumbnailUrls(rows.map((r) => r.figure.thumbnailAssetId).filter((id): id is string => !!id));
    return {
      items: rows.map(({ figure: f, ownerName, label }) => ({
        id: f.id,
        publicationId: f.publicationId,
        title: f.title,
        ownerId: f.ownerId,
        ownerName: ownerName ?? undefined,
        status: f.status,
        versionNumber: f.currentVersion,
        label: label ?? undefined,
        thumbnailAssetId: f.thumbnailAssetId ?? null,
        thumbnailUrl: (f.thumbnailAssetId && thumbnailUrls.get(f.thumbnailAssetId)) || null,
        updatedAt: f.updatedAt.toISOString(),
      })),
      total,
      page,
      pageSize,
    };
  }

  /**
   * Presigned GET links for the page's thumbnails: one asset query for the page, then presigning (local signing,
   * no request per row). Same short lifetime as /api/assets/:id/link; the list is only shown to members.
   */
  private async thumbnailUrls(ids: string[]): Promise<Map<string, string>> {
    const urls = new Map<string, string>();
    if (ids.length === 0) return urls;
    for (const asset of await this.assets.findByIds([...new Set(ids)])) {
      urls.set(asset.id, await this.assets.presignGet(asset.storageKey, LINK_TTL_SECONDS));
    }
    return urls;
  }

  /** Queues a mesh job for the current version. */
  async requestMesh(user: Caller, id: string): Promise<CreateJobResponse> {
    const figure = await this.requireFigure(user, id);
    const version = await this.currentVersion(figure);
    const job = await this.jobs.enqueue('mesh', { publicationId: figure.publicationId, figureId: figure.id, figureVersionId: version.id, requestedBy: user.id });
    return { jobId: job.id };
  }

  /** The figure for members of its publication; 404 otherwise. */
  async requireFigure(user: Caller, id: string): Promise<FigureEntity> {
    const figure = await this.store.findById(id);
    if (!figure || !(await this.membership.canAccess(user, figure.publicationId))) throw new NotFoundException(`figure ${id} not found`);
    return figure;
  }

  newVersion(recipe: Recipe, user: Caller): NewVersion {
    return { recipe, recipeHash: recipeHash(recipe), engineVersion: ENGINE_VERSION, authorId: user.id };
  }

  private async currentVersion(figure: FigureEntity): Promise<FigureVersionEntity> {
    const v = await this.store.findVersion(figure.id, figure.currentVersion);
    if (!v) throw new Error(`figure ${figure.id} has no version ${figure.currentVersion}`);
    return v;
  }

  /** An upload source must name an uploaded cube of the same publication, with the same content. */
  private async checkSource(recipe: Recipe, publicationId: string): Promise<void> {
    const src = recipe.source;
    if (!src || src.kind !== 'upload') return;
    const asset = await this.assets.findById(src.assetId);
    if (!asset || asset.kind !== 'nrrd' || asset.publicationId !== publicationId) {
      throw new BadRequestException([`recipe.source.assetId: no uploaded cube ${src.assetId} in this publication`]);
    }
    if (asset.sha256 !== src.sha256) throw new BadRequestException(['recipe.source.sha256: does not match the uploaded cube']);
    const sizes = (asset.stats as { sizes?: number[] } | null)?.sizes;
    if (sizes && sizes.join('x') !== src.sizes.join('x')) throw new BadRequestException([`recipe.source.sizes: the uploaded cube is ${sizes.join('x')}`]);
  }

  async toDto(figure: FigureEntity, version: FigureVersionEntity): Promise<FigureDto> {
    const [assets, ownerName] = await Promise.all([this.assets.findForVersion(version.id), this.store.ownerName(figure.ownerId)]);
    return {
      id: figure.id,
      publicationId: figure.publicationId,
      title: figure.title,
      ownerId: figure.ownerId,
      ownerName: ownerName ?? undefined,
      status: figure.status,
      currentVersion: toFigureVersionDto(version),
      assets: assets.map(toAssetDto),
      thumbnailAssetId: figure.thumbnailAssetId ?? null,
      createdAt: figure.createdAt.toISOString(),
      updatedAt: figure.updatedAt.toISOString(),
    };
  }
}
