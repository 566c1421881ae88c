import { Injectable, NotFoundException } from '@nestjs/common';
import type { Role, UserDto } from '@psiform/contracts';
import { PublicationsStore, type PublicationEntity } from '@psiform/server';

/**
 * The one place that decides who may see a publication (and, later, its figures and reviews).
 * Non-members get 404, not 403, so they cannot learn which publications exist. Admins see all.
 */
@Injectable()
export class MembershipService {
  constructor(private readonly store: PublicationsStore) {}

  async canAccess(user: Pick<UserDto, 'id' | 'role'>, publicationId: string): Promise<boolean> {
    if (user.role === 'admin') return (await this.store.findById(publicationId)) !== null;
    return this.store.isMember(publicationId, user.id);
  }

  /** Returns the publication, or throws 404 when it does not exist or the user is not a member. */
  async requireAccess(user: Pick<UserDto, 'id' | 'role'>, publicationId: string): Promise<PublicationEntity> {
    const pub = await this.store.findById(publicationId);
    if (pub && (user.role === 'admin' || (await this.store.isMember(publicationId, user.id)))) return pub;
    throw new NotFoundException(`publication ${publicationId} not found`);
  }

  /**
   * The user's role in the publication (set per membership by an admin; defaults to the user's own role), or null
   * for non-members. Admins act as admins everywhere. Notices to "the publication's editors" go by this role.
   */
  async roleIn(user: Pick<UserDto, 'id' | 'role'>, publicationId: string): Promise<Role | null> {
    if (user.role === 'admin') return 'admin';
    return this.store.memberRole(publicationId, user.id);
  }

  /** Publications visible to the user. */
  visiblePublications(user: Pick<UserDto, 'id' | 'role'>): Promise<PublicationEntity[]> {
    return user.role === 'admin' ? this.store.findAll() : this.store.findForMember(user.id);
  }
}
