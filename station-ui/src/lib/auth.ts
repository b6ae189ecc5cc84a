import { queryOptions, useQuery, type QueryClient } from '@tanstack/react-query';
import { apiPaths, pages, type PageDef } from '@/config/paths';
import type { Role } from '@/config/roles';
import { api, tokenStore } from './api-client';
import type { UserDto } from './api-schema';

/** The signed-in person, as `GET /api/auth/me` returns them (the server's UserDto). */
export type AuthUser = UserDto;

const SESSION_ENDED = 'Your session has ended. Sign in again to carry on where you were.';
let sessionNoticeText: string | null = null;

/**
 * The sentence the sign-in page shows when a session ended under someone's hands (expired token,
 * account deactivated). Kept here rather than in router state because two redirects race for that
 * navigation (the API client's and the shell's); both land on the same address, and this survives either.
 */
export const sessionNotice = {
  get: (): string | null => sessionNoticeText,
  /** `reason` is the server's explanation when it is worth showing (a deactivated account). */
  set: (reason?: string): void => {
    sessionNoticeText = reason ?? SESSION_ENDED;
  },
  clear: (): void => {
    sessionNoticeText = null;
  },
};

export const meQueryKey = ['auth', 'me'] as const;

/** Who is signed in; `null` when no token is stored (no request is made then). */
export async function fetchMe(): Promise<AuthUser | null> {
  if (!tokenStore.get()) return null;
  return api.get<AuthUser>(apiPaths.me);
}

export const meQueryOptions = () =>
  queryOptions({
    queryKey: meQueryKey,
    queryFn: fetchMe,
    // The user's roles change rarely; an admin's edit takes effect at the next sign-in or reload.
    staleTime: 5 * 60_000,
  });

export function useUser(options: { enabled?: boolean } = {}) {
  return useQuery({ ...meQueryOptions(), enabled: options.enabled ?? true });
}

/** True when the user holds at least one of `allowed`. */
export function hasAnyRole(user: Pick<AuthUser, 'roles'> | null | undefined, allowed: readonly Role[]): boolean {
  return !!user && user.roles.some((r) => allowed.includes(r));
}

export function canOpen(user: Pick<AuthUser, 'roles'> | null | undefined, target: Pick<PageDef, 'roles'>): boolean {
  return hasAnyRole(user, target.roles);
}

/**
 * Where a user lands after signing in. With several roles the hands-on role wins: someone who may
 * run the station is most likely standing at one.
 */
const homeByRole: readonly [Role, PageDef][] = [
  ['operator', pages.station],
  ['engineer', pages.plans],
  ['quality', pages.quality],
  ['admin', pages.adminUsers],
];

export function homePathFor(user: Pick<AuthUser, 'roles'>): string {
  const hit = homeByRole.find(([role]) => user.roles.includes(role));
  return hit ? hit[1].href() : pages.board.href();
}

/**
 * Signs out on this screen: forgets the token and every cached answer (they belonged to the
 * previous person). The server keeps no session, so nothing is sent.
 */
export function clearSession(queryClient: QueryClient): void {
  tokenStore.clear();
  queryClient.setQueryData(meQueryKey, null);
  queryClient.removeQueries({ predicate: (q) => q.queryKey[0] !== meQueryKey[0] });
}
