import { IsNotEmpty, IsString, MaxLength } from 'class-validator';
import type { LoginRequest } from '@psiform/contracts';

export class LoginBody implements LoginRequest {
  @IsString()
  @IsNotEmpty({ message: 'email must not be empty' })
  @MaxLength(320)
  email: string;

  @IsString()
  @IsNotEmpty({ message: 'password must not be empty' })
  @MaxLength(200)
  password: string;
}
