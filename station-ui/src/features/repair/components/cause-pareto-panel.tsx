import { CompositeChart } from '@mantine/charts';
import { Group, Skeleton, Stack, Text, TextInput } from '@mantine/core';
import { useState } from 'react';
import { ErrorNotice } from '@/components/errors/error-notice';
import { CauseParetoTable } from '@/components/pareto/cause-pareto-table';
import { useRepairPareto } from '../api/get-repair-pareto';

/** Pareto by repair cause: bars largest first with the cumulative percentage, for the queue's lot and a date range. */
export function CauseParetoPanel({ lotId }: { lotId?: number }) {
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const pareto = useRepairPareto({ lotId: lotId ? String(lotId) : undefined, from: from || undefined, to: to || undefined });
  const bars = pareto.data?.bars ?? [];
  const data = bars.map((b) => ({ label: b.label, Repairs: b.count, 'Cumulative %': Number(b.cumulativePercent.toFixed(1)) }));
  return (
    <Stack gap="sm">
      <Group gap="sm" align="flex-end" wrap="wrap">
        <TextInput type="date" label="Recorded from" w={170} value={from} max={to || undefined} onChange={(e) => setFrom(e.currentTarget.value)} />
        <TextInput type="date" label="to (inclusive)" w={170} value={to} min={from || undefined} onChange={(e) => setTo(e.currentTarget.value)} />
        {pareto.data && (
          <Text size="sm" c="dimmed" pb={6}>
            <Text span ff="monospace">{pareto.data.records}</Text> repair {pareto.data.records === 1 ? 'record' : 'records'}
            {lotId ? ' in the chosen lot' : ''}; a corrected record counts through its correction
          </Text>
        )}
      </Group>
      {pareto.isPending && <Skeleton h={220} />}
      {pareto.isError && <ErrorNotice error={pareto.error} title="The Pareto by cause could not be loaded" onRetry={() => void pareto.refetch()} />}
      {pareto.data && bars.length === 0 && <Text c="dimmed">No repair records in this selection.</Text>}
      {bars.length > 0 && (
        <>
          <CompositeChart
            h={240}
            data={data}
            dataKey="label"
            withRightYAxis
            rightYAxisProps={{ domain: [0, 100] }}
            rightYAxisLabel="Cumulative (%)"
            yAxisLabel="Repairs"
            series={[
              { name: 'Repairs', color: 'copper.6', type: 'bar' },
              { name: 'Cumulative %', color: 'graphite.7', type: 'line', yAxisId: 'right' },
            ]}
            xAxisProps={{ interval: 0, tickFormatter: (v: string) => (v.length > 16 ? `${v.slice(0, 15)}…` : v) }}
            yAxisProps={{ allowDecimals: false }}
            withLegend
            aria-label="Pareto by cause chart"
          />
          <CauseParetoTable bars={bars} label="Pareto by cause" />
        </>
      )}
    </Stack>
  );
}
