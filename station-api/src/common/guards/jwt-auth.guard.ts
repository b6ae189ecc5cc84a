import { ExecutionContext, Injectable, UnauthorizedException } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { AuthGuard } from '@nestjs/passport';
import { IS_PUBLIC_KEY } from '../decorators/public.decorator';

/** Why passport refused the token, turned into a sentence a person can act on. */
export function describeTokenProblem(info: unknown): string {
  const name = (info as { name?: string } | undefined)?.name;
  const text = (info as { message?: string } | undefined)?.message ?? '';
  if (name === 'TokenExpiredError') return 'Your session has expired. Sign in again.';
  if (/no auth token/i.test(text)) {
    return 'Sign in first: this request carries no access token (send "Authorization: Bearer <token>").';
  }
  return 'The access token is not valid (altered, or issued by another server). Sign in again.';
}

/**
 * Registered app-wide: every HTTP route needs a valid bearer token unless it is marked `@Public()`.
 * Socket.io traffic is not checked here: the gateway verifies the same token at the handshake.
 */
@Injectable()
export class JwtAuthGuard extends AuthGuard('jwt') {
  constructor(private readonly reflector: Reflector) {
    super();
  }

  override canActivate(context: ExecutionContext) {
    if (context.getType() !== 'http') return true;
    const isPublic = this.reflector.getAllAndOverride<boolean>(IS_PUBLIC_KEY, [context.getHandler(), context.getClass()]);
    if (isPublic) return true;
    return super.canActivate(context);
  }

  override handleRequest<TUser>(err: unknown, user: TUser, info: unknown): TUser {
    // an error thrown by the strategy (e.g. account deactivated) already carries its own message
    if (err) throw err;
    if (!user) throw new UnauthorizedException(describeTokenProblem(info));
    return user;
  }
}
