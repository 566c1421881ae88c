import { Body, Controller, Get, HttpCode, Ip, Post } from '@nestjs/common';
import type { LinkInfoDto, LoginResponse, SetPasswordResponse, UserDto } from '@psiform/contracts';
import { CurrentUser, Public } from './auth.decorators';
import { AuthService } from './auth.service';
import { LoginBody } from './auth.dto';
import { LinkTokenBody, PasswordResetBody, SetPasswordBody } from '../users/users.dto';
import { PasswordLinksService } from '../users/password-links.service';

@Controller('auth')
export class AuthController {
  constructor(
    private readonly auth: AuthService,
    private readonly links: PasswordLinksService,
  ) {}

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

  /** What a one-time link is for (invitation or reset) and whose it is; does not use it up. Token in the body, never the URL. */
  @Public()
  @Post('link')
  @HttpCode(200)
  link(@Body() body: LinkTokenBody): Promise<LinkInfoDto> {
    return this.links.info(body.token);
  }

  /** Uses a one-time link once: sets the password and ends the account's earlier sessions. */
  @Public()
  @Post('set-password')
  @HttpCode(200)
  setPassword(@Body() body: SetPasswordBody): Promise<SetPasswordResponse> {
    return this.links.setPassword(body.token, body.password);
  }

  /** "Forgot your password?": always 202 with the same words. */
  @Public()
  @Post('password-reset')
  @HttpCode(202)
  passwordReset(@Body() body: PasswordResetBody): Promise<{ message: string }> {
    return this.links.requestReset(body.email);
  }
}
