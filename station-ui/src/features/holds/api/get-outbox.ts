import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { holdsQueryRoot, type OutboxMessage } from './types';

export function getOutbox(): Promise<OutboxMessage[]> {
  return api.get<OutboxMessage[]>(apiPaths.outbox);
}

export const outboxQueryOptions = () =>
  queryOptions({
    queryKey: [...holdsQueryRoot, 'outbox'],
    queryFn: getOutbox,
    // delivery (and its retries) happens after the hold: look again while something is still queued
    refetchInterval: (q) => (q.state.data?.some((m) => m.status === 'queued') ? 2_000 : false),
  });

export function useOutbox() {
  return useQuery(outboxQueryOptions());
}
