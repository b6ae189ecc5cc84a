import { MantineProvider } from '@mantine/core';
import { Notifications } from '@mantine/notifications';
import { QueryClientProvider, type QueryClient } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import { queryClient as defaultQueryClient } from '@/lib/query-client';
import { theme } from '@/theme';

interface AppProviderProps {
  children: ReactNode;
  queryClient?: QueryClient;
}

/** Theme, notifications and the query cache: everything a screen needs around it. */
export function AppProvider({ children, queryClient = defaultQueryClient }: AppProviderProps) {
  return (
    <MantineProvider theme={theme} defaultColorScheme="light">
      <Notifications position="top-right" autoClose={5000} />
      <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>
    </MantineProvider>
  );
}
