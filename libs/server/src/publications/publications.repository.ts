import type { LengthUnit } from '@psiform/contracts';
import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { Repository } from 'typeorm';
import type { PublicationKind } from '@psiform/contracts';
import { PublicationEntity } from './publication.entity';
import { MembershipEntity } from './membership.entity';
import { UserEntity } from '../users/user.entity';

export interface NewPublication {
  title: string;
  publisher: string;
  kind: PublicationKind;
  description: string;
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
  abstract setLengthUnit(publicationId: string, unit: LengthUnit): Promise<void>;
}

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

  async setLengthUnit(publicationId: string, unit: LengthUnit): Promise<void> {
    await this.pubs.update({ id: publicationId }, { lengthUnit: unit });
  }

  listMembers(publicationId: string) {
    return this.users
      .createQueryBuilder('u')
      .innerJoin(MembershipEntity, 'm', 'm.user_id = u.id AND m.publication_id = :publicationId', { publicationId })
      .orderBy('u.display_name', 'ASC')
      .getMany();
  }
}
