import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { UserDto } from '@/lib/api-schema';

/** A user as the admin list shows it (`GET /api/users`). */
export type UserRow = UserDto;

export const usersQueryKey = ['admin', 'users'] as const;

export async function getUsers(): Promise<UserRow[]> {
  // The contract does not fix list or page shape; accept both a bare array and {items}.
  const body = await api.get<UserRow[] | { items: UserRow[] }>(apiPaths.users);
  const rows = Array.isArray(body) ? body : body.items;
  return [...rows].sort((a, b) => a.username.localeCompare(b.username));
}

export const usersQueryOptions = () => queryOptions({ queryKey: usersQueryKey, queryFn: getUsers });

export function useUsers() {
  return useQuery(usersQueryOptions());
}
