import { Injectable } from '@nestjs/common';
import type { CreateUserRequest, UserDto } from '@psiform/contracts';
import { DuplicateEmailError, UsersStore, toUserDto } from '@psiform/server';
import { hashPassword } from './password';

@Injectable()
export class UsersService {
  constructor(private readonly store: UsersStore) {}

  async create(req: CreateUserRequest): Promise<UserDto> {
    const email = req.email.trim().toLowerCase();
    if (await this.store.findByEmail(email)) throw new DuplicateEmailError(email);
    // A concurrent insert of the same email makes the store throw DuplicateEmailError too (409 through the filter).
    const user = await this.store.insert({ email, displayName: req.displayName, role: req.role, passwordHash: await hashPassword(req.password) });
    return toUserDto(user);
  }

  async list(): Promise<UserDto[]> {
    return (await this.store.findAll()).map(toUserDto);
  }
}
