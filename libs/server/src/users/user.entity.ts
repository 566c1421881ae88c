import { Column, Entity } from 'typeorm';
import { IdColumn, CreatedAt } from '../db/columns';
import type { Role, UserDto, UserState } from '@psiform/contracts';

@Entity({ name: 'users' })
export class UserEntity {
  @IdColumn() id: string;
  /** Stored lower-cased; unique (constraint uq_users_email). */
  @Column({ type: 'varchar', length: 320 }) email: string;
  @Column({ name: 'display_name', type: 'varchar', length: 120 }) displayName: string;
  /** null while an invitation waits for its link to be used: such an account cannot sign in. */
  @Column({ name: 'password_hash', type: 'varchar', length: 100, nullable: true }) passwordHash: string | null;
  @Column({ type: 'varchar', length: 20 }) role: Role;
  /** false: deactivated; sign-in is refused and every token stops working at once. */
  @Column({ type: 'boolean', default: true }) active: boolean;
  /** Tokens issued (JWT iat) before this instant are refused: set on deactivation and on a password change. */
  @Column({ name: 'tokens_valid_after', type: 'timestamptz', nullable: true }) tokensValidAfter: Date | null;
  @CreatedAt() createdAt: Date;
}

/** The public shape: never the hash. */
export function toUserDto(u: UserEntity): UserDto {
  return { id: u.id, email: u.email, displayName: u.displayName, role: u.role, createdAt: u.createdAt.toISOString() };
}

export function userState(u: Pick<UserEntity, 'active' | 'passwordHash'>): UserState {
  if (!u.active) return 'deactivated';
  return u.passwordHash === null ? 'invited' : 'active';
}

/**
 * Whether a token is still honoured for this user. `issuedAtMs` is our own claim (milliseconds) written at sign-in;
 * `iat` (whole seconds, set by jsonwebtoken) is the fallback for tokens without it, compared conservatively.
 */
export function tokenStillValid(u: Pick<UserEntity, 'active' | 'tokensValidAfter'>, token: { iat?: number; iatMs?: number }): boolean {
  if (!u.active) return false;
  if (!u.tokensValidAfter) return true;
  const cut = u.tokensValidAfter.getTime();
  if (typeof token.iatMs === 'number' && Number.isFinite(token.iatMs)) return token.iatMs > cut;
  return typeof token.iat === 'number' && token.iat * 1000 > cut;
}
