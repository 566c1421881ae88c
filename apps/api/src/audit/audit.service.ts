import { Injectable, NotFoundException } from '@nestjs/common';
import type { AuditEntryDto, UserDto } from '@psiform/contracts';
import { MembershipService } from '../publications/membership.service';
import { ReviewsStore, AuditStore, toAuditEntryDto } from '@psiform/server';

@Injectable()
export class AuditService {
  constructor(
    private readonly store: AuditStore,
    private readonly figures: ReviewsStore,
    private readonly membership: MembershipService,
  ) {}

  /** The figure's audit log in the order it was written; 404 for non-members. */
  async forFigure(user: Pick<UserDto, 'id' | 'role'>, figureId: string): Promise<AuditEntryDto[]> {
    const figure = await this.figures.findFigure(figureId);
    if (!figure || !(await this.membership.canAccess(user, figure.publicationId))) throw new NotFoundException(`figure ${figureId} not found`);
    return (await this.store.listForFigure(figureId)).map(({ entry, actorName }) => toAuditEntryDto(entry, actorName));
  }
}
