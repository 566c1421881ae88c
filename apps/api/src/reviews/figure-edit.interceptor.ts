import { Injectable, type CallHandler, type ExecutionContext, type NestInterceptor } from '@nestjs/common';
import { from, mergeMap, type Observable } from 'rxjs';
import type { UserDto } from '@psiform/contracts';
import { ReviewsService } from './reviews.service';

/**
 * Hooks the review rules into PATCH /api/figures/:id (owned by the figures feature) without editing it:
 * before the handler, 409 unless the figure is draft or changes_requested; after it, a new version is
 * recorded as the "revise" step in the audit log. Matches FiguresController.update by name.
 * (TypeormFiguresStore.addVersion repeats the check under the figure row lock.)
 */
@Injectable()
export class FigureEditInterceptor implements NestInterceptor {
  constructor(private readonly reviews: ReviewsService) {}

  intercept(ctx: ExecutionContext, next: CallHandler): Observable<unknown> {
    if (ctx.getType() !== 'http' || ctx.getClass().name !== 'FiguresController' || ctx.getHandler().name !== 'update') return next.handle();
    const req = ctx.switchToHttp().getRequest<{ user?: UserDto; params?: { id?: string } }>();
    const id = req.params?.id;
    const user = req.user;
    if (!user || !id || !/^[0-9a-f-]{36}$/i.test(id)) return next.handle();
    return from(this.reviews.assertEditable(user, id)).pipe(
      mergeMap((before) =>
        next.handle().pipe(
          mergeMap(async (res) => {
            if (before) await this.reviews.recordRevision(user, id, before);
            return res;
          }),
        ),
      ),
    );
  }
}
