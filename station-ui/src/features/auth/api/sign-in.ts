import { useMutation, useQueryClient } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api, tokenStore } from '@/lib/api-client';
import { meQueryKey, type AuthUser } from '@/lib/auth';

export interface SignInInput {
  username: string;
  password: string;
}

/** `POST /api/auth/login` answer (docs/architecture.md, Auth API). */
export interface SignInResult {
  accessToken: string;
  /** Token lifetime in seconds */
  expiresIn: number;
  user: AuthUser;
}

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
