import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { holdsQueryRoot, type HoldAlert } from './types';

export function getHoldAlerts(): Promise<HoldAlert[]> {
  return api.get<HoldAlert[]>(apiPaths.holdAlerts);
}

export const holdAlertsQueryOptions = () => queryOptions({ queryKey: [...holdsQueryRoot, 'alerts'], queryFn: getHoldAlerts });

export function useHoldAlerts() {
  return useQuery(holdAlertsQueryOptions());
}
