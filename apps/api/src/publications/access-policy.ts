import { Injectable } from '@nestjs/common';
import type { UserDto } from '@psiform/contracts';
import { ForbiddenError, type FigureEntity } from '@psiform/server';
import { MembershipService } from './membership.service';

type Caller = Pick<UserDto, 'id' | 'role'>;

/**
 * THE access policy of writes: every service calls it before it changes anything, so who may write what is decided in
 * one place (roles per route stay on @Roles; visibility is MembershipService's: non-members get 404).
 * Each method resolves when the caller may go ahead and throws a domain error (403 ForbiddenError, or 404 for a
 * publication the caller cannot see) otherwise. Ownership and publication scoping of further writes (figure sets,
 * swatchbooks) belong here too.
 */
@Injectable()
export class AccessPolicy {
  constructor(private readonly membership: MembershipService) {}

  /** A new figure in a publication: members of it (illustrators and admins by their routes' roles). */
  async requireFigureCreate(user: Caller, publicationId: string): Promise<void> {
    await this.membership.requireAccess(user, publicationId);
  }

  /**
   * Changing a figure (PATCH, mesh requests) the caller can already see (requireFigure: membership). Today any member
   * with an editing role may; the figure's ownership rule goes here.
   */
  async requireFigureEdit(_user: Caller, _figure: FigureEntity): Promise<void> {}

  /** Exports: admin; editors and art directors of the publication; illustrators for their OWN figures. */
  async requireFigureExport(user: Caller, figure: FigureEntity): Promise<void> {
    if (user.role === 'illustrator' && figure.ownerId !== user.id) {
      throw new ForbiddenError("only the figure's owner, the publication's editors and art directors, or an admin can export this figure");
    }
  }
}
