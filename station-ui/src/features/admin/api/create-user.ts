import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { CreateUserDto } from '@/lib/api-schema';
import { usersQueryKey, type UserRow } from './get-users';

export type CreateUserInput = CreateUserDto;

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
