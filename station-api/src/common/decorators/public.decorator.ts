import { SetMetadata } from '@nestjs/common';

export const IS_PUBLIC_KEY = 'railwright:isPublic';
/** Marks a route as reachable without signing in. Every other route needs a token and @Roles. */
export const Public = () => SetMetadata(IS_PUBLIC_KEY, true);
