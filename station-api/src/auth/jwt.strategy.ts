import { Inject, Injectable } from '@nestjs/common';
import { ConfigService } from '@nestjs/config';
import { PassportStrategy } from '@nestjs/passport';
import { ExtractJwt, Strategy } from 'passport-jwt';
import type { AuthUser } from '../common/decorators/current-user.decorator';
import { EnvironmentVariables, requireJwtSecret } from '../config/env.validation';
import { AuthService, BoardTokenPayload, TokenPayload } from './auth.service';

/** Bearer-token strategy used by JwtAuthGuard. */
@Injectable()
export class JwtStrategy extends PassportStrategy(Strategy, 'jwt') {
  constructor(
    config: ConfigService<EnvironmentVariables, true>,
    @Inject(AuthService) private readonly auth: AuthService,
  ) {
    super({
      jwtFromRequest: ExtractJwt.fromAuthHeaderAsBearerToken(),
      secretOrKey: requireJwtSecret({ JWT_SECRET: config.get('JWT_SECRET', { infer: true }) }),
      ignoreExpiration: false,
      algorithms: ['HS256'],
    });
  }

  /** Signature and expiry are already checked; this re-checks the account and reads its current roles. */
  validate(payload: TokenPayload | BoardTokenPayload): Promise<AuthUser> {
    return this.auth.principalOf(payload);
  }
}
