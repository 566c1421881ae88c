import { Body, Controller, Get, HttpCode, Ip, Post } from '@nestjs/common';
import type { LoginResponse, UserDto } from '@psiform/contracts';
import { CurrentUser, Public } from './auth.decorators';
import { AuthService } from './auth.service';
import { LoginBody } from './auth.dto';

@Controller('auth')
export class AuthController {
  constructor(private readonly auth: AuthService) {}

  @Public()
  @Post('login')
  @HttpCode(200)
  login(@Body() body: LoginBody, @Ip() ip: string): Promise<LoginResponse> {
    return this.auth.login(body.email, body.password, ip);
  }

  @Get('me')
  me(@CurrentUser() user: UserDto): UserDto {
    return user;
  }
}
