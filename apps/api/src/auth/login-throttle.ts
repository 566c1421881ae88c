import { Inject, Injectable, Logger, Optional, ServiceUnavailableException } from '@nestjs/common';
import { APP_CONFIG, AttemptGate, type AppConfig, type BackoffPolicy, type GateVerdict } from '@psiform/server';
import { TooManyRequestsException } from '../common/too-many-requests.exception';
import { withDeadline } from '../common/deadline';

export interface LoginThrottlePolicy {
  /** Per account (e-mail): 5 free tries, then 5 s, 10 s, 20 s … up to 15 min between tries. */
  account: BackoffPolicy;
  /** Per client address, only behind a configured `trust proxy` (TRUST_PROXY): more lenient, many people share one. */
  address: BackoffPolicy;
  /** Longest wait for the attempt store before sign-in answers 503 (a stalled Redis must not hang sign-in). */
  storeTimeoutMs: number;
}

export const DEFAULT_LOGIN_THROTTLE: LoginThrottlePolicy = {
  account: { freeAttempts: 5, baseDelayMs: 5000, maxDelayMs: 15 * 60_000, memoryMs: 6 * 3600_000 },
  address: { freeAttempts: 30, baseDelayMs: 1000, maxDelayMs: 15 * 60_000, memoryMs: 3600_000 },
  storeTimeoutMs: 1500,
};
export const LOGIN_THROTTLE_POLICY = Symbol('LOGIN_THROTTLE_POLICY');

export const accountKey = (email: string) => `login:email:${email.trim().toLowerCase()}`;
export const addressKey = (ip: string) => `login:ip:${ip}`;

/** A sign-in attempt that went through the gate; the caller reports how it ended. */
export interface Admitted {
  succeeded(): Promise<void>;
}

@Injectable()
export class LoginThrottle {
  private readonly policy: LoginThrottlePolicy;
  private readonly log = new Logger('LoginThrottle');
  private readonly perAddress: boolean;

  constructor(
    private readonly gate: AttemptGate,
    @Inject(APP_CONFIG) config: Pick<AppConfig, 'http'>,
    @Optional() @Inject(LOGIN_THROTTLE_POLICY) policy?: LoginThrottlePolicy,
  ) {
    this.policy = policy ?? DEFAULT_LOGIN_THROTTLE;
    // Without a configured proxy the socket address may be a proxy's (everyone's): never throttle by it then.
    this.perAddress = config.http.trustProxy !== false;
  }

  /** Fails closed: without the attempt store we cannot throttle, so sign-in answers 503, within storeTimeoutMs. */
  private async guarded<T>(op: () => Promise<T>): Promise<T> {
    try {
      return await withDeadline(op(), this.policy.storeTimeoutMs, 'redis');
    } catch (err) {
      this.log.error(`attempt store failed: ${(err as Error).message}`);
      throw new ServiceUnavailableException('sign-in is temporarily unavailable (the attempt store is not answering); try again shortly');
    }
  }

  /**
   * Counts this attempt (before the password is checked) or throws 429 with Retry-After. Refused attempts are not
   * counted against the other key either.
   */
  async admit(email: string, ip: string): Promise<Admitted> {
    const account = accountKey(email);
    const address = this.perAddress ? addressKey(ip) : undefined;
    const verdicts = await this.guarded(async () => {
      const a = await this.gate.acquire(account, this.policy.account);
      if (!a.allowed || !address) return [a];
      const b = await this.gate.acquire(address, this.policy.address);
      if (!b.allowed) await this.gate.refund(account);
      return [a, b];
    });
    const refused = verdicts.filter((v: GateVerdict) => !v.allowed);
    if (refused.length) {
      const seconds = Math.max(1, ...refused.map((v) => Math.ceil(v.waitMs / 1000)));
      throw new TooManyRequestsException(`too many failed sign-in attempts; try again in ${describeWait(seconds)}`, seconds);
    }
    return {
      // A success forgets the account's failures and takes this attempt back from the shared address.
      succeeded: () => this.guarded(async () => {
        await this.gate.clear(account);
        if (address) await this.gate.refund(address);
      }),
    };
  }
}

function describeWait(seconds: number): string {
  if (seconds < 60) return `${seconds} second${seconds === 1 ? '' : 's'}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}
