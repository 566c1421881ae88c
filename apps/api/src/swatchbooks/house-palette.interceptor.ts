import { Injectable, type CallHandler, type ExecutionContext, type NestInterceptor } from '@nestjs/common';
import { from, mergeMap, type Observable } from 'rxjs';
import type { UserDto } from '@psiform/contracts';
import { SwatchbooksService } from './swatchbooks.service';

/**
 * House style on figure writes (POST /api/figures, PATCH /api/figures/:id of the figures feature): where the
 * publication pins a swatchbook without allowOverride, the recipe's palette (and background colour, unless
 * transparent) is replaced by the pinned swatchbook's before validation. Otherwise a swatchbook the recipe names
 * must belong to the figure's publication (or its publisher), or the write answers 400 naming the field. Matches FiguresController by name;
 * callers who cannot see the publication pass through untouched so the figures feature answers 404.
 */
@Injectable()
export class HousePaletteInterceptor implements NestInterceptor {
  constructor(private readonly swatchbooks: SwatchbooksService) {}

  intercept(ctx: ExecutionContext, next: CallHandler): Observable<unknown> {
    if (ctx.getType() !== 'http' || ctx.getClass().name !== 'FiguresController') return next.handle();
    const handler = ctx.getHandler().name;
    if (handler !== 'create' && handler !== 'update') return next.handle();
    const req = ctx.switchToHttp().getRequest<{ user?: UserDto; params?: { id?: string }; body?: Record<string, unknown> }>();
    const recipe = req.body?.recipe;
    if (!req.user || !recipe || typeof recipe !== 'object' || Array.isArray(recipe)) return next.handle();
    return from(this.apply(req.user, handler, req.params?.id, req.body!, recipe as Record<string, unknown>)).pipe(mergeMap(() => next.handle()));
  }

  private async apply(user: UserDto, handler: string, id: string | undefined, body: Record<string, unknown>, recipe: Record<string, unknown>): Promise<void> {
    const publicationId = handler === 'create' ? body.publicationId : id && /^[0-9a-f-]{36}$/i.test(id) ? await this.swatchbooks.figurePublication(id) : null;
    if (typeof publicationId !== 'string' || !/^[0-9a-f-]{36}$/i.test(publicationId)) return;
    if (!(await this.swatchbooks.canAccess(user, publicationId))) return;
    const pinned = await this.swatchbooks.enforcedPalette(publicationId);
    if (!pinned) {
      // No pinned palette: a recipe may still name a swatchbook, but only one of this publication (or its publisher).
      const named = (recipe.palette as { swatchbookId?: unknown } | undefined)?.swatchbookId;
      if (typeof named === 'string') await this.swatchbooks.requireUsableIn(publicationId, named);
      return;
    }
    const palette = recipe.palette && typeof recipe.palette === 'object' ? (recipe.palette as Record<string, unknown>) : {};
    recipe.palette = { ...palette, swatchbookId: pinned.swatchbookId, positive: pinned.positive, negative: pinned.negative };
    const stage = recipe.stage && typeof recipe.stage === 'object' ? (recipe.stage as Record<string, unknown>) : {};
    const bg = stage.background && typeof stage.background === 'object' ? (stage.background as Record<string, unknown>) : {};
    if (bg.transparent !== true) recipe.stage = { ...stage, background: { ...bg, color: pinned.background } };
  }
}
