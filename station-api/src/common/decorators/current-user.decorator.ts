import { createParamDecorator, ExecutionContext } from '@nestjs/common';
import type { Role } from '../../users/user.entity';

/** What a verified token says about its bearer. */
export interface AuthUser {
  id: number;
  username: string;
  displayName: string;
  roles: Role[];
  /** Set for a board display token: it opens GET /api/board and the board room only (no user behind it) */
  scope?: 'board';
}

export const CurrentUser = createParamDecorator((_data: unknown, ctx: ExecutionContext): AuthUser => {
  return ctx.switchToHttp().getRequest().user as AuthUser;
});
