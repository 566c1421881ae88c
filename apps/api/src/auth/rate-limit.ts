import { Injectable, type ExecutionContext } from '@nestjs/common';
import { ThrottlerGuard, type ThrottlerModuleOptions } from '@nestjs/throttler';
import type { AppConfig } from '@psiform/server';

/**
 * General rate limits (@nestjs/throttler 6), after AccessGuard so a signed-in caller is counted by account (many
 * people can share one address), others by client address. Sign-in has its own back-off per account (LoginThrottle);
 * this only caps the request rate. In-process counters: each API process limits its own share.
 */
export function rateLimitOptions(config: Pick<AppConfig, 'limits'>): ThrottlerModuleOptions {
  return {
    // Named 'default' so the headers are the standard Retry-After and X-RateLimit-* (other names get a suffix).
    throttlers: [{ name: 'default', ttl: 60_000, limit: config.limits.requestsPerMinute }],
    errorMessage: (_ctx, d) => `too many requests; try again in ${Math.max(1, Math.ceil(d.timeToBlockExpire))} seconds`,
    // Health checks (monitoring) and open event streams (one long request each) are not rate limited.
    skipIf: (ctx: ExecutionContext) => config.limits.requestsPerMinute === 0 || /\/(health|events)$/.test(ctx.switchToHttp().getRequest<{ path: string }>().path),
  };
}

@Injectable()
export class RateLimitGuard extends ThrottlerGuard {
  protected override async getTracker(req: Record<string, unknown>): Promise<string> {
    const user = req.user as { id?: string } | undefined;
    return user?.id ? `user:${user.id}` : `ip:${String(req.ip)}`;
  }
}
