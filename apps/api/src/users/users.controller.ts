import { Body, Controller, Get, HttpCode, Param, Patch, Post, Query } from '@nestjs/common';
import type { Page, UserAdminDto, UserDto } from '@psiform/contracts';
import { CurrentUser, Roles } from '../auth/auth.decorators';
import { uuidParam } from '../common/uuid-param.pipe';
import { CreateUserBody, InviteUserBody, ListUsersQuery, UpdateUserBody } from './users.dto';
import { UsersService } from './users.service';

/** The People page's routes: admins only. */
@Controller('users')
@Roles('admin')
export class UsersController {
  constructor(private readonly users: UsersService) {}

  @Post()
  create(@CurrentUser() actor: UserDto, @Body() body: CreateUserBody): Promise<UserDto> {
    return this.users.create(actor, body);
  }

  @Post('invitations')
  invite(@CurrentUser() actor: UserDto, @Body() body: InviteUserBody): Promise<UserAdminDto> {
    return this.users.invite(actor, body);
  }

  @Get()
  list(@Query() query: ListUsersQuery): Promise<Page<UserAdminDto>> {
    return this.users.list(query);
  }

  @Get(':id')
  get(@Param('id', uuidParam('id')) id: string): Promise<UserAdminDto> {
    return this.users.get(id);
  }

  @Patch(':id')
  update(@CurrentUser() actor: UserDto, @Param('id', uuidParam('id')) id: string, @Body() body: UpdateUserBody): Promise<UserAdminDto> {
    return this.users.update(actor, id, body);
  }

  @Post(':id/invitation')
  @HttpCode(200)
  resendInvitation(@CurrentUser() actor: UserDto, @Param('id', uuidParam('id')) id: string): Promise<UserAdminDto> {
    return this.users.resendInvitation(actor, id);
  }

  @Post(':id/password-reset')
  @HttpCode(200)
  sendPasswordReset(@CurrentUser() actor: UserDto, @Param('id', uuidParam('id')) id: string): Promise<UserAdminDto> {
    return this.users.sendPasswordReset(actor, id);
  }
}
