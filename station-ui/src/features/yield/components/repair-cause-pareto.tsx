import { Skeleton, Stack, Text } from '@mantine/core';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { ErrorNotice } from '@/components/errors/error-notice';
import { CauseParetoTable, type CauseParetoBar } from '@/components/pareto/cause-pareto-table';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { yieldQuery, yieldQueryRoot, type YieldFilters } from '../api/yield-filters';

/** `GET /api/repair-records/pareto` (H6, issue 12), typed by hand until the API types are regenerated. */
interface CausePareto {
  records: number;
  bars: CauseParetoBar[];
}

/**
 * Repair causes beside the failure Pareto: what repair found behind the failures, with the same lot, product
 * and date filters (a repair has no station, so the station filter does not apply here).
 */
export function RepairCausePareto({ filters }: { filters: YieldFilters }) {
  const { stationId: _station, ...rest } = yieldQuery(filters);
  const pareto = useQuery(
    queryOptions({
      queryKey: [...yieldQueryRoot, 'repair-causes', rest] as const,
      queryFn: ({ signal }) => api.get<CausePareto>(apiPaths.repairPareto, { query: rest, signal }),
    }),
  );
  return (
    <Stack gap="xs" mt="lg" component="section" aria-label="Repair causes">
      <Text fw={700}>
        Repair causes{' '}
        {pareto.data && (
          <Text span c="dimmed" fw={400} size="sm">
            ({pareto.data.records} repair {pareto.data.records === 1 ? 'record' : 'records'}
            {filters.stationId ? '; the station filter does not apply to repairs' : ''})
          </Text>
        )}
      </Text>
      {pareto.isPending && <Skeleton h={80} />}
      {pareto.isError && <ErrorNotice error={pareto.error} title="The repair causes could not be loaded" onRetry={() => void pareto.refetch()} />}
      {pareto.data && pareto.data.bars.length === 0 && <Text c="dimmed">No repair records in this selection.</Text>}
      {pareto.data && pareto.data.bars.length > 0 && (
        <CauseParetoTable bars={pareto.data.bars} label="Pareto by repair cause" />
      )}
    </Stack>
  );
}
