import { SetMetadata, createParamDecorator, type ExecutionContext } from '@nestjs/common';
import type { Role, UserDto } from '@psiform/contracts';

export const IS_PUBLIC_KEY = 'psiform:public';
export const ROLES_KEY = 'psiform:roles';

/** Route needs no token. */
export const Public = () => SetMetadata(IS_PUBLIC_KEY, true);

/** Route (or controller) needs one of these roles; checked by the global AccessGuard. */
export const Roles = (...roles: Role[]) => SetMetadata(ROLES_KEY, roles);

/** The signed-in user (set by the JWT strategy). */
export const CurrentUser = createParamDecorator((_: unknown, ctx: ExecutionContext): UserDto => ctx.switchToHttp().getRequest().user);
