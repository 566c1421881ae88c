import { ForbiddenException, UnauthorizedException, type ExecutionContext } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { Role, UserDto } from '@psiform/contracts';
import { AccessGuard } from './access.guard';
import { Public, Roles } from './auth.decorators';
import { RequestAuthenticator } from './request-authenticator';

class Routes {
  @Public() open() {}
  plain() {}
  @Roles('admin') adminOnly() {}
  @Roles('editor', 'art_director') reviewers() {}
}

@Roles('admin')
class AdminController {
  inherited() {}
  @Roles('illustrator') overridden() {}
}

/** Fake authenticator: "token" is the role to sign in as, or undefined for no token. */
class FakeAuthenticator extends RequestAuthenticator {
  calls = 0;
  async authenticate(ctx: ExecutionContext): Promise<void> {
    this.calls++;
    const req = ctx.switchToHttp().getRequest<{ token?: Role; user?: UserDto }>();
    if (!req.token) throw new UnauthorizedException();
    req.user = { id: 'u1', email: 'u@example.test', displayName: 'U', role: req.token, createdAt: '' };
  }
}

function ctx(cls: new () => object, method: string, token?: Role): ExecutionContext {
  const req = { token };
  return {
    getHandler: () => (cls.prototype as Record<string, unknown>)[method],
    getClass: () => cls,
    switchToHttp: () => ({ getRequest: () => req }),
  } as unknown as ExecutionContext;
}

describe('AccessGuard', () => {
  const auth = new FakeAuthenticator();
  const guard = new AccessGuard(new Reflector(), auth);

  it('lets @Public() routes through without authenticating', async () => {
    const before = auth.calls;
    await expect(guard.canActivate(ctx(Routes, 'open'))).resolves.toBe(true);
    expect(auth.calls).toBe(before);
  });

  it('requires a token everywhere else', async () => {
    await expect(guard.canActivate(ctx(Routes, 'plain'))).rejects.toBeInstanceOf(UnauthorizedException);
    await expect(guard.canActivate(ctx(Routes, 'adminOnly'))).rejects.toBeInstanceOf(UnauthorizedException);
    await expect(guard.canActivate(ctx(Routes, 'plain', 'illustrator'))).resolves.toBe(true);
  });

  it('checks @Roles on the handler', async () => {
    await expect(guard.canActivate(ctx(Routes, 'adminOnly', 'admin'))).resolves.toBe(true);
    await expect(guard.canActivate(ctx(Routes, 'adminOnly', 'editor'))).rejects.toBeInstanceOf(ForbiddenException);
    await expect(guard.canActivate(ctx(Routes, 'reviewers', 'art_director'))).resolves.toBe(true);
    await expect(guard.canActivate(ctx(Routes, 'reviewers', 'illustrator'))).rejects.toThrow('this action requires the role editor or art_director');
  });

  it('inherits @Roles from the controller; a handler-level @Roles overrides it', async () => {
    await expect(guard.canActivate(ctx(AdminController, 'inherited', 'illustrator'))).rejects.toBeInstanceOf(ForbiddenException);
    await expect(guard.canActivate(ctx(AdminController, 'inherited', 'admin'))).resolves.toBe(true);
    await expect(guard.canActivate(ctx(AdminController, 'overridden', 'illustrator'))).resolves.toBe(true);
    await expect(guard.canActivate(ctx(AdminController, 'overridden', 'admin'))).rejects.toBeInstanceOf(ForbiddenException);
  });
});
