import { Injectable } from '@nestjs/common';
import { InjectRepository } from '@nestjs/typeorm';
import { QueryFailedError, Repository } from 'typeorm';
import { ConflictError } from '../common/domain-errors';
import type { Role } from '@psiform/contracts';
import { UserEntity } from './user.entity';

/** 409 through the domain-error filter. */
export class DuplicateEmailError extends ConflictError {
  constructor(readonly email: string) {
    super(`email ${email} is already registered`);
  }
}

export interface NewUser {
  email: string;
  displayName: string;
  passwordHash: string;
  role: Role;
}

/** Port used by services; the TypeORM class below is the only place that touches the users table. */
export abstract class UsersStore {
  abstract findById(id: string): Promise<UserEntity | null>;
  abstract findByEmail(email: string): Promise<UserEntity | null>;
  abstract findAll(): Promise<UserEntity[]>;
  /** Throws DuplicateEmailError when the email is taken. */
  abstract insert(user: NewUser): Promise<UserEntity>;
}

const PG_UNIQUE_VIOLATION = '23505';

@Injectable()
export class TypeormUsersStore extends UsersStore {
  constructor(@InjectRepository(UserEntity) private readonly repo: Repository<UserEntity>) {
    super();
  }

  findById(id: string) {
    return this.repo.findOne({ where: { id } });
  }

  findByEmail(email: string) {
    return this.repo.findOne({ where: { email: email.toLowerCase() } });
  }

  findAll() {
    return this.repo.find({ order: { createdAt: 'ASC', email: 'ASC' } });
  }

  async insert(user: NewUser): Promise<UserEntity> {
    try {
      return await this.repo.save(this.repo.create({ ...user, email: user.email.toLowerCase() }));
    } catch (err) {
      if (err instanceof QueryFailedError && (err.driverError as { code?: string })?.code === PG_UNIQUE_VIOLATION) {
        throw new DuplicateEmailError(user.email);
      }
      throw err;
    }
  }
}
