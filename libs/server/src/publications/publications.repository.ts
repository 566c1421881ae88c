import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository, type EntityManager } from 'typeorm';
import type { LengthUnit, PublicationKind, PublicationSortKey, Role } from '@psiform/contracts';
import { PublicationEntity } from './publication.entity';
import { MembershipEntity } from './membership.entity';
import { UserEntity } from '../users/user.entity';
import { insertSubjectAudit, type NewSubjectAuditEntry } from '../audit/audit.repository';

export interface NewPublication {
  title: string;
  publisher: string;
  kind: PublicationKind;
  description: string;
  lengthUnit?: LengthUnit;
}

export type PublicationChange = Partial<Pick<PublicationEntity, 'title' | 'publisher' | 'kind' | 'description' | 'lengthUnit'>>;

export interface PublicationQuery {
  q?: string;
  kind?: PublicationKind;
  sort: PublicationSortKey;
  order: 'asc' | 'desc';
  page: number;
  pageSize: number;
}

export interface MemberRow {
  user: UserEntity;
  role: Role;
  addedAt: Date;
}

export interface UserMembershipRow {
  userId: string;
  publicationId: string;
  publicationTitle: string;
  role: Role;
}

/** What a publication change may do inside its transaction. */
export interface PublicationsTx {
  insert(p: NewPublication): Promise<PublicationEntity>;
  /** The row under FOR UPDATE, or null. */
  lock(id: string): Promise<PublicationEntity | null>;
  update(id: string, change: PublicationChange): Promise<void>;
  /** Returns false when the pair already exists. */
  addMember(publicationId: string, userId: string, role: Role): Promise<boolean>;
  /** The member's role before the change, or null when not a member. */
  setMemberRole(publicationId: string, userId: string, role: Role): Promise<Role | null>;
  /** The removed member's role, or null when not a member. */
  removeMember(publicationId: string, userId: string): Promise<Role | null>;
  audit(entry: NewSubjectAuditEntry): Promise<void>;
  readonly manager: EntityManager;
}

/** Port for publications and memberships; TypeormPublicationsStore is the only class touching these tables. */
export abstract class PublicationsStore {
  abstract findById(id: string): Promise<PublicationEntity | null>;
  abstract findAll(): Promise<PublicationEntity[]>;
  abstract findForMember(userId: string): Promise<PublicationEntity[]>;
  abstract insert(p: NewPublication): Promise<PublicationEntity>;
  abstract isMember(publicationId: string, userId: string): Promise<boolean>;
  /** Returns false when the pair already exists. */
  abstract addMember(publicationId: string, userId: string): Promise<boolean>;
  abstract listMembers(publicationId: string): Promise<UserEntity[]>;
  /** Members with their role in the publication, by display name. */
  abstract listMembersWithRoles(publicationId: string): Promise<MemberRow[]>;
  /** The member's role in the publication, or null. */
  abstract memberRole(publicationId: string, userId: string): Promise<Role | null>;
  /** Memberships of the given users (for the People table). */
  abstract membershipsOf(userIds: string[]): Promise<UserMembershipRow[]>;
  abstract page(q: PublicationQuery): Promise<{ rows: { publication: PublicationEntity; memberCount: number }[]; total: number }>;
  abstract memberCount(publicationId: string): Promise<number>;
  abstract transaction<T>(fn: (tx: PublicationsTx) => Promise<T>): Promise<T>;
}

const SORT_SQL: Record<PublicationSortKey, string> = {
  title: 'lower(p.title)',
  publisher: 'lower(p.publisher)',
  kind: 'p.kind',
  members: 'member_count',
  createdAt: 'p.created_at',
};

@Injectable()
export class TypeormPublicationsStore extends PublicationsStore {
  constructor(
    @InjectRepository(PublicationEntity) private readonly pubs: Repository<PublicationEntity>,
    @InjectRepository(MembershipEntity) private readonly members: Repository<MembershipEntity>,
    @InjectRepository(UserEntity) private readonly users: Repository<UserEntity>,
  ) {
    super();
  }

  findById(id: string) {
    return this.pubs.findOne({ where: { id } });
  }

  findAll() {
    return this.pubs.find({ order: { createdAt: 'ASC', title: 'ASC' } });
  }

  findForMember(userId: string) {
    return this.pubs
      .createQueryBuilder('p')
      .innerJoin(MembershipEntity, 'm', 'm.publication_id = p.id AND m.user_id = :userId', { userId })
      .orderBy('p.created_at', 'ASC')
      .addOrderBy('p.title', 'ASC')
      .getMany();
  }

  insert(p: NewPublication) {
    return this.pubs.save(this.pubs.create(p));
  }

  isMember(publicationId: string, userId: string) {
    return this.members.exists({ where: { publicationId, userId } });
  }

  async addMember(publicationId: string, userId: string): Promise<boolean> {
    const res = await this.members.createQueryBuilder().insert().values({ publicationId, userId }).orIgnore().execute();
    return (res.raw as unknown[]).length > 0;
  }

  listMembers(publicationId: string) {
    return this.users
      .createQueryBuilder('u')
      .innerJoin(MembershipEntity, 'm', 'm.user_id = u.id AND m.publication_id = :publicationId', { publicationId })
      .orderBy('u.display_name', 'ASC')
      .getMany();
  }

  async listMembersWithRoles(publicationId: string): Promise<MemberRow[]> {
    const { entities, raw } = await this.users
      .createQueryBuilder('u')
      .innerJoin(MembershipEntity, 'm', 'm.user_id = u.id AND m.publication_id = :publicationId', { publicationId })
      .addSelect('m.role', 'member_role')
      .addSelect('m.created_at', 'member_since')
      .orderBy('u.display_name', 'ASC')
      .addOrderBy('u.email', 'ASC')
      .getRawAndEntities();
    return entities.map((user, i) => ({ user, role: raw[i].member_role as Role, addedAt: raw[i].member_since as Date }));
  }

  async memberRole(publicationId: string, userId: string): Promise<Role | null> {
    return (await this.members.findOne({ where: { publicationId, userId } }))?.role ?? null;
  }

  async membershipsOf(userIds: string[]): Promise<UserMembershipRow[]> {
    if (userIds.length === 0) return [];
    const rows = (await this.members
      .createQueryBuilder('m')
      .innerJoin(PublicationEntity, 'p', 'p.id = m.publication_id')
      .select(['m.user_id AS user_id', 'm.publication_id AS publication_id', 'p.title AS title', 'm.role AS role'])
      .where('m.user_id IN (:...ids)', { ids: userIds })
      .orderBy('p.title', 'ASC')
      .getRawMany()) as { user_id: string; publication_id: string; title: string; role: Role }[];
    return rows.map((r) => ({ userId: r.user_id, publicationId: r.publication_id, publicationTitle: r.title, role: r.role }));
  }

  async page(q: PublicationQuery) {
    const qb = this.pubs
      .createQueryBuilder('p')
      .addSelect((sub) => sub.select('count(*)::int').from(MembershipEntity, 'mc').where('mc.publication_id = p.id'), 'member_count');
    if (q.q) {
      const like = `%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
      qb.andWhere('(p.title ILIKE :like OR p.publisher ILIKE :like)', { like });
    }
    if (q.kind) qb.andWhere('p.kind = :kind', { kind: q.kind });
    const total = await qb.getCount();
    const { entities, raw } = await qb
      .orderBy(SORT_SQL[q.sort], q.order === 'desc' ? 'DESC' : 'ASC')
      .addOrderBy('p.id', 'ASC')
      .offset((q.page - 1) * q.pageSize)
      .limit(q.pageSize)
      .getRawAndEntities();
    return { rows: entities.map((publication, i) => ({ publication, memberCount: Number(raw[i].member_count) })), total };
  }

  memberCount(publicationId: string): Promise<number> {
    return this.members.count({ where: { publicationId } });
  }

  transaction<T>(fn: (tx: PublicationsTx) => Promise<T>): Promise<T> {
    return this.pubs.manager.transaction((em) => fn(this.tx(em)));
  }

  private tx(em: EntityManager): PublicationsTx {
    const pubs = em.getRepository(PublicationEntity);
    const members = em.getRepository(MembershipEntity);
    return {
      manager: em,
      insert: (p) => pubs.save(pubs.create(p)),
      lock: (id) => pubs.createQueryBuilder('p').setLock('pessimistic_write').where('p.id = :id', { id }).getOne(),
      update: async (id, change) => {
        await pubs.update({ id }, change);
      },
      addMember: async (publicationId, userId, role) => {
        const res = await members.createQueryBuilder().insert().values({ publicationId, userId, role }).orIgnore().execute();
        return (res.raw as unknown[]).length > 0;
      },
      setMemberRole: async (publicationId, userId, role) => {
        const before = await members.createQueryBuilder('m').setLock('pessimistic_write').where('m.publication_id = :publicationId AND m.user_id = :userId', { publicationId, userId }).getOne();
        if (!before) return null;
        await members.update({ publicationId, userId }, { role });
        return before.role;
      },
      removeMember: async (publicationId, userId) => {
        const res = await members.createQueryBuilder().delete().where('publication_id = :publicationId AND user_id = :userId', { publicationId, userId }).returning(['role']).execute();
        const row = (res.raw as { role: Role }[])[0];
        return row?.role ?? null;
      },
      audit: (entry) => insertSubjectAudit(em, entry),
    };
  }
}
