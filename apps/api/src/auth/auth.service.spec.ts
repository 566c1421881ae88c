import { ServiceUnavailableException, UnauthorizedException } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import { hashSync } from 'bcryptjs';
import { AttemptCounter, type AttemptCount, UsersStore, type NewUser, type UserEntity } from '@psiform/server';
import { TooManyRequestsException } from '../common/too-many-requests.exception';
import { AuthService } from './auth.service';
import { LoginThrottle } from './login-throttle';

/** In-memory fixed-window counter with a hand-driven clock (seconds). */
class FakeCounter extends AttemptCounter {
  now = 0;
  readonly windows = new Map<string, { count: number; endsAt: number }>();
  private live(key: string) {
    const w = this.windows.get(key);
    if (w && w.endsAt <= this.now) this.windows.delete(key);
    return this.windows.get(key);
  }
  async peek(key: string): Promise<AttemptCount> {
    const w = this.live(key);
    return w ? { count: w.count, retryAfterSeconds: w.endsAt - this.now } : { count: 0, retryAfterSeconds: 0 };
  }
  async hit(key: string, windowSeconds: number): Promise<AttemptCount> {
    const w = this.live(key) ?? { count: 0, endsAt: this.now + windowSeconds };
    w.count += 1;
    this.windows.set(key, w);
    return { count: w.count, retryAfterSeconds: w.endsAt - this.now };
  }
  async clear(key: string): Promise<void> {
    this.windows.delete(key);
  }
}

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
  async insert(_: NewUser): Promise<UserEntity> {
    throw new Error('not used');
  }
  async page(): Promise<never> {
    throw new Error('not used');
  }
  async findUsableLink(): Promise<never> {
    throw new Error('not used');
  }
  async lastLinkSentAt(): Promise<never> {
    throw new Error('not used');
  }
  async transaction(): Promise<never> {
    throw new Error('not used');
  }
}

const jwt = new JwtService({ secret: 's'.repeat(32), signOptions: { expiresIn: '1h' } });

function setup() {
  const counter = new FakeCounter();
  const auth = new AuthService(new FakeUsers(), jwt, new LoginThrottle(counter, { maxFailures: 5, windowSeconds: 900 }));
  return { counter, auth };
}

async function failures(auth: AuthService, n: number, email = user.email, ip = '10.0.0.1') {
  for (let i = 0; i < n; i++) await expect(auth.login(email, 'wrong password', ip)).rejects.toBeInstanceOf(UnauthorizedException);
}

describe('AuthService.login', () => {
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

  it('after 5 failures for one email answers 429 with Retry-After, even for the right password', async () => {
    const { auth, counter } = setup();
    await failures(auth, 5, user.email, '10.0.0.1');
    counter.now = 60;
    const err = await auth.login(user.email, PASSWORD, '10.0.0.2').catch((e: unknown) => e);
    expect(err).toBeInstanceOf(TooManyRequestsException);
    expect((err as TooManyRequestsException).getStatus()).toBe(429);
    expect((err as TooManyRequestsException).retryAfterSeconds).toBe(840);
    expect((err as TooManyRequestsException).message).toMatch(/too many failed sign-in attempts; try again in 14 minutes/);
  });

  it('4 failures still allow a sign-in, which clears the email counter', async () => {
    const { auth, counter } = setup();
    await failures(auth, 4, user.email, '10.0.0.1');
    await expect(auth.login(user.email, PASSWORD, '10.0.0.9')).resolves.toHaveProperty('accessToken');
    expect((await counter.peek(`login:email:${user.email}`)).count).toBe(0);
    // the IP counter is not cleared by a success
    expect((await counter.peek('login:ip:10.0.0.1')).count).toBe(4);
    await failures(auth, 4, user.email, '10.0.0.3');
    await expect(auth.login(user.email, PASSWORD, '10.0.0.9')).resolves.toHaveProperty('accessToken');
  });

  it('after 5 failures from one IP (any emails) blocks that IP only', async () => {
    const { auth } = setup();
    for (let i = 0; i < 5; i++) await failures(auth, 1, `guess${i}@example.test`, '10.0.0.7');
    await expect(auth.login(user.email, PASSWORD, '10.0.0.7')).rejects.toBeInstanceOf(TooManyRequestsException);
    await expect(auth.login(user.email, PASSWORD, '10.0.0.8')).resolves.toHaveProperty('accessToken');
  });

  it('the window ends 15 minutes after the first failure', async () => {
    const { auth, counter } = setup();
    await failures(auth, 5);
    counter.now = 899;
    await expect(auth.login(user.email, PASSWORD, '10.0.0.1')).rejects.toBeInstanceOf(TooManyRequestsException);
    counter.now = 900;
    await expect(auth.login(user.email, PASSWORD, '10.0.0.1')).resolves.toHaveProperty('accessToken');
  });

  it('email counting ignores case and surrounding spaces', async () => {
    const { auth } = setup();
    await failures(auth, 3, 'MIRA@example.test', '10.0.0.1');
    await failures(auth, 2, ' mira@EXAMPLE.test ', '10.0.0.2');
    await expect(auth.login(user.email, PASSWORD, '10.0.0.3')).rejects.toBeInstanceOf(TooManyRequestsException);
  });

  it('answers 503 (fails closed) when the attempt counter is unreachable', async () => {
    const counter = new FakeCounter();
    counter.peek = () => Promise.reject(new Error('connect ECONNREFUSED'));
    const auth = new AuthService(new FakeUsers(), jwt, new LoginThrottle(counter));
    await expect(auth.login(user.email, PASSWORD, '10.0.0.1')).rejects.toBeInstanceOf(ServiceUnavailableException);
  });
});
