import { CreateDateColumn, Entity, JoinColumn, ManyToOne, PrimaryColumn } from 'typeorm';
import { PublicationEntity } from './publication.entity';
import { UserEntity } from '../users/user.entity';

/** A user's membership of a publication; the (publication, user) pair is the primary key. */
@Entity({ name: 'publication_members' })
export class MembershipEntity {
  @PrimaryColumn({ name: 'publication_id', type: 'uuid' })
  publicationId: string;

  @PrimaryColumn({ name: 'user_id', type: 'uuid' })
  userId: string;

  @ManyToOne(() => PublicationEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'publication_id' })
  publication?: PublicationEntity;

  @ManyToOne(() => UserEntity, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user?: UserEntity;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
