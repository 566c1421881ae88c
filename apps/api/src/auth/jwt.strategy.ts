import { Inject, Injectable, UnauthorizedException } from '@nestjs/common';
import { PassportStrategy } from '@nestjs/passport';
import { ExtractJwt, Strategy } from 'passport-jwt';
import type { UserDto } from '@psiform/contracts';
import { APP_CONFIG, type AppConfig, UsersStore, toUserDto, tokenStillValid } from '@psiform/server';

export interface JwtPayload {
  sub: string;
  role: string;
  /** Issued at (seconds), set by jsonwebtoken. */
  iat?: number;
  /** Issued at in milliseconds (ours): a deactivation or password change in the same second still ends the token. */
  iatMs?: number;
}

@Injectable()
export class JwtStrategy extends PassportStrategy(Strategy, 'jwt') {
  constructor(
    @Inject(APP_CONFIG) config: AppConfig,
    private readonly users: UsersStore,
  ) {
    super({ jwtFromRequest: ExtractJwt.fromAuthHeaderAsBearerToken(), secretOrKey: config.jwt.secret, ignoreExpiration: false, algorithms: ['HS256'] });
  }

  /**
   * The user is re-read so a deleted or deactivated user, a changed role or a changed password (tokens issued before
   * it) takes effect at once.
   */
  async validate(payload: JwtPayload): Promise<UserDto> {
    const user = typeof payload.sub === 'string' ? await this.users.findById(payload.sub) : null;
    if (!user) throw new UnauthorizedException('the account for this token no longer exists');
    if (!user.active) throw new UnauthorizedException('this account is deactivated');
    if (!tokenStillValid(user, payload)) throw new UnauthorizedException('this session has ended; sign in again');
    return toUserDto(user);
  }
}
