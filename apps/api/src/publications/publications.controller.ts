import { Body, Controller, Delete, Get, HttpCode, Param, Patch, Post, Put, Query } from '@nestjs/common';
import type { MemberDto, MembershipDto, Page, PublicationAdminDto, PublicationDto, UserDto } from '@psiform/contracts';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { AddMemberBody, CreatePublicationBody, LengthUnitBody, ListPublicationsQuery, SetMemberRoleBody, UpdatePublicationBody } from './publications.dto';
import { PublicationsService } from './publications.service';

@Controller('publications')
export class PublicationsController {
  constructor(private readonly publications: PublicationsService) {}

  @Get()
  list(@CurrentUser() user: UserDto): Promise<PublicationDto[]> {
    return this.publications.list(user);
  }

  /** The Publications admin table (declared before ':id'). */
  @Get('directory')
  @Roles('admin')
  directory(@Query() query: ListPublicationsQuery): Promise<Page<PublicationAdminDto>> {
    return this.publications.directory(query);
  }

  @Post()
  @Roles('admin')
  create(@CurrentUser() user: UserDto, @Body() body: CreatePublicationBody): Promise<PublicationAdminDto> {
    return this.publications.create(user, body);
  }

  @Get(':id')
  get(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<PublicationDto> {
    return this.publications.get(user, id);
  }

  @Patch(':id')
  @Roles('admin')
  update(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: UpdatePublicationBody): Promise<PublicationAdminDto> {
    return this.publications.update(user, id, body);
  }

  /** The length unit alone, for art directors too (the House style page); the same audited edit as PATCH. */
  @Put(':id/length-unit')
  @Roles('admin', 'art_director')
  setLengthUnit(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: LengthUnitBody): Promise<PublicationDto> {
    return this.publications.setLengthUnit(user, id, body.lengthUnit);
  }

  @Get(':id/members')
  members(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<MemberDto[]> {
    return this.publications.members(user, id);
  }

  @Post(':id/members')
  @Roles('admin')
  addMember(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: AddMemberBody): Promise<MembershipDto> {
    return this.publications.addMember(user, id, body.userId, body.role);
  }

  @Put(':id/members/:userId')
  @Roles('admin')
  setMemberRole(
    @CurrentUser() user: UserDto,
    @Param('id', uuidParam('id')) id: string,
    @Param('userId', uuidParam('userId')) userId: string,
    @Body() body: SetMemberRoleBody,
  ): Promise<MembershipDto> {
    return this.publications.setMemberRole(user, id, userId, body.role);
  }

  @Delete(':id/members/:userId')
  @Roles('admin')
  @HttpCode(204)
  removeMember(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Param('userId', uuidParam('userId')) userId: string): Promise<void> {
    return this.publications.removeMember(user, id, userId);
  }
}
