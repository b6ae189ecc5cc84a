import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { UpdateUserDto } from '@/lib/api-schema';
import { meQueryKey } from '@/lib/auth';
import { usersQueryKey, type UserRow } from './get-users';

export type UpdateUserInput = { id: number } & UpdateUserDto;

export function updateUser({ id, ...changes }: UpdateUserInput): Promise<UserRow> {
  return api.patch<UserRow>(apiPaths.user(id), changes);
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateUser,
    onSuccess: async () => {
      await queryClient.invalidateQueries({ queryKey: usersQueryKey });
      // The admin may have changed their own name or roles.
      await queryClient.invalidateQueries({ queryKey: meQueryKey });
    },
  });
}
