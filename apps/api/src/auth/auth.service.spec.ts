import { ServiceUnavailableException, UnauthorizedException } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import { hashSync } from 'bcryptjs';
import { AttemptGate, backoffDelayMs, UsersStore, type BackoffPolicy, type GateVerdict, type UserEntity } from '@psiform/server';
import { TooManyRequestsException } from '../common/too-many-requests.exception';
import { AuthService } from './auth.service';
import { LoginThrottle, type LoginThrottlePolicy } from './login-throttle';
import { notUsed } from '../../test/not-used';

/** In-memory gate with a hand-driven clock (ms), following the rule of attempt-gate.ts (backoffDelayMs). */
class FakeGate extends AttemptGate {
  now = 0;
  readonly state = new Map<string, { n: number; next: number; forgetAt: number }>();
  fail?: Error;
  async acquire(key: string, p: BackoffPolicy): Promise<GateVerdict> {
    if (this.fail) throw this.fail;
    let s = this.state.get(key);
    if (s && s.forgetAt <= this.now) s = undefined;
    if (s && this.now < s.next) return { allowed: false, attempts: s.n, waitMs: s.next - this.now };
    const n = (s?.n ?? 0) + 1;
    const delay = backoffDelayMs(n, p);
    this.state.set(key, { n, next: this.now + delay, forgetAt: this.now + p.memoryMs + delay });
    return { allowed: true, attempts: n, waitMs: delay };
  }
  async refund(key: string): Promise<void> {
    const s = this.state.get(key);
    if (s && s.n > 0) s.n -= 1;
  }
  async clear(key: string): Promise<void> {
    this.state.delete(key);
  }
  count(key: string): number {
    return this.state.get(key)?.n ?? 0;
  }
}

const POLICY: LoginThrottlePolicy = {
  account: { freeAttempts: 5, baseDelayMs: 1000, maxDelayMs: 900_000, memoryMs: 3600_000 },
  address: { freeAttempts: 8, baseDelayMs: 1000, maxDelayMs: 900_000, memoryMs: 3600_000 },
  storeTimeoutMs: 200,
};

const PASSWORD = 'correct horse battery';
const user: UserEntity = {
  id: '00000000-0000-4000-8000-000000000001',
  email: 'mira@example.test',
  displayName: 'Mira',
  role: 'editor',
  passwordHash: hashSync(PASSWORD, 4),
  active: true,
  tokensValidAfter: null,
  createdAt: new Date('2026-01-01T00:00:00Z'),
};
const deactivated: UserEntity = { ...user, id: '00000000-0000-4000-8000-000000000002', email: 'gone@example.test', active: false };
const invited: UserEntity = { ...user, id: '00000000-0000-4000-8000-000000000003', email: 'new@example.test', passwordHash: null };
const everyone = [user, deactivated, invited];

class FakeUsers extends UsersStore {
  async findById(id: string) {
    return everyone.find((u) => u.id === id) ?? null;
  }
  async findByEmail(email: string) {
    return everyone.find((u) => u.email === email) ?? null;
  }
  async findAll() {
    return everyone;
  }
  insert = notUsed;
  page = notUsed;
  findUsableLink = notUsed;
  lastLinkSentAt = notUsed;
  transaction = notUsed;
}

const jwt = new JwtService({ secret: 's'.repeat(32), signOptions: { expiresIn: '1h' } });

function setup(trustProxy: false | string[] = false) {
  const gate = new FakeGate();
  const auth = new AuthService(new FakeUsers(), jwt, new LoginThrottle(gate, { http: { trustProxy } as never }, POLICY));
  return { gate, auth };
}

async function failures(auth: AuthService, n: number, email = user.email, ip = '10.0.0.1') {
  for (let i = 0; i < n; i++) await expect(auth.login(email, 'wrong password', ip)).rejects.toBeInstanceOf(UnauthorizedException);
}

describe('AuthService.login', () => {
  jest.setTimeout(30_000); // bcrypt on a loaded machine
  it('refuses a deactivated account (after its password) and an invited one without a password', async () => {
    const { auth } = setup();
    await expect(auth.login(deactivated.email, PASSWORD, '10.0.0.2')).rejects.toThrow('this account is deactivated; ask an administrator');
    await expect(auth.login(deactivated.email, 'wrong password', '10.0.0.2')).rejects.toThrow('email or password is incorrect');
    await expect(auth.login(invited.email, PASSWORD, '10.0.0.2')).rejects.toThrow('email or password is incorrect');
  });

  it('returns a token whose subject is the user, and the user without its hash', async () => {
    const { auth } = setup();
    const res = await auth.login('  MIRA@example.test ', PASSWORD, '10.0.0.1');
    expect(res.user).toEqual({ id: user.id, email: user.email, displayName: 'Mira', role: 'editor', createdAt: '2026-01-01T00:00:00.000Z' });
    expect(res.user).not.toHaveProperty('passwordHash');
    const payload = jwt.verify<{ sub: string; role: string }>(res.accessToken);
    expect(payload.sub).toBe(user.id);
    expect(payload.role).toBe('editor');
  });

  it('rejects a wrong password and an unknown email with the same 401', async () => {
    const { auth } = setup();
    await expect(auth.login(user.email, 'nope', '10.0.0.1')).rejects.toThrow('email or password is incorrect');
    await expect(auth.login('ghost@example.test', PASSWORD, '10.0.0.1')).rejects.toThrow('email or password is incorrect');
  });

  it('5 free attempts, then waits of 1 s, 2 s, 4 s …: a back-off, not a lock (the right password works after the wait)', async () => {
    const { auth, gate } = setup();
    await failures(auth, 5, user.email, '10.0.0.1');
    const err = await auth.login(user.email, PASSWORD, '10.0.0.2').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(TooManyRequestsException);
    expect((err as TooManyRequestsException).getStatus()).toBe(429);
    expect((err as TooManyRequestsException).retryAfterSeconds).toBe(1);
    expect((err as TooManyRequestsException).message).toBe('too many failed sign-in attempts; try again in 1 second');
    gate.now = 1000;
    await failures(auth, 1); // the 6th counted attempt: the next waits 2 s
    gate.now = 2999;
    await expect(auth.login(user.email, PASSWORD, '10.0.0.1')).rejects.toBeInstanceOf(TooManyRequestsException);
    gate.now = 3000;
    await expect(auth.login(user.email, PASSWORD, '10.0.0.1')).resolves.toHaveProperty('accessToken');
    expect(gate.count(`login:email:${user.email}`)).toBe(0);
  });

  it('refused attempts are not counted: a flood while waiting does not lengthen the wait', async () => {
    const { auth, gate } = setup();
    await failures(auth, 5);
    for (let i = 0; i < 50; i++) await expect(auth.login(user.email, 'guess', '10.0.0.1')).rejects.toBeInstanceOf(TooManyRequestsException);
    expect(gate.count(`login:email:${user.email}`)).toBe(5);
    gate.now = 1000;
    await expect(auth.login(user.email, PASSWORD, '10.0.0.1')).resolves.toHaveProperty('accessToken');
  });

  it('the wait doubles up to the 15-minute cap and never beyond', async () => {
    const { auth, gate } = setup();
    const waits: number[] = [];
    for (let i = 0; i < 40; i++) {
      const r = await auth.login(user.email, 'x', '10.0.0.1').catch((e: unknown) => e);
      if (r instanceof TooManyRequestsException) {
        waits.push(r.retryAfterSeconds);
        gate.now += r.retryAfterSeconds * 1000; // wait exactly as told
      } else expect(r).toBeInstanceOf(UnauthorizedException);
    }
    expect(waits.slice(0, 10)).toEqual([1, 2, 4, 8, 16, 32, 64, 128, 256, 512]);
    expect(Math.max(...waits)).toBe(900);
  });

  it('parallel guesses: only the free attempts reach the password check', async () => {
    const { auth } = setup();
    const results = await Promise.all(Array.from({ length: 30 }, () => auth.login(user.email, 'parallel guess', '10.0.0.1').catch((e: unknown) => e)));
    expect(results.filter((r) => r instanceof UnauthorizedException)).toHaveLength(5);
    expect(results.filter((r) => r instanceof TooManyRequestsException)).toHaveLength(25);
  });

  it('counts per client address only behind a configured trust proxy', async () => {
    const direct = setup(false);
    for (let i = 0; i < 12; i++) await failures(direct.auth, 1, `guess${i}@example.test`, '10.0.0.7');
    await expect(direct.auth.login(user.email, PASSWORD, '10.0.0.7')).resolves.toHaveProperty('accessToken');
    expect(direct.gate.count('login:ip:10.0.0.7')).toBe(0);

    const proxied = setup(['loopback']);
    for (let i = 0; i < 8; i++) await failures(proxied.auth, 1, `guess${i}@example.test`, '10.0.0.7');
    const err = await proxied.auth.login(user.email, PASSWORD, '10.0.0.7').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(TooManyRequestsException);
    expect(proxied.gate.count(`login:email:${user.email}`)).toBe(0); // the refusal was not counted against the account
    await expect(proxied.auth.login(user.email, PASSWORD, '10.0.0.8')).resolves.toHaveProperty('accessToken');
  });

  it('a success behind a shared address takes its attempt back from the address', async () => {
    const { auth, gate } = setup(['loopback']);
    for (let i = 0; i < 20; i++) await auth.login(user.email, PASSWORD, '10.0.0.5');
    expect(gate.count('login:ip:10.0.0.5')).toBe(0);
  });

  it('email counting ignores case and surrounding spaces', async () => {
    const { auth } = setup();
    await failures(auth, 3, 'MIRA@example.test', '10.0.0.1');
    await failures(auth, 2, ' mira@EXAMPLE.test ', '10.0.0.2');
    await expect(auth.login(user.email, PASSWORD, '10.0.0.3')).rejects.toBeInstanceOf(TooManyRequestsException);
  });

  it('answers 503 (fails closed) when the attempt store is unreachable or stalls', async () => {
    const { auth, gate } = setup();
    gate.fail = new Error('connect ECONNREFUSED');
    await expect(auth.login(user.email, PASSWORD, '10.0.0.1')).rejects.toBeInstanceOf(ServiceUnavailableException);
    gate.fail = undefined;
    gate.acquire = () => new Promise(() => undefined); // never answers
    const err = await auth.login(user.email, PASSWORD, '10.0.0.1').catch((e: unknown) => e); // would hang without the deadline
    expect(err).toBeInstanceOf(ServiceUnavailableException);
    expect((err as Error).message).toMatch(/attempt store is not answering/);
  });
});
