import { Transform } from 'class-transformer';
import { IsBoolean, IsEmail, IsNotEmpty, IsOptional, IsString, MaxLength, MinLength } from 'class-validator';
import {
  MIN_PASSWORD_LENGTH,
  ROLES,
  USER_SORT_KEYS,
  USER_STATES,
  type CreateUserRequest,
  type InviteUserRequest,
  type Role,
  type UpdateUserRequest,
  type UserSortKey,
  type UserState,
} from '@psiform/contracts';
import { AdminListQuery, MaxUtf8Bytes, OneOf, OptionalNotNull, SortOrder, TrimmedText } from '../common/validation';

const trimLower = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim().toLowerCase() : value);

/** bcrypt reads only the first 72 bytes (not characters). */
export const MAX_PASSWORD_BYTES = 72;

export class CreateUserBody implements CreateUserRequest {
  @Transform(trimLower)
  @MaxLength(320, { message: 'email must be at most 320 characters' })
  @IsEmail({}, { message: 'email must be a valid email address' })
  email: string;

  @TrimmedText(120)
  displayName: string;

  @MinLength(MIN_PASSWORD_LENGTH, { message: `password must be at least ${MIN_PASSWORD_LENGTH} characters` })
  @MaxUtf8Bytes(MAX_PASSWORD_BYTES)
  @IsString({ message: 'password must be a string' })
  password: string;

  @OneOf(ROLES)
  role: Role;
}

export class InviteUserBody implements InviteUserRequest {
  @Transform(trimLower)
  @IsEmail({}, { message: 'email must be a valid email address' })
  @MaxLength(320, { message: 'email must be at most 320 characters' })
  email: string;

  @TrimmedText(120)
  displayName: string;

  @OneOf(ROLES)
  role: Role;
}

export class UpdateUserBody implements UpdateUserRequest {
  @OptionalNotNull()
  @TrimmedText(120)
  displayName?: string;

  @OptionalNotNull()
  @OneOf(ROLES)
  role?: Role;

  @OptionalNotNull()
  @IsBoolean({ message: 'active must be true or false' })
  active?: boolean;
}

export class ListUsersQuery extends AdminListQuery {
  @IsOptional()
  @OneOf(ROLES)
  role?: Role;

  @IsOptional()
  @OneOf(USER_STATES)
  state?: UserState;

  @IsOptional()
  @OneOf(USER_SORT_KEYS)
  sort?: UserSortKey;

  @SortOrder()
  order?: 'asc' | 'desc';
}

/** Public: the link's token (43 base64url characters from 32 random bytes). */
export class LinkTokenBody {
  // With stopAtFirstError the bottom decorator runs first.
  @MaxLength(200, { message: 'token: this link is not valid' })
  @IsNotEmpty({ message: 'token must not be empty' })
  @IsString({ message: 'token must be a string' })
  token: string;
}

export class SetPasswordBody extends LinkTokenBody {
  @IsString({ message: 'password must be a string' })
  @MinLength(MIN_PASSWORD_LENGTH, { message: `password must be at least ${MIN_PASSWORD_LENGTH} characters` })
  @MaxUtf8Bytes(MAX_PASSWORD_BYTES)
  password: string;
}

export class PasswordResetBody {
  @Transform(trimLower)
  @IsEmail({}, { message: 'email must be a valid email address' })
  @MaxLength(320, { message: 'email must be at most 320 characters' })
  email: string;
}
