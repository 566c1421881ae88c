import { Injectable, UnauthorizedException } from '@nestjs/common';
import { JwtService } from '@nestjs/jwt';
import type { LoginResponse } from '@psiform/contracts';
import { UsersStore, toUserDto } from '@psiform/server';
import { dummyPasswordHash, verifyPassword } from '../users/password';
import { LoginThrottle } from './login-throttle';
import type { JwtPayload } from './jwt.strategy';

@Injectable()
export class AuthService {
  constructor(
    private readonly users: UsersStore,
    private readonly jwt: JwtService,
    private readonly throttle: LoginThrottle,
  ) {}

  async login(emailInput: string, password: string, ip: string): Promise<LoginResponse> {
    const email = emailInput.trim().toLowerCase();
    const attempt = await this.throttle.admit(email, ip); // counted before the password is checked
    const user = await this.users.findByEmail(email);
    // Compare against a dummy hash for unknown emails so both paths take the same time.
    const ok = await verifyPassword(password, user?.passwordHash ?? (await dummyPasswordHash()));
    if (!user || !ok) throw new UnauthorizedException('email or password is incorrect');
    // Checked after the password, so the answer reveals the state only to someone who knows the password.
    if (!user.active) throw new UnauthorizedException('this account is deactivated; ask an administrator');
    await attempt.succeeded();
    const payload: JwtPayload = { sub: user.id, role: user.role, iatMs: Date.now() };
    return { accessToken: await this.jwt.signAsync(payload), user: toUserDto(user) };
  }
}
