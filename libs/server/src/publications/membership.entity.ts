import { Column, Entity, PrimaryColumn } from 'typeorm';
import type { Role } from '@psiform/contracts';
import { CreatedAt, RefTo } from '../db/columns';
import { PublicationEntity } from './publication.entity';
import { UserEntity } from '../users/user.entity';

/** A user's membership of a publication; the (publication, user) pair is the primary key. */
@Entity({ name: 'publication_members' })
export class MembershipEntity {
  @PrimaryColumn({ name: 'publication_id', type: 'uuid' }) publicationId: string;
  @PrimaryColumn({ name: 'user_id', type: 'uuid' }) userId: string;
  /** The member's role in this publication (a trigger fills in the user's own role when an insert leaves it out). */
  @Column({ type: 'varchar', length: 20, nullable: true }) role: Role;
  @RefTo(() => PublicationEntity, 'publication_id', 'CASCADE') publication?: PublicationEntity;
  @RefTo(() => UserEntity, 'user_id', 'CASCADE') user?: UserEntity;
  @CreatedAt() createdAt: Date;
}
