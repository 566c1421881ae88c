import { BadRequestException, ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import { FIGURE_SET_LIMITS, parseRecipe, TEXT_LIMITS, titleProblem, type DeliveryProfile, type ExportParams as ExportJobParams, type RenderParams, type CreateFigureSetRequest, type CreateJobResponse, type FigureSetDto, type UserDto } from '@psiform/contracts';
import { FiguresService } from '../figures/figures.service';
import { FiguresStore, FigureSetsStore, toFigureSetDto, type FigureEntity } from '@psiform/server';
import { JobsService } from '../jobs/jobs.service';
import { MembershipService, guarded, refusalOf } from '../publications/membership.service';
import { parseExportRequest } from './export-request';
import { DeliveryProfilesService } from '../delivery-profiles/delivery-profiles.service';

type Caller = Pick<UserDto, 'id' | 'role'>;

/**
 * Export requests become render jobs (png, QUEUES.render) or export jobs (svg, glb, stl, bundle, QUEUES.export)
 * for the figure's current version; the worker does the work and lists the produced assets on the job.
 * Who: admins; editors and art directors of the publication; illustrators for their own figures.
 */
@Injectable()
export class ExportsService {
  constructor(
    private readonly figures: FiguresService,
    private readonly figureStore: FiguresStore,
    private readonly jobs: JobsService,
    private readonly sets: FigureSetsStore,
    private readonly membership: MembershipService,
    private readonly deliveryProfiles: DeliveryProfilesService,
  ) {}

  async requestExport(user: Caller, figureId: string, body: unknown): Promise<CreateJobResponse> {
    const figure = await this.figures.requireFigure(user, figureId);
    await this.membership.authorize(user, 'figure.export', guarded.figure(figure));
    const version = await this.figureStore.findVersion(figure.id, figure.currentVersion);
    if (!version) throw new NotFoundException(`figure ${figureId} has no current version`);
    const recipe = parseRecipe(version.recipe);
    if (!recipe.ok) throw new BadRequestException(['recipe: the stored recipe of this figure is not valid; save the figure again']);
    const parsed = parseExportRequest(body, recipe.recipe);
    if (!parsed.ok) throw new BadRequestException(parsed.messages);
    // The worker preflights against the profile as it is now (a copy travels with the job and into the report).
    const profile = await this.deliveryProfiles.profileFor(figure.publicationId);
    const p = parsed.params;
    const on = { publicationId: figure.publicationId, figureId: figure.id, figureVersionId: version.id, requestedBy: user.id };
    // Rasters (png, tiff) are render jobs; plots, meshes and bundles export jobs (the job contract's params of each).
    const job = isRaster(p)
      ? await this.jobs.enqueue({ type: 'render', params: { ...p, profile }, ...on })
      : await this.jobs.enqueue({ type: 'export', params: withProfile(p, profile), ...on });
    return { jobId: job.id };
  }

  // ---- figure sets -------------------------------------------------------------------------------

  async createSet(user: Caller, body: CreateFigureSetRequest): Promise<FigureSetDto> {
    const problems = checkSetBody(body);
    if (problems.length) throw new BadRequestException(problems);
    await this.membership.requireAccess(user, body.publicationId);
    await this.requirePanels(user, body.figureIds, body.publicationId);
    const set = await this.sets.insert({ publicationId: body.publicationId, title: body.title.trim(), figureIds: body.figureIds, columns: body.columns, caption: body.caption?.trim() || null, createdBy: user.id });
    return toFigureSetDto(set);
  }

  /**
   * The figures of a set, each in the set's publication and each one the caller may export on its own: a set is
   * no way around the single-figure rule (an illustrator exports only their own figures).
   */
  private async requirePanels(user: Caller, figureIds: string[], publicationId: string): Promise<FigureEntity[]> {
    const out: FigureEntity[] = [];
    for (const [i, id] of figureIds.entries()) {
      const f = await this.figureStore.findById(id);
      if (!f || f.publicationId !== publicationId) throw new BadRequestException([`figureIds.${i}: no figure ${id} in this publication`]);
      const refusal = refusalOf(user, 'figure.export', guarded.figure(f));
      if (refusal) throw new ForbiddenException(`figureIds.${i}: ${refusal}`);
      out.push(f);
    }
    return out;
  }

  async getSet(user: Caller, id: string): Promise<FigureSetDto> {
    const set = await this.sets.findById(id);
    if (!set || !(await this.membership.canAccess(user, set.publicationId))) throw new NotFoundException(`figure set ${id} not found`);
    return toFigureSetDto(set);
  }

  async listSets(user: Caller, publicationId: unknown): Promise<FigureSetDto[]> {
    if (typeof publicationId !== 'string' || !UUID.test(publicationId)) throw new BadRequestException(['publicationId: must be a UUID']);
    await this.membership.requireAccess(user, publicationId);
    return (await this.sets.listForPublication(publicationId)).map(toFigureSetDto);
  }

  /** One PNG of all panels: one camera, one scale (the largest extent of the set), panels labelled a, b, c ... */
  async requestSetExport(user: Caller, id: string, body: unknown): Promise<CreateJobResponse> {
    const set = await this.sets.findById(id);
    if (!set || !(await this.membership.canAccess(user, set.publicationId))) throw new NotFoundException(`figure set ${id} not found`);
    const parsed = parseExportRequest(body, { canvas: { widthMm: 178, heightMm: 120, dpi: 300 }, source: undefined });
    if (!parsed.ok) throw new BadRequestException(parsed.messages);
    if (parsed.params.format !== 'png') throw new BadRequestException(['format: a figure set exports as png only']);
    const panels: { figureId: string; figureVersionId: string }[] = [];
    for (const f of await this.requirePanels(user, set.figureIds, set.publicationId)) {
      const v = await this.figureStore.findVersion(f.id, f.currentVersion);
      panels.push({ figureId: f.id, figureVersionId: v!.id });
    }
    const job = await this.jobs.enqueue({
      type: 'render',
      publicationId: set.publicationId,
      figureId: null,
      figureVersionId: null,
      requestedBy: user.id,
      params: { ...parsed.params, figureSetId: set.id, columns: set.columns, title: set.title, caption: set.caption ?? null, panels },
    });
    return { jobId: job.id };
  }
}

const isRaster = (p: RenderParams | ExportJobParams): p is RenderParams => p.format === 'png' || p.format === 'tiff';

/** An export job's params with the delivery profile copy (a spread of the union would lose its discriminant). */
function withProfile(p: ExportJobParams, profile: DeliveryProfile): ExportJobParams {
  return Object.assign({}, p, { profile });
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export function checkSetBody(body: Partial<CreateFigureSetRequest> | null | undefined): string[] {
  const p: string[] = [];
  const b = (body ?? {}) as Record<string, unknown>;
  for (const k of Object.keys(b)) if (!['publicationId', 'title', 'figureIds', 'columns', 'caption'].includes(k)) p.push(`${k}: is not a field of a figure set`);
  if (typeof b.publicationId !== 'string' || !UUID.test(b.publicationId)) p.push('publicationId: must be a UUID');
  const tp = titleProblem(b.title);
  if (tp) p.push(`title: ${tp}`);
  const L = FIGURE_SET_LIMITS;
  if (!Array.isArray(b.figureIds) || b.figureIds.length < L.figuresMin || b.figureIds.length > L.figuresMax) p.push(`figureIds: must list ${L.figuresMin} to ${L.figuresMax} figure ids`);
  else {
    b.figureIds.forEach((id, i) => {
      if (typeof id !== 'string' || !UUID.test(id)) p.push(`figureIds.${i}: must be a UUID`);
    });
    if (new Set(b.figureIds).size !== b.figureIds.length) p.push('figureIds: must not repeat a figure');
  }
  if (b.caption !== undefined && (typeof b.caption !== 'string' || b.caption.length > TEXT_LIMITS.captionMax)) p.push(`caption: must be a text of at most ${TEXT_LIMITS.captionMax} characters`);
  if (typeof b.columns !== 'number' || !Number.isInteger(b.columns) || b.columns < L.columnsMin || b.columns > L.columnsMax) p.push(`columns: must be an integer from ${L.columnsMin} to ${L.columnsMax}`);
  return p;
}
