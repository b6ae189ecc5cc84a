import { LineChart } from '@mantine/charts';
import { Text } from '@mantine/core';
import type { YieldGroup } from '../api/get-yield-figures';

/** First-pass and final yield per day, in percent. */
export function TrendChart({ days }: { days: YieldGroup[] }) {
  if (days.length === 0) return <Text c="dimmed">No judged units in this selection.</Text>;
  const data = days.map((d) => ({
    day: d.label,
    FPY: d.firstPass.estimate === null ? null : Number((100 * d.firstPass.estimate).toFixed(1)),
    'Final yield': d.final.estimate === null ? null : Number((100 * d.final.estimate).toFixed(1)),
    units: d.unitsTested,
  }));
  // start the axis at the next 10 % below the lowest day, so a dip is visible without exaggerating it
  const lowest = Math.min(...data.flatMap((d) => [d.FPY ?? 100, d['Final yield'] ?? 100]));
  const floor = Math.max(0, Math.floor((lowest - 1) / 10) * 10);
  return (
    <LineChart
      h={260}
      data={data}
      dataKey="day"
      series={[
        { name: 'FPY', color: 'copper.6' },
        { name: 'Final yield', color: 'slate.6' },
      ]}
      unit=" %"
      yAxisProps={{ domain: [floor, 100], allowDecimals: false }}
      yAxisLabel="Yield (%)"
      withLegend
      curveType="linear"
      aria-label="Daily yield trend"
    />
  );
}
