import { LineChart } from '@mantine/charts';
import { Alert, List, Paper, Skeleton, Stack, Text, ThemeIcon } from '@mantine/core';
import { formatFigure } from '@contract/value-format';
import { IconAlertTriangle } from '@tabler/icons-react';
import { ErrorNotice } from '@/components/errors/error-notice';
import type { QuantitySelection } from '../api/get-capability';
import { useControlChart, type ChartOptions, type ChartPanel, type RuleViolation } from '../api/get-control-chart';
import type { YieldFilters } from '../api/yield-filters';

interface ControlChartPanelProps {
  filters: YieldFilters;
  selection: QuantitySelection;
  options: ChartOptions;
}

const ruleSetNames = { 'western-electric': 'Western Electric rules', nelson: 'Nelson rules' } as const;

/** Digits for chart figures: enough to tell the limits apart. */
function digitsFor(p: ChartPanel): number {
  const spread = Math.abs(p.upper - p.lower);
  return spread > 0 ? Math.min(6, Math.max(1, 2 - Math.floor(Math.log10(spread)))) : 3;
}

function ChartTooltip({ payload, unit, findings, digits }: { payload?: readonly { payload?: Record<string, unknown> }[]; unit: string; findings: Map<number, RuleViolation[]>; digits: number }) {
  const row = payload?.[0]?.payload;
  if (!row) return null;
  const n = Number(row.n);
  const own = findings.get(n - 1) ?? [];
  return (
    <Paper withBorder shadow="sm" p="xs" maw={360}>
      <Text size="sm" fw={700}>
        Point {n}: <Text span ff="monospace">{formatFigure(Number(row.value), digits)} {unit}</Text>
      </Text>
      <Text size="xs" ff="monospace">{String(row.who)}</Text>
      {own.map((v) => (
        <Text key={v.rule + v.index} size="xs" c="signalRed.8">
          {v.rule}: {v.message}
        </Text>
      ))}
    </Paper>
  );
}

/** Shewhart chart of one quantity: individuals and moving range, or X̄ and R, with run-rule findings in words. */
export function ControlChartPanel({ filters, selection, options }: ControlChartPanelProps) {
  const chart = useControlChart(filters, selection, options);
  if (chart.isPending) return <Skeleton h={320} />;
  if (chart.isError) return <ErrorNotice error={chart.error} title="The control chart could not be drawn" onRetry={() => void chart.refetch()} />;
  const v = chart.data;
  if (!v.location || !v.spread) {
    return (
      <Alert color="signalAmber" variant="light" title="No chart">
        {v.problem}
      </Alert>
    );
  }
  // every point a finding rests on, so the chart marks the whole pattern and the tooltip names the rule
  const findings = new Map<number, RuleViolation[]>();
  for (const f of v.violations) for (const i of f.indices) findings.set(i, [...(findings.get(i) ?? []), f]);
  const d = digitsFor(v.location);
  const isX = v.kind === 'xbar-r';
  const locName = isX ? 'Subgroup mean' : 'Value';
  const data = v.location.points.map((p) => ({ n: p.index + 1, value: p.value, who: p.label }));
  // a range chart whose D3 is 0 has no lower limit to draw
  const limitLines = (p: ChartPanel, digits: number, alwaysLower: boolean) => [
    { y: p.upper, label: `UCL ${formatFigure(p.upper, digits)}`, color: 'signalRed.7', strokeDasharray: '6 4' },
    { y: p.centre, label: `CL ${formatFigure(p.centre, digits)}`, color: 'graphite.6' },
    ...(alwaysLower || p.lower > 0 ? [{ y: p.lower, label: `LCL ${formatFigure(p.lower, digits)}`, color: 'signalRed.7', strokeDasharray: '6 4' }] : []),
  ];
  const spreadData = v.spread.points.map((p) => ({ n: p.index + 1, value: p.value, who: p.label }));
  // a little room around the limits; a range is never negative, so its axis starts at 0
  const domainOf = (p: ChartPanel, values: number[], floorAtZero: boolean) => {
    const lo = Math.min(p.lower, ...values);
    const hi = Math.max(p.upper, ...values);
    const pad = (hi - lo) * 0.08 || 1;
    return [floorAtZero ? Math.max(0, lo - pad) : lo - pad, hi + pad];
  };
  return (
    <Stack gap="sm">
      <Text size="sm" c="dimmed">
        {isX ? `X̄–R chart, subgroups of ${v.subgroupSize} consecutive units` : 'Individuals and moving-range chart'} · {v.n} values, latest last ·{' '}
        {ruleSetNames[v.rules]} · limits from short-term (range) variation
      </Text>
      <LineChart
        h={280}
        data={data}
        dataKey="n"
        series={[{ name: 'value', label: locName, color: 'slate.7' }]}
        referenceLines={limitLines(v.location, d, true)}
        referenceDots={[...findings.keys()].map((i) => ({ x: i + 1, y: v.location!.points[i].value, r: 6, color: 'signalRed.6', stroke: 'none', ifOverflow: 'extendDomain' as const }))}
        yAxisProps={{ domain: domainOf(v.location, data.map((p) => p.value), false), tickFormatter: (x: number) => formatFigure(x, d) }}
        xAxisLabel={isX ? 'Subgroup' : 'Unit (run order)'}
        yAxisLabel={`${locName} (${v.unit})`}
        curveType="linear"
        withDots
        dotProps={{ r: 2 }}
        tooltipProps={{ content: ({ payload }) => <ChartTooltip payload={payload} unit={v.unit} findings={findings} digits={d} /> }}
        aria-label={`${isX ? 'X̄' : 'Individuals'} chart of ${v.name}`}
      />
      <LineChart
        h={160}
        data={spreadData}
        dataKey="n"
        series={[{ name: 'value', label: isX ? 'Range' : 'Moving range', color: 'slate.5' }]}
        referenceLines={limitLines(v.spread, d, false)}
        yAxisProps={{ domain: domainOf(v.spread, spreadData.map((p) => p.value), true), tickFormatter: (x: number) => formatFigure(x, d) }}
        yAxisLabel={`${isX ? 'Range' : 'Moving range'} (${v.unit})`}
        curveType="linear"
        withDots
        dotProps={{ r: 2 }}
        aria-label={`${isX ? 'Range' : 'Moving-range'} chart of ${v.name}`}
      />
      <section aria-label="Run-rule findings">
        <Text fw={700}>Run-rule findings ({v.violations.length + v.spread.signals.length})</Text>
        {v.violations.length + v.spread.signals.length === 0 ? (
          <Text c="dimmed" size="sm">
            No point breaks the {ruleSetNames[v.rules]}.
          </Text>
        ) : (
          <List
            size="sm"
            spacing={4}
            icon={
              <ThemeIcon color="signalRed" size={18} radius="sm" variant="light">
                <IconAlertTriangle size={12} aria-hidden />
              </ThemeIcon>
            }
          >
            {v.violations.map((f) => (
              <List.Item key={`${f.rule}-${f.index}`}>
                <Text span ff="monospace" fw={600}>{f.rule}</Text> {f.message} <Text span c="dimmed">({v.location!.points[f.index].label})</Text>
              </List.Item>
            ))}
            {v.spread.signals.map((s) => (
              <List.Item key={`range-${s.index}`}>
                <Text span ff="monospace" fw={600}>{isX ? 'R' : 'MR'}</Text> {s.message}
              </List.Item>
            ))}
          </List>
        )}
      </section>
    </Stack>
  );
}
