import { MantineProvider } from '@mantine/core';
import { QueryClientProvider, type QueryClient } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { queryClient as defaultQueryClient } from '@/lib/query-client';
import { theme } from '@/theme';

interface AppProviderProps {
  children: ReactNode;
  queryClient?: QueryClient;
}

/**
 * Theme and the query cache: everything a screen needs around it. The notifications host is mounted with the
 * app shell (router.tsx), so the sign-in page does not load it (issue 11).
 */
export function AppProvider({ children, queryClient = defaultQueryClient }: AppProviderProps) {
  return (
    <MantineProvider theme={theme} defaultColorScheme="light">
      <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>
    </MantineProvider>
  );
}
