import { CompositeChart } from '@mantine/charts';
import { Anchor, Badge, Group, SegmentedControl, Skeleton, Stack, Table, Text, UnstyledButton } from '@mantine/core';
import { formatMeasured } from '@contract/value-format';
import { Link } from 'react-router-dom';
import { ErrorNotice } from '@/components/errors/error-notice';
import { paths } from '@/config/paths';
import { useFailurePareto, type ParetoDimension } from '../api/get-failure-pareto';
import { useParetoUnits } from '../api/get-pareto-units';
import type { YieldFilters } from '../api/yield-filters';
import classes from './quality.module.css';

interface ParetoPanelProps {
  filters: YieldFilters;
  by: ParetoDimension;
  onByChange: (by: ParetoDimension) => void;
  selected: string | null;
  onSelect: (key: string | null) => void;
}

/** Failure Pareto: bars of failing counts, largest first, with the cumulative percentage; a bar opens its units. */
export function ParetoPanel({ filters, by, onByChange, selected, onSelect }: ParetoPanelProps) {
  const pareto = useFailurePareto(filters, by);
  const bars = pareto.data?.bars ?? [];
  // long step names are cut to what fits under a bar; the table below gives them in full
  const maxLabel = Math.max(14, Math.floor(110 / Math.max(1, bars.length)));
  const data = bars.map((b) => ({ key: b.key, label: b.label, Failures: b.count, 'Cumulative %': Number(b.cumulativePercent.toFixed(1)) }));
  return (
    <Stack gap="sm">
      <Group justify="space-between">
        <SegmentedControl
          aria-label="Count failures by"
          value={by}
          onChange={(v) => {
            onByChange(v as ParetoDimension);
            onSelect(null);
          }}
          data={[
            { value: 'step', label: 'By step' },
            { value: 'quantity', label: 'By failing quantity' },
          ]}
        />
        {pareto.data && (
          <Text size="sm" c="dimmed">
            <Text span ff="monospace">{pareto.data.failedRuns}</Text> failing {pareto.data.failedRuns === 1 ? 'run' : 'runs'} · click a bar or a row to list its units
          </Text>
        )}
      </Group>
      {pareto.isPending && <Skeleton h={280} />}
      {pareto.isError && <ErrorNotice error={pareto.error} title="The failure Pareto could not be loaded" onRetry={() => void pareto.refetch()} />}
      {pareto.data && bars.length === 0 && <Text c="dimmed">No failing runs in this selection.</Text>}
      {bars.length > 0 && (
        <>
          <CompositeChart
            h={300}
            data={data}
            dataKey="label"
            withRightYAxis
            rightYAxisProps={{ domain: [0, 100] }}
            rightYAxisLabel="Cumulative (%)"
            yAxisLabel="Failures"
            series={[
              { name: 'Failures', color: 'signalRed.6', type: 'bar' },
              { name: 'Cumulative %', color: 'graphite.7', type: 'line', yAxisId: 'right' },
            ]}
            xAxisProps={{ interval: 0, tickFormatter: (v: string) => (v.length > maxLabel ? `${v.slice(0, maxLabel - 1)}…` : v) }}
            yAxisProps={{ allowDecimals: false }}
            className={classes.chart}
            barProps={{ cursor: 'pointer', onClick: (_d: unknown, index: number) => onSelect(bars[index]?.key ?? null) }}
            withLegend
            aria-label="Failure Pareto chart"
          />
          <Table aria-label="Failure Pareto" highlightOnHover>
            <Table.Thead>
              <Table.Tr>
                <Table.Th>{by === 'step' ? 'Step' : 'Quantity'}</Table.Th>
                <Table.Th>Failures</Table.Th>
                <Table.Th>Share</Table.Th>
                <Table.Th>Cumulative</Table.Th>
              </Table.Tr>
            </Table.Thead>
            <Table.Tbody>
              {bars.map((b) => (
                <Table.Tr key={b.key} bg={selected === b.key ? 'var(--mantine-color-copper-light)' : undefined}>
                  <Table.Td>
                    <UnstyledButton onClick={() => onSelect(selected === b.key ? null : b.key)} aria-pressed={selected === b.key} td="underline">
                      {b.label}
                    </UnstyledButton>
                  </Table.Td>
                  <Table.Td ff="monospace">{b.count}</Table.Td>
                  <Table.Td ff="monospace">{b.percent.toFixed(1)} %</Table.Td>
                  <Table.Td ff="monospace">{b.cumulativePercent.toFixed(1)} %</Table.Td>
                </Table.Tr>
              ))}
            </Table.Tbody>
          </Table>
        </>
      )}
      {selected && <ParetoUnits filters={filters} by={by} barKey={selected} />}
    </Stack>
  );
}

function ParetoUnits({ filters, by, barKey }: { filters: YieldFilters; by: ParetoDimension; barKey: string }) {
  const units = useParetoUnits(filters, by, barKey);
  if (units.isPending) return <Skeleton h={120} />;
  if (units.isError) return <ErrorNotice error={units.error} title="The units behind this bar could not be loaded" onRetry={() => void units.refetch()} />;
  const v = units.data;
  return (
    <section aria-label={`Units behind ${v.label}`}>
      <Text fw={700} mb={4}>
        Units behind “{v.label}”{' '}
        <Text span c="dimmed" fw={400} size="sm">
          ({v.total > v.units.length ? `newest ${v.units.length} of ${v.total}` : `${v.total}`} failing measurements)
        </Text>
      </Text>
      <Table.ScrollContainer minWidth={720}>
        <Table striped aria-label="Units behind the bar">
          <Table.Thead>
            <Table.Tr>
              <Table.Th>Serial</Table.Th>
              <Table.Th>Run</Table.Th>
              <Table.Th>Quantity</Table.Th>
              <Table.Th>Value</Table.Th>
              <Table.Th>Limits</Table.Th>
              <Table.Th>Result</Table.Th>
            </Table.Tr>
          </Table.Thead>
          <Table.Tbody>
            {v.units.map((u, i) => {
              const f = formatMeasured({ quantity: u.quantity, unit: u.unit, value: u.value, lowLimit: u.lowLimit, highLimit: u.highLimit, guardedLow: u.guardedLow, guardedHigh: u.guardedHigh });
              return (
                <Table.Tr key={`${u.runId}-${i}`}>
                  <Table.Td>
                    <Anchor component={Link} to={paths.runDetail.href(u.runId)} ff="monospace">
                      {u.serial}
                    </Anchor>
                  </Table.Td>
                  <Table.Td ff="monospace">
                    #{u.runId} · attempt {u.attempt}
                  </Table.Td>
                  <Table.Td>{u.quantityName}</Table.Td>
                  <Table.Td ff="monospace">
                    {f.value} {f.unit}
                  </Table.Td>
                  <Table.Td ff="monospace">
                    {f.spec}
                    {f.accept && <Text size="xs" c="dimmed">accept {f.accept}</Text>}
                  </Table.Td>
                  <Table.Td>
                    <Badge color="signalRed" variant="light">
                      {u.verdict === 'guard_fail' ? 'FAIL · inside spec, outside guard band' : 'FAIL'}
                    </Badge>
                  </Table.Td>
                </Table.Tr>
              );
            })}
          </Table.Tbody>
        </Table>
      </Table.ScrollContainer>
    </section>
  );
}
