import { useMutation } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';

export interface ResetPasswordInput {
  id: number;
  password: string;
}

export function resetPassword({ id, password }: ResetPasswordInput): Promise<unknown> {
  return api.post<unknown>(apiPaths.userPassword(id), { password });
}

export function useResetPassword() {
  return useMutation({ mutationFn: resetPassword });
}
