import { Body, Controller, Get, Param, Post, Put } from '@nestjs/common';
import type { MembershipDto, PublicationDto, UserDto } from '@psiform/contracts';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { AddMemberBody, CreatePublicationBody, LengthUnitBody } from './publications.dto';
import { PublicationsService } from './publications.service';

@Controller('publications')
export class PublicationsController {
  constructor(private readonly publications: PublicationsService) {}

  @Get()
  list(@CurrentUser() user: UserDto): Promise<PublicationDto[]> {
    return this.publications.list(user);
  }

  @Post()
  @Roles('admin')
  create(@Body() body: CreatePublicationBody): Promise<PublicationDto> {
    return this.publications.create(body);
  }

  @Get(':id')
  get(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<PublicationDto> {
    return this.publications.get(user, id);
  }

  @Put(':id/length-unit')
  @Roles('admin', 'art_director')
  setLengthUnit(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: LengthUnitBody): Promise<PublicationDto> {
    return this.publications.setLengthUnit(user, id, body.lengthUnit);
  }

  @Get(':id/members')
  members(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string): Promise<UserDto[]> {
    return this.publications.members(user, id);
  }

  @Post(':id/members')
  @Roles('admin')
  addMember(@CurrentUser() user: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: AddMemberBody): Promise<MembershipDto> {
    return this.publications.addMember(user, id, body.userId);
  }
}
