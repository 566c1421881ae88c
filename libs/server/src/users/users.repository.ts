import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { DataSource, QueryFailedError, Repository, type EntityManager } from 'typeorm';
import { ConflictError } from '../common/domain-errors';
import type { LinkPurpose, Role, UserSortKey, UserState } from '@psiform/contracts';
import { UserEntity } from './user.entity';
import { UserLinkEntity } from './user-link.entity';
import { insertSubjectAudit, type NewSubjectAuditEntry } from '../audit/audit.repository';

/** 409 through the domain-error filter. */
export class DuplicateEmailError extends ConflictError {
  constructor(readonly email: string) {
    super(`email ${email} is already registered`);
  }
}

export interface NewUser {
  email: string;
  displayName: string;
  /** null: invited, no password yet. */
  passwordHash: string | null;
  role: Role;
}

export type UserChange = Partial<Pick<UserEntity, 'displayName' | 'role' | 'active' | 'passwordHash' | 'tokensValidAfter'>>;

export interface NewLink {
  userId: string;
  purpose: LinkPurpose;
  tokenHash: string;
  expiresAt: Date;
  createdBy: string | null;
}

export interface UserQuery {
  q?: string;
  role?: Role;
  state?: UserState;
  sort: UserSortKey;
  order: 'asc' | 'desc';
  page: number;
  pageSize: number;
}

export interface UserRow {
  user: UserEntity;
  lastLinkSentAt: Date | null;
}

/** What an account change may do inside its transaction. */
export interface UsersTx {
  insert(user: NewUser): Promise<UserEntity>;
  /** The row under FOR UPDATE, or null. */
  lock(id: string): Promise<UserEntity | null>;
  update(id: string, change: UserChange): Promise<void>;
  /** A new link; older unused links of the same purpose for the user stop working. */
  addLink(link: NewLink): Promise<UserLinkEntity>;
  /** Uses the link up (once, atomically) if it is unused and unexpired; null otherwise. */
  consumeLink(tokenHash: string): Promise<UserLinkEntity | null>;
  audit(entry: NewSubjectAuditEntry): Promise<void>;
  /** For the transactional outbox (mail in the same transaction as the change). */
  readonly manager: EntityManager;
}

/** Port used by services; the TypeORM class below is the only place that touches the users and user_links tables. */
export abstract class UsersStore {
  abstract findById(id: string): Promise<UserEntity | null>;
  abstract findByEmail(email: string): Promise<UserEntity | null>;
  abstract findAll(): Promise<UserEntity[]>;
  /** Throws DuplicateEmailError when the email is taken. */
  abstract insert(user: NewUser): Promise<UserEntity>;
  abstract page(q: UserQuery): Promise<{ rows: UserRow[]; total: number }>;
  /** A link that is unused and unexpired, with its user; null otherwise. Does not use it up. */
  abstract findUsableLink(tokenHash: string): Promise<{ link: UserLinkEntity; user: UserEntity } | null>;
  abstract lastLinkSentAt(userId: string): Promise<Date | null>;
  /** Runs fn in one transaction; DuplicateEmailError for a taken email. */
  abstract transaction<T>(fn: (tx: UsersTx) => Promise<T>): Promise<T>;
}

const PG_UNIQUE_VIOLATION = '23505';
const isUniqueViolation = (err: unknown) => err instanceof QueryFailedError && (err.driverError as { code?: string })?.code === PG_UNIQUE_VIOLATION;

/** SQL for each sort key; state sorts invited < active < deactivated. */
const SORT_SQL: Record<UserSortKey, string> = {
  displayName: 'lower(u.display_name)',
  email: 'u.email',
  role: 'u.role',
  state: `CASE WHEN NOT u.active THEN 2 WHEN u.password_hash IS NULL THEN 0 ELSE 1 END`,
  createdAt: 'u.created_at',
};

@Injectable()
export class TypeormUsersStore extends UsersStore {
  constructor(@InjectRepository(UserEntity) private readonly repo: Repository<UserEntity>) {
    super();
  }

  private get ds(): DataSource {
    return this.repo.manager.connection;
  }

  findById(id: string) {
    return this.repo.findOne({ where: { id } });
  }

  findByEmail(email: string) {
    return this.repo.findOne({ where: { email: email.toLowerCase() } });
  }

  findAll() {
    return this.repo.find({ order: { createdAt: 'ASC', email: 'ASC' } });
  }

  async insert(user: NewUser): Promise<UserEntity> {
    try {
      return await this.repo.save(this.repo.create({ ...user, email: user.email.toLowerCase() }));
    } catch (err) {
      if (isUniqueViolation(err)) throw new DuplicateEmailError(user.email);
      throw err;
    }
  }

  async page(q: UserQuery) {
    const qb = this.repo.createQueryBuilder('u');
    if (q.q) {
      // ILIKE with the user's text escaped: % and _ are literal in a search box.
      const like = `%${q.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
      qb.andWhere('(u.email ILIKE :like OR u.display_name ILIKE :like)', { like });
    }
    if (q.role) qb.andWhere('u.role = :role', { role: q.role });
    if (q.state === 'deactivated') qb.andWhere('u.active = false');
    if (q.state === 'invited') qb.andWhere('u.active = true AND u.password_hash IS NULL');
    if (q.state === 'active') qb.andWhere('u.active = true AND u.password_hash IS NOT NULL');
    const total = await qb.getCount();
    const dir = q.order === 'desc' ? 'DESC' : 'ASC';
    const users = await qb
      .orderBy(SORT_SQL[q.sort], dir)
      .addOrderBy('u.email', 'ASC')
      .offset((q.page - 1) * q.pageSize)
      .limit(q.pageSize)
      .getMany();
    const last = new Map<string, Date>();
    if (users.length) {
      const rows = (await this.ds.query(
        `SELECT user_id, max(created_at) AS at FROM user_links WHERE user_id = ANY($1::uuid[]) GROUP BY user_id`,
        [users.map((u) => u.id)],
      )) as { user_id: string; at: Date }[];
      for (const r of rows) last.set(r.user_id, r.at);
    }
    return { rows: users.map((user) => ({ user, lastLinkSentAt: last.get(user.id) ?? null })), total };
  }

  async findUsableLink(tokenHash: string) {
    const link = await this.ds
      .getRepository(UserLinkEntity)
      .createQueryBuilder('l')
      .where('l.token_hash = :tokenHash AND l.used_at IS NULL AND l.expires_at > now()', { tokenHash })
      .getOne();
    if (!link) return null;
    const user = await this.findById(link.userId);
    return user ? { link, user } : null;
  }

  async lastLinkSentAt(userId: string): Promise<Date | null> {
    const l = await this.ds.getRepository(UserLinkEntity).findOne({ where: { userId }, order: { createdAt: 'DESC' } });
    return l?.createdAt ?? null;
  }

  async transaction<T>(fn: (tx: UsersTx) => Promise<T>): Promise<T> {
    try {
      return await this.ds.transaction((em) => fn(this.tx(em)));
    } catch (err) {
      if (isUniqueViolation(err)) throw new DuplicateEmailError('(this address)');
      throw err;
    }
  }

  private tx(em: EntityManager): UsersTx {
    const users = em.getRepository(UserEntity);
    const links = em.getRepository(UserLinkEntity);
    return {
      manager: em,
      insert: async (user) => {
        try {
          // A savepoint-free insert: a unique violation aborts the transaction, which is what we want.
          return await users.save(users.create({ ...user, email: user.email.toLowerCase() }));
        } catch (err) {
          if (isUniqueViolation(err)) throw new DuplicateEmailError(user.email);
          throw err;
        }
      },
      lock: (id) => users.createQueryBuilder('u').setLock('pessimistic_write').where('u.id = :id', { id }).getOne(),
      update: async (id, change) => {
        await users.update({ id }, change);
      },
      addLink: async (link) => {
        await links
          .createQueryBuilder()
          .update()
          .set({ expiresAt: () => 'least(expires_at, now())' })
          .where('user_id = :userId AND purpose = :purpose AND used_at IS NULL', { userId: link.userId, purpose: link.purpose })
          .execute();
        return links.save(links.create(link));
      },
      consumeLink: async (tokenHash) => {
        const res = await links
          .createQueryBuilder()
          .update()
          .set({ usedAt: () => 'now()' })
          .where('token_hash = :tokenHash AND used_at IS NULL AND expires_at > now()', { tokenHash })
          .returning('*')
          .execute();
        const raw = (res.raw as Record<string, unknown>[])[0];
        if (!raw) return null;
        return links.create({
          id: raw.id as string,
          userId: raw.user_id as string,
          purpose: raw.purpose as LinkPurpose,
          tokenHash: raw.token_hash as string,
          expiresAt: raw.expires_at as Date,
          usedAt: raw.used_at as Date,
          createdBy: (raw.created_by as string | null) ?? null,
          createdAt: raw.created_at as Date,
        });
      },
      audit: (entry) => insertSubjectAudit(em, entry),
    };
  }
}
