import { Injectable, type ExecutionContext } from '@nestjs/common';
import { AuthGuard } from '@nestjs/passport';

/** Port: verifies the request's credentials and sets request.user, or throws 401. */
export abstract class RequestAuthenticator {
  abstract authenticate(ctx: ExecutionContext): Promise<void>;
}

/** Passport 'jwt' strategy (jwt.strategy.ts) behind the port; not registered as a guard itself. */
@Injectable()
export class PassportJwtAuthenticator extends RequestAuthenticator {
  private readonly passport = new (AuthGuard('jwt'))();

  async authenticate(ctx: ExecutionContext): Promise<void> {
    await this.passport.canActivate(ctx);
  }
}
