import { MantineProvider } from '@mantine/core';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render, type RenderOptions } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import type { ReactElement, ReactNode } from 'react';
import { MemoryRouter } from 'react-router-dom';
import type { Role } from '@/config/roles';
import { tokenStore } from '@/lib/api-client';
import { meQueryKey, type AuthUser } from '@/lib/auth';
import { theme } from '@/theme';

export interface RenderAppOptions extends Omit<RenderOptions, 'wrapper'> {
  /** Address the memory router starts at */
  route?: string;
  /** Signed-in person (stored token + cached "me"); null for nobody */
  signedInAs?: AuthUser | null;
  /** A stored token whose owner is not cached yet, so the app asks the (mocked) server */
  storedToken?: string;
}

/** A user with the given roles, for tests. */
export function makeUser(roles: Role[], overrides: Partial<AuthUser> = {}): AuthUser {
  return { id: 1, username: roles[0] ?? 'nobody', displayName: `Test ${roles.join(' ')}`, roles, active: true, ...overrides };
}

export function createTestQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: Infinity }, mutations: { retry: false } },
  });
}

/**
 * Renders like the app does: our theme with `env="test"` (no transitions, portals inline), a fresh
 * query cache and a memory router.
 */
export function renderApp(ui: ReactElement, { route = '/', signedInAs = null, storedToken, ...options }: RenderAppOptions = {}) {
  const queryClient = createTestQueryClient();
  if (signedInAs) {
    tokenStore.set('test-token');
    queryClient.setQueryData(meQueryKey, signedInAs);
  } else if (storedToken) {
    tokenStore.set(storedToken);
  } else {
    queryClient.setQueryData(meQueryKey, null);
  }
  const Wrapper = ({ children }: { children: ReactNode }) => (
    <MantineProvider theme={theme} env="test">
      <QueryClientProvider client={queryClient}>
        <MemoryRouter initialEntries={[route]}>{children}</MemoryRouter>
      </QueryClientProvider>
    </MantineProvider>
  );
  return { ...render(ui, { wrapper: Wrapper, ...options }), queryClient, user: userEvent.setup() };
}

/** A fetch answer with a JSON body. */
export function jsonResponse(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}
