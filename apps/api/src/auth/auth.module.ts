import { Module } from '@nestjs/common';
import { APP_GUARD } from '@nestjs/core';
import { JwtModule } from '@nestjs/jwt';
import { PassportModule } from '@nestjs/passport';
import { ThrottlerModule } from '@nestjs/throttler';
import { RateLimitGuard, rateLimitOptions } from './rate-limit';
import { APP_CONFIG, type AppConfig } from '@psiform/server';
import { UsersModule } from '../users/users.module';
import { AuthController } from './auth.controller';
import { AuthService } from './auth.service';
import { JwtStrategy } from './jwt.strategy';
import { LoginThrottle } from './login-throttle';
import { AccessGuard } from './access.guard';
import { PassportJwtAuthenticator, RequestAuthenticator } from './request-authenticator';

@Module({
  imports: [
    UsersModule,
    PassportModule,
    ThrottlerModule.forRootAsync({ inject: [APP_CONFIG], useFactory: (config: AppConfig) => rateLimitOptions(config) }),
    JwtModule.registerAsync({
      inject: [APP_CONFIG],
      useFactory: (config: AppConfig) => ({
        secret: config.jwt.secret,
        // Validated in config.ts to the `ms` duration format jsonwebtoken accepts.
        signOptions: { expiresIn: config.jwt.ttl as `${number}h`, algorithm: 'HS256' },
      }),
    }),
  ],
  controllers: [AuthController],
  providers: [
    AuthService,
    JwtStrategy,
    LoginThrottle,
    { provide: RequestAuthenticator, useClass: PassportJwtAuthenticator },
    { provide: APP_GUARD, useClass: AccessGuard },
    { provide: APP_GUARD, useClass: RateLimitGuard }, // after AccessGuard: it counts signed-in callers by account
  ],
})
export class AuthModule {}
