import { BadRequestException, ConflictException, ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import {
  ADMIN_PAGE_SIZE,
  LENGTH_UNIT_SYMBOLS,
  PUBLICATION_KINDS,
  ROLE_LABELS,
  type CreatePublicationRequest,
  type LengthUnit,
  type MemberDto,
  type MembershipDto,
  type Page,
  type PublicationAdminDto,
  type PublicationDto,
  type Role,
  type UpdatePublicationRequest,
  type UserDto,
} from '@psiform/contracts';
import { PublicationsStore, toPublicationDto, toUserDto, userState, UsersStore, type PublicationEntity } from '@psiform/server';
import { MembershipService } from './membership.service';
import type { ListPublicationsQuery } from './publications.dto';

type Caller = Pick<UserDto, 'id' | 'role'>;

const KIND_WORDS: Record<(typeof PUBLICATION_KINDS)[number], string> = { book: 'book', journal_volume: 'journal volume' };
const role = (r: Role) => ROLE_LABELS[r].toLowerCase();

/**
 * Publications and their members. Members read; admins create, edit, and add or remove members with their role
 * in the publication. Each change and its audit entry are one transaction.
 */
@Injectable()
export class PublicationsService {
  constructor(
    private readonly store: PublicationsStore,
    private readonly users: UsersStore,
    private readonly membership: MembershipService,
  ) {}

  async list(user: UserDto): Promise<PublicationDto[]> {
    return (await this.membership.visiblePublications(user)).map(toPublicationDto);
  }

  /** The Publications admin table: sorted, filtered and paged on the server. */
  async directory(query: ListPublicationsQuery): Promise<Page<PublicationAdminDto>> {
    const page = query.page ?? 1;
    const pageSize = query.pageSize ?? ADMIN_PAGE_SIZE.default;
    const { rows, total } = await this.store.page({ q: query.q || undefined, kind: query.kind, sort: query.sort ?? 'title', order: query.order ?? 'asc', page, pageSize });
    return { items: rows.map((r) => toAdminDto(r.publication, r.memberCount)), total, page, pageSize };
  }

  async get(user: UserDto, id: string): Promise<PublicationDto> {
    return toPublicationDto(await this.membership.requireAccess(user, id));
  }

  async create(actor: Caller, req: CreatePublicationRequest): Promise<PublicationAdminDto> {
    const p = await this.store.transaction(async (tx) => {
      const created = await tx.insert({ title: req.title, publisher: req.publisher, kind: req.kind, description: req.description ?? '', lengthUnit: req.lengthUnit ?? 'angstrom' });
      await tx.audit({ subjectKind: 'publication', subjectId: created.id, actorId: actor.id, action: 'publication_create', note: `created "${created.title}" (${KIND_WORDS[created.kind]}, ${created.publisher}), lengths in ${LENGTH_UNIT_SYMBOLS[created.lengthUnit]}` });
      return created;
    });
    return toAdminDto(p, 0);
  }

  async update(actor: Caller, id: string, req: UpdatePublicationRequest): Promise<PublicationAdminDto> {
    if ((['title', 'publisher', 'kind', 'description', 'lengthUnit'] as const).every((k) => req[k] === undefined)) throw new BadRequestException(['title, publisher, kind, description or lengthUnit is required']);
    await this.store.transaction(async (tx) => {
      const p = await tx.lock(id);
      if (!p) throw new NotFoundException(`publication ${id} not found`);
      const words: string[] = [];
      const change: Partial<PublicationEntity> = {};
      if (req.title !== undefined && req.title !== p.title) {
        change.title = req.title;
        words.push(`title "${p.title}" → "${req.title}"`);
      }
      if (req.publisher !== undefined && req.publisher !== p.publisher) {
        change.publisher = req.publisher;
        words.push(`publisher "${p.publisher}" → "${req.publisher}"`);
      }
      if (req.kind !== undefined && req.kind !== p.kind) {
        change.kind = req.kind;
        words.push(`kind ${KIND_WORDS[p.kind]} → ${KIND_WORDS[req.kind]}`);
      }
      if (req.description !== undefined && req.description !== p.description) {
        change.description = req.description;
        words.push('description changed');
      }
      if (req.lengthUnit !== undefined && req.lengthUnit !== p.lengthUnit) {
        change.lengthUnit = req.lengthUnit;
        words.push(`length unit ${LENGTH_UNIT_SYMBOLS[p.lengthUnit]} → ${LENGTH_UNIT_SYMBOLS[req.lengthUnit]}`);
      }
      if (words.length === 0) return;
      await tx.update(id, change);
      await tx.audit({ subjectKind: 'publication', subjectId: id, actorId: actor.id, action: 'publication_edit', note: words.join('; ') });
    });
    const p = await this.store.findById(id);
    return toAdminDto(p!, await this.store.memberCount(id));
  }

  /**
   * The one length unit of the publication's figures (applied to every figure version saved from now on): admins and
   * the publication's art directors; the same audited edit as update().
   */
  async setLengthUnit(user: Caller, publicationId: string, unit: LengthUnit): Promise<PublicationDto> {
    await this.membership.requireAccess(user, publicationId);
    if (user.role !== 'admin' && user.role !== 'art_director') throw new ForbiddenException('only admins and art directors choose the length unit of a publication');
    return this.update(user, publicationId, { lengthUnit: unit });
  }

  async members(user: Caller, publicationId: string): Promise<MemberDto[]> {
    await this.membership.requireAccess(user, publicationId);
    return (await this.store.listMembersWithRoles(publicationId)).map(({ user: u, role: r, addedAt }) => ({
      ...toUserDto(u),
      publicationRole: r,
      state: userState(u),
      addedAt: addedAt.toISOString(),
    }));
  }

  async addMember(actor: Caller, publicationId: string, userId: string, roleIn?: Role): Promise<MembershipDto> {
    await this.membership.requireAccess(actor, publicationId);
    const user = await this.users.findById(userId);
    if (!user) throw new NotFoundException(`user ${userId} not found`);
    const r = roleIn ?? user.role;
    await this.store.transaction(async (tx) => {
      const p = await tx.lock(publicationId);
      if (!p) throw new NotFoundException(`publication ${publicationId} not found`);
      if (!(await tx.addMember(publicationId, userId, r))) throw new ConflictException(`user ${userId} is already a member of publication ${publicationId}`);
      const note = `${user.displayName} <${user.email}> added to "${p.title}" as ${role(r)}`;
      await tx.audit({ subjectKind: 'publication', subjectId: publicationId, actorId: actor.id, action: 'member_add', note });
      await tx.audit({ subjectKind: 'user', subjectId: userId, actorId: actor.id, action: 'member_add', note });
    });
    return { publicationId, userId, role: r };
  }

  async setMemberRole(actor: Caller, publicationId: string, userId: string, r: Role): Promise<MembershipDto> {
    await this.membership.requireAccess(actor, publicationId);
    await this.store.transaction(async (tx) => {
      const p = await tx.lock(publicationId);
      if (!p) throw new NotFoundException(`publication ${publicationId} not found`);
      const before = await tx.setMemberRole(publicationId, userId, r);
      if (before === null) throw new NotFoundException(`user ${userId} is not a member of publication ${publicationId}`);
      if (before === r) return;
      const user = await this.users.findById(userId);
      const note = `${user?.displayName ?? userId} in "${p.title}": ${role(before)} → ${role(r)}`;
      await tx.audit({ subjectKind: 'publication', subjectId: publicationId, actorId: actor.id, action: 'member_role', note });
      await tx.audit({ subjectKind: 'user', subjectId: userId, actorId: actor.id, action: 'member_role', note });
    });
    return { publicationId, userId, role: r };
  }

  async removeMember(actor: Caller, publicationId: string, userId: string): Promise<void> {
    await this.membership.requireAccess(actor, publicationId);
    await this.store.transaction(async (tx) => {
      const p = await tx.lock(publicationId);
      if (!p) throw new NotFoundException(`publication ${publicationId} not found`);
      const before = await tx.removeMember(publicationId, userId);
      if (before === null) throw new NotFoundException(`user ${userId} is not a member of publication ${publicationId}`);
      const user = await this.users.findById(userId);
      const note = `${user?.displayName ?? userId} <${user?.email ?? '?'}> removed from "${p.title}" (was ${role(before)})`;
      await tx.audit({ subjectKind: 'publication', subjectId: publicationId, actorId: actor.id, action: 'member_remove', note });
      await tx.audit({ subjectKind: 'user', subjectId: userId, actorId: actor.id, action: 'member_remove', note });
    });
  }
}

function toAdminDto(p: PublicationEntity, memberCount: number): PublicationAdminDto {
  return { ...toPublicationDto(p), lengthUnit: p.lengthUnit, memberCount };
}
