import { Body, Controller, Get, Post } from '@nestjs/common';
import type { UserDto } from '@psiform/contracts';
import { Roles } from '../auth/auth.decorators';
import { CreateUserBody } from './users.dto';
import { UsersService } from './users.service';

@Controller('users')
@Roles('admin')
export class UsersController {
  constructor(private readonly users: UsersService) {}

  @Post()
  create(@Body() body: CreateUserBody): Promise<UserDto> {
    return this.users.create(body);
  }

  @Get()
  list(): Promise<UserDto[]> {
    return this.users.list();
  }
}
