import { BadRequestException, Inject, Injectable, Logger } from '@nestjs/common';
import type { LinkInfoDto, SetPasswordResponse } from '@psiform/contracts';
import { APP_CONFIG, type AppConfig, AttemptGate, type BackoffPolicy, UsersStore, enqueueIn, userState } from '@psiform/server';
import { linkMail } from '../mail-notices/compose';
import { hashPassword } from './password';
import { hashLinkToken, linkExpiry, newLinkToken, setPasswordUrl } from './links';

/** One wording for every unusable link, so an answer does not tell which of the three it was. */
export const LINK_UNUSABLE = 'token: this link is not valid, has expired or was already used; ask for a new one';

/**
 * Self-service reset requests per account, on the sign-in back-off mechanism (AttemptGate): three mails at once,
 * then a doubling wait from 15 minutes (our choice); requests refused meanwhile are answered the same and send nothing.
 */
export const RESET_REQUEST_POLICY: BackoffPolicy = { freeAttempts: 3, baseDelayMs: 15 * 60_000, maxDelayMs: 24 * 3600_000, memoryMs: 24 * 3600_000 };

/**
 * The public side of one-time links: read what a link is for, use it once to set a password, and ask for a reset
 * link by e-mail. Using a link sets the password, ends every earlier session of the account, and is audited.
 */
@Injectable()
export class PasswordLinksService {
  private readonly log = new Logger('PasswordLinks');

  constructor(
    private readonly store: UsersStore,
    private readonly gate: AttemptGate,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  async info(token: string): Promise<LinkInfoDto> {
    const found = await this.store.findUsableLink(hashLinkToken(token));
    if (!found || !found.user.active) throw new BadRequestException([LINK_UNUSABLE]);
    return { purpose: found.link.purpose, email: found.user.email, displayName: found.user.displayName, expiresAt: found.link.expiresAt.toISOString() };
  }

  async setPassword(token: string, password: string): Promise<SetPasswordResponse> {
    const passwordHash = await hashPassword(password);
    return this.store.transaction(async (tx) => {
      const link = await tx.consumeLink(hashLinkToken(token));
      if (!link) throw new BadRequestException([LINK_UNUSABLE]);
      const user = await tx.lock(link.userId);
      // Throwing rolls the consumption back; a deactivated account's link stays unused but cannot be used.
      if (!user || !user.active) throw new BadRequestException([LINK_UNUSABLE]);
      await tx.update(user.id, { passwordHash, tokensValidAfter: new Date() });
      const first = link.purpose === 'invite';
      await tx.audit({
        subjectKind: 'user',
        subjectId: user.id,
        actorId: user.id,
        action: first ? 'password_set' : 'password_reset',
        note: first ? 'password chosen with the invitation link' : 'password changed with a reset link; earlier sessions ended',
      });
      return { email: user.email, message: first ? 'your password is set; sign in with your e-mail address' : 'your password is changed; sign in with the new one' };
    });
  }

  /** Always answers the same (no hint whether the address has an account); mails only active accounts with a password. */
  async requestReset(email: string): Promise<{ message: string }> {
    const answer = { message: 'if an account uses this address, a link to choose a new password is on its way' };
    const user = await this.store.findByEmail(email);
    if (!user || userState(user) !== 'active') return answer;
    try {
      if (!(await this.gate.acquire(`reset:account:${user.email}`, RESET_REQUEST_POLICY)).allowed) return answer;
    } catch (err) {
      this.log.warn(`reset request not counted (${(err as Error).message}); not sent`);
      return answer;
    }
    const { token, hash } = newLinkToken();
    await this.store.transaction(async (tx) => {
      await tx.addLink({ userId: user.id, purpose: 'reset', tokenHash: hash, expiresAt: linkExpiry('reset'), createdBy: null });
      await tx.audit({ subjectKind: 'user', subjectId: user.id, actorId: null, action: 'reset_requested', note: 'a password-reset link was requested from the sign-in page' });
      // The mail is an outbox row of the same transaction: sent exactly when the link exists, even if Redis is down now.
      await enqueueIn(tx.manager, { name: 'notice', data: linkMail('reset', user.email, { displayName: user.displayName, url: setPasswordUrl(this.config.http.publicBaseUrl, token) }) });
    });
    return answer;
  }
}
