import { BadRequestException, Injectable, NotFoundException } from '@nestjs/common';
import type { CreateJobResponse, FigureDto, FigureSummaryDto, LengthUnit, Page, Recipe, UserDto } from '@psiform/contracts';
import {
  AssetStore,
  ConflictError,
  ENGINE_VERSION,
  FiguresStore,
  isEditable,
  recipeHash,
  toAssetDto,
  toFigureVersionDto,
  withPalette,
  type FigureEntity,
  type FigureVersionEntity,
  type NewAsset,
  type NewVersion,
  type PaletteColours,
} from '@psiform/server';
import { isUUID } from 'class-validator';
import { MembershipService, guarded, scopeOf } from '../publications/membership.service';
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

/** What a write changes: a recipe (a new version when it differs), a title, or both. */
export interface VersionChange {
  recipe?: Recipe;
  title?: string;
  /** 'edit': PATCH by the figure's people; 'rerender': a batch re-render with a swatchbook's current colours. */
  reason: 'edit' | 'rerender';
  /** The version the caller saw; another write in between is a conflict (409 / skipped). */
  expectedCurrent?: number;
  /** Written to the audit entry of a re-render. */
  note?: string;
  /** Also request a mesh job for the new version, in the same transaction. */
  mesh?: boolean;
  /** A gate's override that let this write go ahead (e.g. the colour checks of a batch re-render): audited with the new version. */
  override?: { action: string; note: string };
}

export interface SavedVersion {
  figure: FigureEntity;
  version: FigureVersionEntity;
  /** false: the recipe equals the current one (idempotent), no version was added. */
  created: boolean;
  jobId?: string;
}

/** The publication's house rules applied to a recipe: its length unit, and its palette where it enforces one. */
const housed = (recipe: Recipe, pinned: PaletteColours | null, unit: LengthUnit | undefined): Recipe => {
  const r = inLengthUnit(recipe, unit);
  return pinned ? withPalette(r, pinned) : r;
};

@Injectable()
export class FiguresService {
  constructor(
    private readonly store: FiguresStore,
    private readonly membership: MembershipService,
    private readonly assets: AssetStore,
    private readonly jobs: JobsService,
  ) {}

  /**
   * THE writer of figure versions (every feature that makes one calls it: PATCH here, batch re-renders in swatchbooks,
   * uploads and POST through `saveFirst`). In ONE transaction under the figure's row lock:
   * - the edit lock: only draft and changes_requested figures change (a title PATCH racing a submit cannot rename a
   *   proof in review: the submit takes the same lock);
   * - the house palette, where the publication pins a swatchbook without allowOverride;
   * - a recipe equal to the current one (same hash, current not locked) adds no version: re-rendering with
   *   unchanged colours, or saving twice, is idempotent;
   * - the audit entries: `revise` for a new version, `rerender` for a re-render, `retitle` for a title change, and
   *   the override of a gate that let the write go ahead (`change.override`, with the new version only);
   * - the mesh job request of a re-render (outbox row), committed with the version.
   */
  async saveVersion(caller: Caller, figureId: string, change: VersionChange): Promise<SavedVersion> {
    return this.store.inFigureTransaction(figureId, async (tx) => {
      const from = tx.figure.status;
      if (change.expectedCurrent !== undefined && tx.figure.currentVersion !== change.expectedCurrent) {
        throw new ConflictError(`figure ${figureId} changed meanwhile; reload and try again`);
      }
      if (!isEditable(from)) throw new ConflictError(`cannot edit a figure that is ${from}: allowed only from draft or changes_requested`);
      let version = tx.current;
      let created = false;
      if (change.recipe) {
        const unit = (await this.membership.findPublication(tx.figure.publicationId))?.lengthUnit;
        const next = this.newVersion(housed(change.recipe, await tx.enforcedPalette(), unit), caller);
        if (next.recipeHash !== tx.current.recipeHash || tx.current.locked) {
          version = await tx.addVersion(next);
          created = true;
          const note = change.reason === 'rerender' ? (change.note ?? `version ${version.number} re-rendered`) : `version ${version.number} created`;
          await tx.audit({ actorId: caller.id, action: change.reason === 'rerender' ? 'rerender' : 'revise', fromStatus: from, toStatus: tx.figure.status, note });
          if (change.override) await tx.audit({ actorId: caller.id, action: change.override.action, fromStatus: tx.figure.status, toStatus: tx.figure.status, note: change.override.note });
        }
      }
      if (change.title !== undefined && change.title !== tx.figure.title) {
        const before = tx.figure.title;
        await tx.setTitle(change.title);
        await tx.audit({ actorId: caller.id, action: 'retitle', fromStatus: tx.figure.status, toStatus: tx.figure.status, note: `title "${before}" → "${change.title}"` });
      }
      let jobId: string | undefined;
      if (created && change.mesh) {
        const job = await tx.requestJob({ type: 'mesh', params: {}, publicationId: tx.figure.publicationId, figureId, figureVersionId: version.id, requestedBy: caller.id });
        jobId = job.id;
      }
      return { figure: tx.figure, version, created, jobId };
    });
  }

  /** Version 1 of a new figure (POST, uploads), with the house palette; an uploaded cube's asset row in the same transaction. */
  async saveFirst(caller: Caller, figure: { publicationId: string; title: string }, recipe: Recipe, asset?: Omit<NewAsset, 'figureVersionId'> & { id: string }): Promise<{ figure: FigureEntity; version: FigureVersionEntity }> {
    const unit = (await this.membership.findPublication(figure.publicationId))?.lengthUnit;
    const v = this.newVersion(housed(recipe, await this.store.enforcedPalette(figure.publicationId), unit), caller);
    const fields = { ...figure, ownerId: caller.id };
    return asset ? this.store.createWithAsset(fields, v, asset) : this.store.create(fields, v);
  }

  async create(user: Caller, body: CreateFigureBody): Promise<FigureDto> {
    await this.membership.requireAccess(user, body.publicationId);
    const recipe = validateRecipe(body.recipe);
    await this.checkSource(recipe, body.publicationId);
    const { figure, version } = await this.saveFirst(user, { publicationId: body.publicationId, title: body.title }, recipe);
    return this.toDto(figure, version);
  }

  async get(user: Caller, id: string): Promise<FigureDto> {
    const figure = await this.requireFigure(user, id);
    return this.toDto(figure, await this.currentVersion(figure));
  }

  /**
   * PATCH: a title, a recipe, or both, through saveVersion (one transaction, the edit lock, the house palette, the
   * audit entries). A recipe that differs from the current one becomes a new draft version; existing versions are
   * never modified, locked or not.
   */
  async update(user: Caller, id: string, body: UpdateFigureBody): Promise<FigureDto> {
    const figure = await this.requireFigure(user, id);
    await this.membership.authorize(user, 'figure.edit', guarded.figure(figure));
    const recipe = body.recipe === undefined ? undefined : validateRecipe(body.recipe);
    if (recipe) await this.checkSource(recipe, figure.publicationId);
    const saved = await this.saveVersion(user, figure.id, { recipe, title: body.title, reason: 'edit' });
    return this.toDto((await this.store.findById(figure.id)) ?? saved.figure, saved.version);
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
    await this.membership.authorize(user, 'figure.mesh', guarded.figure(figure));
    const version = await this.currentVersion(figure);
    const job = await this.jobs.enqueue({ type: 'mesh', params: {}, publicationId: figure.publicationId, figureId: figure.id, figureVersionId: version.id, requestedBy: user.id });
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

  /**
   * What a recipe refers to must be of the figure's publication: an upload source an uploaded cube of it with the same
   * content; a named swatchbook one of it or of its publisher (unless the house palette replaces it anyway), so no
   * other publication's palette flows into this one's figures. 400 naming the field; nothing is stored.
   */
  private async checkSource(recipe: Recipe, publicationId: string): Promise<void> {
    const named = recipe.palette.swatchbookId;
    if (named !== null && !(await this.store.enforcedPalette(publicationId))) {
      const [home, pub] = await Promise.all([isUUID(named) ? this.store.swatchbookHome(named) : null, this.membership.findPublication(publicationId)]);
      if (!home || !pub || !MembershipService.reaches(scopeOf(home), pub)) throw new BadRequestException([`recipe.palette.swatchbookId: no swatchbook ${named} in this publication`]);
    }
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
