import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import type { Role } from '@/config/roles';
import { api } from '@/lib/api-client';
import { usersQueryKey, type UserRow } from './get-users';

export interface CreateUserInput {
  username: string;
  displayName: string;
  password: string;
  roles: Role[];
}

export function createUser(input: CreateUserInput): Promise<UserRow> {
  return api.post<UserRow>(apiPaths.users, input);
}

export function useCreateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createUser,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: usersQueryKey }),
  });
}
