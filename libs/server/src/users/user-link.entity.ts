import { Column, Entity } from 'typeorm';
import type { LinkPurpose } from '@psiform/contracts';
import { CreatedAt, IdColumn, UuidColumn } from '../db/columns';

/**
 * A one-time link (invitation or password reset). Only the SHA-256 of the token is stored: a copy of the
 * database does not let anyone use a link. Used links keep used_at; expired ones are simply refused.
 */
@Entity({ name: 'user_links' })
export class UserLinkEntity {
  @IdColumn() id: string;
  @UuidColumn('user_id') userId: string;
  @Column({ type: 'varchar', length: 10 }) purpose: LinkPurpose;
  @Column({ name: 'token_hash', type: 'char', length: 64 }) tokenHash: string;
  @Column({ name: 'expires_at', type: 'timestamptz' }) expiresAt: Date;
  @Column({ name: 'used_at', type: 'timestamptz', nullable: true }) usedAt: Date | null;
  @UuidColumn('created_by', true) createdBy: string | null;
  @CreatedAt() createdAt: Date;
}
