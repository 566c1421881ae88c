import { ConflictException, ForbiddenException, Injectable, NotFoundException } from '@nestjs/common';
import type { CreatePublicationRequest, LengthUnit, MembershipDto, PublicationDto, UserDto } from '@psiform/contracts';
import { PublicationsStore, toPublicationDto, toUserDto, UsersStore } from '@psiform/server';
import { MembershipService } from './membership.service';

@Injectable()
export class PublicationsService {
  constructor(
    private readonly store: PublicationsStore,
    private readonly users: UsersStore,
    private readonly membership: MembershipService,
  ) {}

  async list(user: UserDto): Promise<PublicationDto[]> {
    return (await this.membership.visiblePublications(user)).map(toPublicationDto);
  }

  async get(user: UserDto, id: string): Promise<PublicationDto> {
    return toPublicationDto(await this.membership.requireAccess(user, id));
  }

  async create(req: CreatePublicationRequest): Promise<PublicationDto> {
    const p = await this.store.insert({ title: req.title, publisher: req.publisher, kind: req.kind, description: req.description ?? '' });
    return toPublicationDto(p);
  }

  async addMember(admin: UserDto, publicationId: string, userId: string): Promise<MembershipDto> {
    await this.membership.requireAccess(admin, publicationId);
    if (!(await this.users.findById(userId))) throw new NotFoundException(`user ${userId} not found`);
    if (!(await this.store.addMember(publicationId, userId))) {
      throw new ConflictException(`user ${userId} is already a member of publication ${publicationId}`);
    }
    return { publicationId, userId };
  }

  /** The one length unit of the publication's figures (applied to every figure version saved from now on). */
  async setLengthUnit(user: UserDto, publicationId: string, unit: LengthUnit): Promise<PublicationDto> {
    await this.membership.requireAccess(user, publicationId);
    if (user.role !== 'admin' && user.role !== 'art_director') throw new ForbiddenException('only admins and art directors choose the length unit of a publication');
    await this.store.setLengthUnit(publicationId, unit);
    return toPublicationDto((await this.store.findById(publicationId))!);
  }

  async members(user: UserDto, publicationId: string): Promise<UserDto[]> {
    await this.membership.requireAccess(user, publicationId);
    return (await this.store.listMembers(publicationId)).map(toUserDto);
  }
}
