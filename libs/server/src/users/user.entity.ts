import { Column, Entity } from 'typeorm';
import { IdColumn, CreatedAt } from '../db/columns';
import type { Role, UserDto } from '@psiform/contracts';

@Entity({ name: 'users' })
export class UserEntity {
  @IdColumn() id: string;
  /** Stored lower-cased; unique (constraint uq_users_email). */
  @Column({ type: 'varchar', length: 320 }) email: string;
  @Column({ name: 'display_name', type: 'varchar', length: 120 }) displayName: string;
  @Column({ name: 'password_hash', type: 'varchar', length: 100 }) passwordHash: string;
  @Column({ type: 'varchar', length: 20 }) role: Role;
  @CreatedAt() createdAt: Date;
}

/** The public shape: never the hash. */
export function toUserDto(u: UserEntity): UserDto {
  return { id: u.id, email: u.email, displayName: u.displayName, role: u.role, createdAt: u.createdAt.toISOString() };
}
