import { Skeleton, Stack, Table, Text } from '@mantine/core';
import { queryOptions, useQuery } from '@tanstack/react-query';
import { ErrorNotice } from '@/components/errors/error-notice';
import { apiPaths } from '@/config/paths';
import { api } from '@/lib/api-client';
import { yieldQuery, yieldQueryRoot, type YieldFilters } from '../api/yield-filters';

interface CauseBar {
  key: string;
  label: string;
  count: number;
  percent: number;
  cumulativePercent: number;
}

/** `GET /api/repair-records/pareto` (H6, issue 12), typed by hand until the API types are regenerated. */
interface CausePareto {
  records: number;
  bars: CauseBar[];
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
        <Table aria-label="Pareto by repair cause" striped>
          <Table.Thead>
            <Table.Tr>
              <Table.Th>Cause</Table.Th>
              <Table.Th ta="right">Repairs</Table.Th>
              <Table.Th ta="right">Share</Table.Th>
              <Table.Th ta="right">Cumulative</Table.Th>
            </Table.Tr>
          </Table.Thead>
          <Table.Tbody>
            {pareto.data.bars.map((b) => (
              <Table.Tr key={b.key}>
                <Table.Td>{b.label}</Table.Td>
                <Table.Td ff="monospace" ta="right">
                  {b.count}
                </Table.Td>
                <Table.Td ff="monospace" ta="right">
                  {b.percent.toFixed(1)} %
                </Table.Td>
                <Table.Td ff="monospace" ta="right">
                  {b.cumulativePercent.toFixed(1)} %
                </Table.Td>
              </Table.Tr>
            ))}
          </Table.Tbody>
        </Table>
      )}
    </Stack>
  );
}
