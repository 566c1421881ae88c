import { Inject, Injectable, Logger, Optional, ServiceUnavailableException } from '@nestjs/common';
import { AttemptCounter } from '@psiform/server';
import { TooManyRequestsException } from '../common/too-many-requests.exception';

export interface LoginThrottlePolicy {
  maxFailures: number;
  windowSeconds: number;
}

/** Issue "Foundation": 5 failures per email or per IP within 15 minutes. */
export const DEFAULT_LOGIN_THROTTLE: LoginThrottlePolicy = { maxFailures: 5, windowSeconds: 15 * 60 };
export const LOGIN_THROTTLE_POLICY = Symbol('LOGIN_THROTTLE_POLICY');

const emailKey = (email: string) => `login:email:${email.trim().toLowerCase()}`;
const ipKey = (ip: string) => `login:ip:${ip}`;

@Injectable()
export class LoginThrottle {
  private readonly policy: LoginThrottlePolicy;

  constructor(
    private readonly counter: AttemptCounter,
    @Optional() @Inject(LOGIN_THROTTLE_POLICY) policy?: LoginThrottlePolicy,
  ) {
    this.policy = policy ?? DEFAULT_LOGIN_THROTTLE;
  }

  private readonly log = new Logger('LoginThrottle');

  /** Fails closed: without the counter we cannot throttle, so sign-in answers 503. */
  private async guarded<T>(op: () => Promise<T>): Promise<T> {
    try {
      return await op();
    } catch (err) {
      this.log.error(`attempt counter failed: ${(err as Error).message}`);
      throw new ServiceUnavailableException('sign-in is temporarily unavailable; try again shortly');
    }
  }

  /** Throws 429 once either counter has reached the limit within its window. */
  async assertAllowed(email: string, ip: string): Promise<void> {
    const counts = await this.guarded(() => Promise.all([this.counter.peek(emailKey(email)), this.counter.peek(ipKey(ip))]));
    const blocked = counts.filter((c) => c.count >= this.policy.maxFailures);
    if (blocked.length === 0) return;
    const retryAfter = Math.max(1, ...blocked.map((c) => c.retryAfterSeconds));
    const minutes = Math.ceil(retryAfter / 60);
    throw new TooManyRequestsException(
      `too many failed sign-in attempts; try again in ${minutes} minute${minutes === 1 ? '' : 's'}`,
      retryAfter,
    );
  }

  async recordFailure(email: string, ip: string): Promise<void> {
    await this.guarded(() =>
      Promise.all([this.counter.hit(emailKey(email), this.policy.windowSeconds), this.counter.hit(ipKey(ip), this.policy.windowSeconds)]),
    );
  }

  /** A successful sign-in clears the email's counter (the IP's stays). */
  async recordSuccess(email: string): Promise<void> {
    await this.guarded(() => this.counter.clear(emailKey(email)));
  }
}
