import { useMutation } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import type { ResetPasswordDto } from '@/lib/api-schema';

export type ResetPasswordInput = { id: number } & ResetPasswordDto;

export function resetPassword({ id, password }: ResetPasswordInput): Promise<unknown> {
  return api.post<unknown>(apiPaths.userPassword(id), { password });
}

export function useResetPassword() {
  return useMutation({ mutationFn: resetPassword });
}
