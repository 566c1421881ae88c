import { Transform, Type } from 'class-transformer';
import { IsBoolean, IsEmail, IsIn, IsInt, IsNotEmpty, IsOptional, IsString, Max, MaxLength, Min, MinLength } from 'class-validator';
import {
  ADMIN_PAGE_SIZE,
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
import { MaxUtf8Bytes, OptionalNotNull } from '../common/validation';

const trimLower = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim().toLowerCase() : value);
const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

/** bcrypt reads only the first 72 bytes (not characters). */
export const MAX_PASSWORD_BYTES = 72;
const ROLE_MESSAGE = `role must be one of: ${ROLES.join(', ')}`;

export class CreateUserBody implements CreateUserRequest {
  @Transform(trimLower)
  @MaxLength(320, { message: 'email must be at most 320 characters' })
  @IsEmail({}, { message: 'email must be a valid email address' })
  email: string;

  @Transform(trim)
  @IsNotEmpty({ message: 'displayName must not be empty' })
  @MaxLength(120, { message: 'displayName must be at most 120 characters' })
  @IsString({ message: 'displayName must be a string' })
  displayName: string;

  @MinLength(MIN_PASSWORD_LENGTH, { message: `password must be at least ${MIN_PASSWORD_LENGTH} characters` })
  @MaxUtf8Bytes(MAX_PASSWORD_BYTES)
  @IsString({ message: 'password must be a string' })
  password: string;

  @IsIn(ROLES as readonly string[], { message: ROLE_MESSAGE })
  role: Role;
}

export class InviteUserBody implements InviteUserRequest {
  @Transform(trimLower)
  @IsEmail({}, { message: 'email must be a valid email address' })
  @MaxLength(320, { message: 'email must be at most 320 characters' })
  email: string;

  @Transform(trim)
  @IsString({ message: 'displayName must be a string' })
  @IsNotEmpty({ message: 'displayName must not be empty' })
  @MaxLength(120, { message: 'displayName must be at most 120 characters' })
  displayName: string;

  @IsIn(ROLES as readonly string[], { message: ROLE_MESSAGE })
  role: Role;
}

export class UpdateUserBody implements UpdateUserRequest {
  @OptionalNotNull()
  @Transform(trim)
  @IsString({ message: 'displayName must be a string' })
  @IsNotEmpty({ message: 'displayName must not be empty' })
  @MaxLength(120, { message: 'displayName must be at most 120 characters' })
  displayName?: string;

  @OptionalNotNull()
  @IsIn(ROLES as readonly string[], { message: ROLE_MESSAGE })
  role?: Role;

  @OptionalNotNull()
  @IsBoolean({ message: 'active must be true or false' })
  active?: boolean;
}

export class ListUsersQuery {
  @IsOptional()
  @Type(() => Number)
  @IsInt({ message: 'page must be an integer' })
  @Min(1, { message: 'page must be 1..100000' })
  @Max(100_000, { message: 'page must be 1..100000' })
  page?: number;

  @IsOptional()
  @Type(() => Number)
  @IsInt({ message: 'pageSize must be an integer' })
  @Min(1, { message: `pageSize must be 1..${ADMIN_PAGE_SIZE.max}` })
  @Max(ADMIN_PAGE_SIZE.max, { message: `pageSize must be 1..${ADMIN_PAGE_SIZE.max}` })
  pageSize?: number;

  @IsOptional()
  @Transform(trim)
  @IsString({ message: 'q must be a string' })
  @MaxLength(200, { message: 'q must be at most 200 characters' })
  q?: string;

  @IsOptional()
  @IsIn(ROLES as readonly string[], { message: ROLE_MESSAGE })
  role?: Role;

  @IsOptional()
  @IsIn(USER_STATES as readonly string[], { message: `state must be one of: ${USER_STATES.join(', ')}` })
  state?: UserState;

  @IsOptional()
  @IsIn(USER_SORT_KEYS as readonly string[], { message: `sort must be one of: ${USER_SORT_KEYS.join(', ')}` })
  sort?: UserSortKey;

  @IsOptional()
  @IsIn(['asc', 'desc'], { message: 'order must be asc or desc' })
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
