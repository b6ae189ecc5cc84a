import { createParamDecorator, ExecutionContext } from '@nestjs/common';
import type { Role } from '../../users/user.entity';

/** What a verified token says about its bearer. */
export interface AuthUser {
  id: number;
  username: string;
  displayName: string;
  roles: Role[];
}

export const CurrentUser = createParamDecorator((_data: unknown, ctx: ExecutionContext): AuthUser => {
  return ctx.switchToHttp().getRequest().user as AuthUser;
});
