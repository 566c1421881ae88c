import { BadRequestException, ConflictException, Inject, Injectable, NotFoundException } from '@nestjs/common';
import {
  ADMIN_PAGE_SIZE,
  ROLE_LABELS,
  type CreateUserRequest,
  type InviteUserRequest,
  type LinkPurpose,
  type Page,
  type UpdateUserRequest,
  type UserAdminDto,
  type UserDto,
  type UserMembershipDto,
} from '@psiform/contracts';
import {
  APP_CONFIG,
  type AppConfig,
  DuplicateEmailError,
  enqueueIn,
  PublicationsStore,
  UsersStore,
  toUserDto,
  userState,
  type UserEntity,
  type UsersTx,
} from '@psiform/server';
import { linkMail } from '../mail-notices/compose';
import { hashPassword } from './password';
import { linkExpiry, newLinkToken, setPasswordUrl } from './links';
import type { ListUsersQuery } from './users.dto';

type Caller = Pick<UserDto, 'id' | 'role'>;

const duplicate = (email: string) => new ConflictException(`email: ${email} is already registered`);

/**
 * Accounts, as an admin runs them: create or invite (the invitation mail carries a one-time link), change role or
 * name, deactivate (every token stops at once) and reactivate, send a password reset. Each change and its audit
 * entry are one transaction, and so is its mail (an outbox row: sent exactly when the change commits).
 */
/** A fresh link of each kind: the account state it is refused in (the other kind of link is for that), and its audit. */
const FRESH_LINK = {
  invite: { refuse: 'active', refusal: 'this person has already chosen a password: send a password reset instead', action: 'invite_resend', note: 'a new invitation link was sent; the earlier one no longer works' },
  reset: { refuse: 'invited', refusal: 'this person has not chosen a password yet: send the invitation again instead', action: 'reset_sent', note: 'a password-reset link was sent by an administrator' },
} as const;

@Injectable()
export class UsersService {
  constructor(
    private readonly store: UsersStore,
    private readonly publications: PublicationsStore,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  /** An account with a password chosen by the admin (scripts and tests); the invitation is the usual way. */
  async create(actor: Caller, req: CreateUserRequest): Promise<UserDto> {
    const email = req.email.trim().toLowerCase();
    if (await this.store.findByEmail(email)) throw duplicate(email);
    const passwordHash = await hashPassword(req.password);
    const user = await this.inTx(email, async (tx) => {
      const u = await tx.insert({ email, displayName: req.displayName, role: req.role, passwordHash });
      await tx.audit({ subjectKind: 'user', subjectId: u.id, actorId: actor.id, action: 'user_create', note: `created as ${ROLE_LABELS[u.role].toLowerCase()} with a password set by an administrator` });
      return u;
    });
    return toUserDto(user);
  }

  async invite(actor: Caller, req: InviteUserRequest): Promise<UserAdminDto> {
    const email = req.email.trim().toLowerCase();
    if (await this.store.findByEmail(email)) throw duplicate(email);
    const { token, hash } = newLinkToken();
    const user = await this.inTx(email, async (tx) => {
      const u = await tx.insert({ email, displayName: req.displayName, role: req.role, passwordHash: null });
      await tx.addLink({ userId: u.id, purpose: 'invite', tokenHash: hash, expiresAt: linkExpiry('invite'), createdBy: actor.id });
      await tx.audit({ subjectKind: 'user', subjectId: u.id, actorId: actor.id, action: 'user_invite', note: `invited as ${ROLE_LABELS[u.role].toLowerCase()}` });
      await this.mailLink(tx, 'invite', u, token, actor);
      return u;
    });
    return this.get(user.id);
  }

  /** A fresh invitation link (the older one stops working). Only for accounts still waiting for their first password. */
  resendInvitation(actor: Caller, id: string): Promise<UserAdminDto> {
    return this.mailNewLink(actor, id, 'invite');
  }

  /** An admin sends a password-reset link to an active account. */
  sendPasswordReset(actor: Caller, id: string): Promise<UserAdminDto> {
    return this.mailNewLink(actor, id, 'reset');
  }

  /**
   * A new one-time link of `purpose` for an existing account, under its row lock: refused for deactivated accounts
   * and for the state the other kind of link is for; stored (hash only), audited and mailed in one transaction.
   */
  private async mailNewLink(
    actor: Caller,
    id: string,
    purpose: 'invite' | 'reset',
  ): Promise<UserAdminDto> {
    const rule = FRESH_LINK[purpose];
    const { token, hash } = newLinkToken();
    const user = await this.store.transaction(async (tx) => {
      const u = await tx.lock(id);
      if (!u) throw new NotFoundException(`user ${id} not found`);
      const state = userState(u);
      if (state === 'deactivated') throw new ConflictException('this account is deactivated: reactivate it first');
      if (state === rule.refuse) throw new ConflictException(rule.refusal);
      await tx.addLink({ userId: u.id, purpose, tokenHash: hash, expiresAt: linkExpiry(purpose), createdBy: actor.id });
      await tx.audit({ subjectKind: 'user', subjectId: u.id, actorId: actor.id, action: rule.action, note: rule.note });
      await this.mailLink(tx, purpose, u, token, actor);
      return u;
    });
    return this.get(user.id);
  }

  async list(query: ListUsersQuery): Promise<Page<UserAdminDto>> {
    const page = query.page ?? 1;
    const pageSize = query.pageSize ?? ADMIN_PAGE_SIZE.default;
    const { rows, total } = await this.store.page({
      q: query.q || undefined,
      role: query.role,
      state: query.state,
      sort: query.sort ?? 'displayName',
      order: query.order ?? 'asc',
      page,
      pageSize,
    });
    const memberships = await this.membershipsOf(rows.map((r) => r.user.id));
    return { items: rows.map((r) => toAdminDto(r.user, r.lastLinkSentAt, memberships.get(r.user.id) ?? [])), total, page, pageSize };
  }

  async get(id: string): Promise<UserAdminDto> {
    const user = await this.store.findById(id);
    if (!user) throw new NotFoundException(`user ${id} not found`);
    const [last, memberships] = await Promise.all([this.store.lastLinkSentAt(id), this.membershipsOf([id])]);
    return toAdminDto(user, last, memberships.get(id) ?? []);
  }

  async update(actor: Caller, id: string, req: UpdateUserRequest): Promise<UserAdminDto> {
    if (req.displayName === undefined && req.role === undefined && req.active === undefined) {
      throw new BadRequestException(['displayName, role or active is required']);
    }
    await this.store.transaction(async (tx) => {
      const u = await tx.lock(id);
      if (!u) throw new NotFoundException(`user ${id} not found`);
      // An admin cannot lock themselves out; so at least one active admin always remains.
      if (u.id === actor.id && req.active === false) throw new ConflictException('active: you cannot deactivate your own account');
      if (u.id === actor.id && req.role !== undefined && req.role !== u.role) throw new ConflictException('role: you cannot change your own role');
      const audit = (action: string, note: string) => tx.audit({ subjectKind: 'user', subjectId: u.id, actorId: actor.id, action, note });
      if (req.displayName !== undefined && req.displayName !== u.displayName) {
        await tx.update(u.id, { displayName: req.displayName });
        await audit('user_rename', `name "${u.displayName}" → "${req.displayName}"`);
      }
      if (req.role !== undefined && req.role !== u.role) {
        await tx.update(u.id, { role: req.role });
        await audit('user_role', `role ${ROLE_LABELS[u.role].toLowerCase()} → ${ROLE_LABELS[req.role].toLowerCase()}`);
      }
      if (req.active === false && u.active) {
        await tx.update(u.id, { active: false, tokensValidAfter: new Date() });
        await audit('user_deactivate', 'deactivated: sign-in refused and every session ended');
      }
      if (req.active === true && !u.active) {
        // Tokens from before the deactivation stay refused (tokensValidAfter is kept).
        await tx.update(u.id, { active: true });
        await audit('user_reactivate', 'reactivated: may sign in again');
      }
    });
    return this.get(id);
  }

  private async inTx<T>(email: string, fn: (tx: UsersTx) => Promise<T>): Promise<T> {
    try {
      return await this.store.transaction(fn);
    } catch (err) {
      // Lost a race with a concurrent insert of the same email.
      if (err instanceof DuplicateEmailError) throw duplicate(email);
      throw err;
    }
  }

  /** The link's mail as an outbox row in the transaction that made the link. */
  private async mailLink(tx: UsersTx, purpose: LinkPurpose, user: UserEntity, token: string, actor: Caller | null): Promise<void> {
    const by = actor ? await this.store.findById(actor.id) : null;
    await enqueueIn(tx.manager, { name: 'notice', data: linkMail(purpose, user.email, { displayName: user.displayName, invitedBy: by?.displayName ?? null, url: setPasswordUrl(this.config.http.publicBaseUrl, token) }) });
  }

  private async membershipsOf(userIds: string[]): Promise<Map<string, UserMembershipDto[]>> {
    const out = new Map<string, UserMembershipDto[]>();
    for (const m of await this.publications.membershipsOf(userIds)) {
      const list = out.get(m.userId) ?? [];
      list.push({ publicationId: m.publicationId, publicationTitle: m.publicationTitle, role: m.role });
      out.set(m.userId, list);
    }
    return out;
  }
}

function toAdminDto(u: UserEntity, lastLinkSentAt: Date | null, memberships: UserMembershipDto[]): UserAdminDto {
  return { ...toUserDto(u), state: userState(u), lastLinkSentAt: lastLinkSentAt ? new Date(lastLinkSentAt).toISOString() : null, memberships };
}
