import { IsNotEmpty, IsString, MaxLength } from 'class-validator';
import type { LoginRequest } from '@psiform/contracts';

export class LoginBody implements LoginRequest {
  @IsNotEmpty({ message: 'email must not be empty' })
  @MaxLength(320)
  @IsString()
  email: string;

  @IsNotEmpty({ message: 'password must not be empty' })
  @MaxLength(200)
  @IsString()
  password: string;
}
