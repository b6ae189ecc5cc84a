import { Module } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { APP_GUARD } from '@nestjs/core';
import { JwtModule } from '@nestjs/jwt';
import { PassportModule } from '@nestjs/passport';
import { ThrottlerModule } from '@nestjs/throttler';
import { JwtAuthGuard } from '../common/guards/jwt-auth.guard';
import { RolesGuard } from '../common/guards/roles.guard';
import { EnvironmentVariables, requireJwtSecret } from '../config/env.validation';
import { AuthController } from './auth.controller';
import { AuthService, TOKEN_LIFETIME_S } from './auth.service';
import { JwtStrategy } from './jwt.strategy';
import { LoginThrottlerGuard } from './login-throttler.guard';
import { tokenLifetimeS } from './token-lifetime';

type Config = ConfigService<EnvironmentVariables, true>;

@Module({
  imports: [
    PassportModule,
    JwtModule.registerAsync({
      inject: [ConfigService],
      useFactory: (config: Config) => ({
        secret: requireJwtSecret({ JWT_SECRET: config.get('JWT_SECRET', { infer: true }) }),
        signOptions: { expiresIn: tokenLifetimeS(config.get('JWT_EXPIRES_IN', { infer: true })), algorithm: 'HS256' },
        verifyOptions: { algorithms: ['HS256'] },
      }),
    }),
    // options and storage only; the guard is put on the login route alone (see LoginThrottlerGuard)
    ThrottlerModule.forRootAsync({
      inject: [ConfigService],
      useFactory: (config: Config) => [{ ttl: 60_000, limit: config.get('LOGIN_ATTEMPTS_PER_MINUTE', { infer: true }) }],
    }),
  ],
  controllers: [AuthController],
  providers: [
    AuthService,
    JwtStrategy,
    LoginThrottlerGuard,
    {
      provide: TOKEN_LIFETIME_S,
      inject: [ConfigService],
      useFactory: (config: Config) => tokenLifetimeS(config.get('JWT_EXPIRES_IN', { infer: true })),
    },
    // order matters: authenticate first, then check roles
    { provide: APP_GUARD, useClass: JwtAuthGuard },
    { provide: APP_GUARD, useClass: RolesGuard },
  ],
  exports: [AuthService],
})
export class AuthModule {}
