import { Transform } from 'class-transformer';
import { IsEmail, IsIn, IsNotEmpty, IsString, MaxLength, MinLength } from 'class-validator';
import { MaxUtf8Bytes } from '../common/validation';
import { MIN_PASSWORD_LENGTH, ROLES, type CreateUserRequest, type Role } from '@psiform/contracts';

const trimLower = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim().toLowerCase() : value);
const trim = ({ value }: { value: unknown }) => (typeof value === 'string' ? value.trim() : value);

export class CreateUserBody implements CreateUserRequest {
  @Transform(trimLower)
  @MaxLength(320)
  @IsEmail({}, { message: 'email must be a valid email address' })
  email: string;

  @Transform(trim)
  @IsNotEmpty({ message: 'displayName must not be empty' })
  @MaxLength(120)
  @IsString({ message: 'displayName must be a string' })
  displayName: string;

  @MinLength(MIN_PASSWORD_LENGTH, { message: `password must be at least ${MIN_PASSWORD_LENGTH} characters` })
  @MaxUtf8Bytes(72) // bcrypt reads only the first 72 bytes
  @IsString()
  password: string;

  @IsIn(ROLES as readonly string[], { message: `role must be one of: ${ROLES.join(', ')}` })
  role: Role;
}
