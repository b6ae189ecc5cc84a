import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api, tokenStore } from '@/lib/api-client';
import type { LoginDto, LoginResponseDto } from '@/lib/api-schema';
import { meQueryKey } from '@/lib/auth';

export type SignInInput = LoginDto;

/** `POST /api/auth/login` answer: token, its lifetime in seconds, and the user. */
export type SignInResult = LoginResponseDto;

export function signIn(input: SignInInput): Promise<SignInResult> {
  // A wrong password answers 401: that belongs on the form, not in the "session ended" path.
  return api.post<SignInResult>(apiPaths.login, input, { skipUnauthorizedRedirect: true });
}

/** Signs in, keeps the token and primes the "who am I" cache so the shell needs no second request. */
export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (result) => {
      tokenStore.set(result.accessToken);
      queryClient.setQueryData(meQueryKey, result.user);
    },
  });
}
