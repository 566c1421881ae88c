import { BadRequestException, ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import { parseRecipe, type CreateJobResponse, type FigureVersionSummaryDto, type ProofImageDto, type Recipe, type UserDto, type VersionComparisonDto } from '@psiform/contracts';
import { describeRecipeChanges, recipeChanges } from '@psiform/print';
import { AssetStore, FiguresStore, type AssetEntity, type FigureEntity, type FigureVersionEntity } from '@psiform/server';
import { FiguresService } from '../figures/figures.service';
import { JobsService } from '../jobs/jobs.service';
import { parseExportRequest } from '../exports/export-request';

type Caller = Pick<UserDto, 'id' | 'role'>;

/** The PNGs the render job writes carry an sRGB chunk (libs/print finishPng), so that is their colour mode. */
export const PNG_COLOUR_MODE = 'RGB, sRGB (IEC 61966-2-1)';

/** The newest print PNG of a version (thumbnails are not print images). */
export function proofImage(assets: AssetEntity[]): ProofImageDto | null {
  const pngs = assets
    .filter((a) => a.kind === 'png' && a.stats && !(a.stats as Record<string, unknown>).thumbnail && Number.isInteger((a.stats as Record<string, unknown>).widthPx))
    .sort((x, y) => y.createdAt.getTime() - x.createdAt.getTime());
  const a = pngs[0];
  if (!a) return null;
  const s = a.stats as Record<string, number>;
  return { assetId: a.id, kind: 'png', widthPx: s.widthPx, heightPx: s.heightPx, dpi: s.dpi, widthMm: s.widthMm, heightMm: s.heightMm, colourMode: PNG_COLOUR_MODE, createdAt: a.createdAt.toISOString() };
}

/**
 * Review that compares: a figure's versions (each with its print image, if rendered), the recipe differences
 * between any two in words, and a print-size render of any version. Members of the publication read; rendering
 * follows the export rule (admins; the publication's editors and art directors; illustrators for their own figures).
 */
@Injectable()
export class ProofsService {
  constructor(
    private readonly figures: FiguresService,
    private readonly store: FiguresStore,
    private readonly assets: AssetStore,
    private readonly jobs: JobsService,
  ) {}

  async versions(user: Caller, figureId: string): Promise<FigureVersionSummaryDto[]> {
    const figure = await this.figures.requireFigure(user, figureId);
    const out: FigureVersionSummaryDto[] = [];
    for (let n = figure.currentVersion; n >= 1; n--) {
      const v = await this.store.findVersion(figure.id, n);
      if (v) out.push(await this.summary(figure, v));
    }
    return out;
  }

  async compare(user: Caller, figureId: string, from: number, to: number): Promise<VersionComparisonDto> {
    const figure = await this.figures.requireFigure(user, figureId);
    const [a, b] = await Promise.all([this.version(figure, from, 'from'), this.version(figure, to, 'to')]);
    const changes = recipeChanges(this.recipeOf(a, 'from'), this.recipeOf(b, 'to'));
    return { figureId: figure.id, from: await this.summary(figure, a), to: await this.summary(figure, b), changes, summary: describeRecipeChanges(changes) };
  }

  /** Queues a render of the version at its own print size and dpi (the recipe's canvas). */
  async renderVersion(user: Caller, figureId: string, number: number): Promise<CreateJobResponse> {
    const figure = await this.figures.requireFigure(user, figureId);
    if (user.role === 'illustrator' && figure.ownerId !== user.id) {
      throw new ForbiddenException("only the figure's owner, the publication's editors and art directors, or an admin can render this figure");
    }
    const v = await this.version(figure, number, 'number');
    const recipe = this.recipeOf(v, 'number');
    const parsed = parseExportRequest({ format: 'png', widthMm: recipe.canvas.widthMm, heightMm: recipe.canvas.heightMm, dpi: recipe.canvas.dpi }, recipe);
    if (!parsed.ok) throw new BadRequestException(parsed.messages);
    const params = parsed.params;
    // A PNG request always parses to raster parameters; the check narrows the type for the job contract.
    if (params.format !== 'png') throw new Error(`a proof render parsed to ${params.format}`);
    const job = await this.jobs.enqueue({ type: 'render', params, publicationId: figure.publicationId, figureId: figure.id, figureVersionId: v.id, requestedBy: user.id });
    return { jobId: job.id };
  }

  private async version(figure: FigureEntity, n: number, field: string): Promise<FigureVersionEntity> {
    const v = n >= 1 && n <= figure.currentVersion ? await this.store.findVersion(figure.id, n) : null;
    if (!v) throw new NotFoundException(`${field}: figure ${figure.id} has no version ${n} (versions 1 to ${figure.currentVersion})`);
    return v;
  }

  private recipeOf(v: FigureVersionEntity, field: string): Recipe {
    const r = parseRecipe(v.recipe);
    if (!r.ok) throw new BadRequestException([`${field}: the stored recipe of version ${v.number} is not valid`]);
    return r.recipe;
  }

  private async summary(figure: FigureEntity, v: FigureVersionEntity): Promise<FigureVersionSummaryDto> {
    const [assets, authorName] = await Promise.all([this.assets.findForVersion(v.id), v.authorId ? this.store.ownerName(v.authorId) : Promise.resolve(null)]);
    return {
      id: v.id,
      number: v.number,
      current: v.number === figure.currentVersion,
      locked: v.locked,
      label: (v.recipe as { label?: string }).label ?? null,
      recipeHash: v.recipeHash,
      authorName,
      createdAt: v.createdAt.toISOString(),
      image: proofImage(assets),
    };
  }
}
