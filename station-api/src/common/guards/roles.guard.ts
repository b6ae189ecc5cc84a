import { CanActivate, ExecutionContext, ForbiddenException, Injectable } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import type { Role } from '../../users/user.entity';
import type { AuthUser } from '../decorators/current-user.decorator';
import { IS_PUBLIC_KEY } from '../decorators/public.decorator';
import { ROLES_KEY } from '../decorators/roles.decorator';
import { boardDisplayMayUse } from '../route-policy';

/**
 * The decision itself, kept apart from Nest so it can be tested directly.
 * Fails closed: a route that names no role is refused even to an admin, so a forgotten `@Roles()`
 * shows up at once instead of silently opening the route to everyone signed in.
 */
export function checkRoles(required: readonly Role[] | undefined, user: Pick<AuthUser, 'roles'> | undefined): void {
  if (!required || required.length === 0) {
    throw new ForbiddenException({
      message: 'This route declares no role, so it is refused (fail closed). The route needs a @Roles() declaration.',
      details: { code: 'route_declares_no_role' },
    });
  }
  const held = user?.roles ?? [];
  if (!required.some((r) => held.includes(r))) {
    throw new ForbiddenException({
      message: `This needs one of the roles ${required.join(', ')}; you are signed in as ${held.join(', ') || 'no role'}.`,
      details: { code: 'missing_role', required },
    });
  }
}

/** Registered app-wide after JwtAuthGuard: checks the route's `@Roles()` against the signed-in user. */
@Injectable()
export class RolesGuard implements CanActivate {
  constructor(private readonly reflector: Reflector) {}

  canActivate(context: ExecutionContext): boolean {
    if (context.getType() !== 'http') return true;
    const targets = [context.getHandler(), context.getClass()];
    if (this.reflector.getAllAndOverride<boolean>(IS_PUBLIC_KEY, targets)) return true;
    const required = this.reflector.getAllAndOverride<Role[] | undefined>(ROLES_KEY, targets);
    const req = context.switchToHttp().getRequest<{ user?: AuthUser; method: string; route?: { path?: string } }>();
    if (req.user?.scope === 'board') {
      // a wall-screen token opens the board and nothing else, whatever @Roles says
      if (boardDisplayMayUse(req.method, req.route?.path)) return true;
      throw new ForbiddenException({
        message: 'A board display link opens the production board only. Sign in to use the rest of Railwright.',
        details: { code: 'board_display_only' },
      });
    }
    checkRoles(required, req.user);
    return true;
  }
}
