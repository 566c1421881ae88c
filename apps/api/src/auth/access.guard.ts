import { ForbiddenException, Injectable, type CanActivate, type ExecutionContext } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { Role, UserDto } from '@psiform/contracts';
import { IS_PUBLIC_KEY, ROLES_KEY } from './auth.decorators';
import { RequestAuthenticator } from './request-authenticator';

/** The one global guard: a valid token unless @Public(), then the @Roles(...) check. */
@Injectable()
export class AccessGuard implements CanActivate {
  constructor(
    private readonly reflector: Reflector,
    private readonly authenticator: RequestAuthenticator,
  ) {}

  async canActivate(ctx: ExecutionContext): Promise<boolean> {
    const targets = [ctx.getHandler(), ctx.getClass()];
    if (this.reflector.getAllAndOverride<boolean>(IS_PUBLIC_KEY, targets)) return true;
    await this.authenticator.authenticate(ctx);
    const roles = this.reflector.getAllAndOverride<Role[] | undefined>(ROLES_KEY, targets);
    if (!roles || roles.length === 0) return true;
    const user = ctx.switchToHttp().getRequest<{ user?: UserDto }>().user;
    if (!user || !roles.includes(user.role)) {
      throw new ForbiddenException(`this action requires the role ${roles.join(' or ')}`);
    }
    return true;
  }
}
