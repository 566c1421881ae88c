import { ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import type { Role, UserDto } from '@psiform/contracts';
import { PublicationsStore, type PublicationEntity } from '@psiform/server';

type Caller = Pick<UserDto, 'id' | 'role'>;

/** Where a resource lives: one publication, or every publication of one publisher (an organisation's swatchbooks). */
export type Scope = { publicationId: string } | { publisher: string };

/** A resource a caller wants to act on: what it is (for messages), where it lives and, if it has one, its owner. */
export interface Guarded {
  kind: 'figure' | 'figure set' | 'swatchbook';
  id: string;
  scope: Scope;
  ownerId?: string | null;
}

interface Rule {
  /** Roles that may do it (admins always may). */
  roles: readonly Role[];
  /** Roles that may do it only to resources they own. */
  ownerOnly?: readonly Role[];
  /** Says what is refused, e.g. "change this figure". */
  what: string;
}

const ALL: readonly Role[] = ['illustrator', 'editor', 'art_director', 'admin'];

/**
 * THE table of who may do what to which resource (issue "Stays up and stays scoped"). Every read and write of a
 * scoped resource goes through MembershipService.authorize with one of these actions; new features add rows here.
 * Reading needs membership of the scope (non-members get 404, so they cannot learn what exists); writing also needs
 * the role, and for ownerOnly roles the ownership (403 naming the rule).
 */
export const ACCESS_RULES = {
  'figure.read': { roles: ALL, what: 'see this figure' },
  'figure.edit': { roles: ['illustrator', 'admin'], ownerOnly: ['illustrator'], what: 'change this figure (title or recipe)' },
  'figure.mesh': { roles: ['illustrator', 'admin'], what: 'compute the mesh of this figure' },
  'figure.export': { roles: ALL, ownerOnly: ['illustrator'], what: 'export this figure' },
  'figure.submit': { roles: ['illustrator', 'admin'], ownerOnly: ['illustrator'], what: 'submit this figure for review' },
  'figure set.read': { roles: ALL, what: 'see this figure set' },
  'swatchbook.read': { roles: ALL, what: 'see this swatchbook' },
  'swatchbook.use': { roles: ALL, what: "use this swatchbook's colours" },
  'swatchbook.edit': { roles: ['art_director', 'admin'], what: 'change this swatchbook' },
} as const satisfies Record<string, Rule>;
export type AccessAction = keyof typeof ACCESS_RULES;

const OWNER_WORDS: Record<Guarded['kind'], string> = { figure: "the figure's owner", 'figure set': "the set's author", swatchbook: "the swatchbook's owner" };

/**
 * The one place that decides who may see and change what: publications by membership (admins see all), and through
 * `authorize` every scoped resource (figures, figure sets, swatchbooks; jobs, assets and batches follow their
 * publication). Non-members get 404, not 403, so they cannot learn which resources exist.
 */
@Injectable()
export class MembershipService {
  constructor(private readonly store: PublicationsStore) {}

  async canAccess(user: Caller, publicationId: string): Promise<boolean> {
    if (user.role === 'admin') return (await this.store.findById(publicationId)) !== null;
    return this.store.isMember(publicationId, user.id);
  }

  /** Returns the publication, or throws 404 when it does not exist or the user is not a member. */
  async requireAccess(user: Caller, publicationId: string): Promise<PublicationEntity> {
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

  /** The publication itself, without an access check (for rules between resources, not for answering callers). */
  findPublication(id: string): Promise<PublicationEntity | null> {
    return this.store.findById(id);
  }

  /** Publications visible to the user. */
  visiblePublications(user: Caller): Promise<PublicationEntity[]> {
    return user.role === 'admin' ? this.store.findAll() : this.store.findForMember(user.id);
  }

  /** True when the caller belongs to the scope: a member of the publication, or of a publication of the publisher. */
  async inScope(user: Caller, scope: Scope): Promise<boolean> {
    if ('publicationId' in scope) return this.canAccess(user, scope.publicationId);
    if (user.role === 'admin') return true;
    return (await this.store.findForMember(user.id)).some((p) => p.publisher === scope.publisher);
  }

  /** Whether a resource of `scope` may be used inside a publication (its own, or one of its publisher's). */
  static reaches(scope: Scope, publication: Pick<PublicationEntity, 'id' | 'publisher'>): boolean {
    return 'publicationId' in scope ? scope.publicationId === publication.id : scope.publisher === publication.publisher;
  }

  /** Throws 404 (not in the caller's scope) or 403 (role or ownership) unless the caller may do `action` to `r`. */
  async authorize(user: Caller, action: AccessAction, r: Guarded): Promise<void> {
    if (!(await this.inScope(user, r.scope))) throw new NotFoundException(`${r.kind} ${r.id} not found`);
    const refusal = refusalOf(user, action, r);
    if (refusal) throw new ForbiddenException(refusal);
  }

  /** Like authorize, but answers false instead of throwing (for lists and filters). */
  async allows(user: Caller, action: AccessAction, r: Guarded): Promise<boolean> {
    return (await this.inScope(user, r.scope)) && refusalOf(user, action, r) === null;
  }
}

/** The role and ownership part of a rule (membership aside): null when allowed, else the 403 message. */
export function refusalOf(user: Caller, action: AccessAction, r: Guarded): string | null {
  const rule: Rule = ACCESS_RULES[action];
  if (user.role === 'admin') return null;
  if (!rule.roles.includes(user.role)) return `your role (${user.role.replace('_', ' ')}) may not ${rule.what}`;
  if (rule.ownerOnly?.includes(user.role) && r.ownerId !== user.id) return `only ${OWNER_WORDS[r.kind]}, or an admin, may ${rule.what}`;
  return null;
}

/** A swatchbook's scope: its publication, or (publicationId null) every publication of its publisher. */
export const scopeOf = (s: { publicationId: string | null; publisher: string | null }): Scope => (s.publicationId ? { publicationId: s.publicationId } : { publisher: s.publisher! });

/** The Guarded form of the scoped resources (one shape per kind, used by every call site). */
export const guarded = {
  figure: (f: { id: string; publicationId: string; ownerId: string }): Guarded => ({ kind: 'figure', id: f.id, scope: { publicationId: f.publicationId }, ownerId: f.ownerId }),
  figureSet: (s: { id: string; publicationId: string; createdBy?: string | null }): Guarded => ({ kind: 'figure set', id: s.id, scope: { publicationId: s.publicationId }, ownerId: s.createdBy }),
};
