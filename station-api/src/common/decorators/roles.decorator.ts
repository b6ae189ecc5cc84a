import { SetMetadata } from '@nestjs/common';
import type { Role } from '../../users/user.entity';

export const ROLES_KEY = 'railwright:roles';
/** Roles allowed on a route (any one of them suffices). */
export const Roles = (...roles: Role[]) => SetMetadata(ROLES_KEY, roles);
