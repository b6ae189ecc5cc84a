import { BarChart } from '@mantine/charts';
import { Alert, Group, Select, SimpleGrid, Skeleton, Stack, Table, Text } from '@mantine/core';
import { digitsToShow, formatFigure } from '@contract/value-format';
import { ErrorNotice } from '@/components/errors/error-notice';
import { useCapability, type CapabilityView, type IndexEstimate, type QuantitySelection } from '../api/get-capability';
import type { YieldFilters } from '../api/yield-filters';
import { indexText, ppmText } from './yield-format';

interface CapabilityPanelProps {
  filters: YieldFilters;
  selection: QuantitySelection;
  subgroupSize: number;
}

/** Histogram with the limits drawn, and the capability figures with their intervals. */
export function CapabilityPanel({ filters, selection, subgroupSize }: CapabilityPanelProps) {
  const cap = useCapability(filters, selection);
  if (cap.isPending) return <Skeleton h={320} />;
  if (cap.isError) return <ErrorNotice error={cap.error} title="Capability could not be computed" onRetry={() => void cap.refetch()} />;
  const v = cap.data;
  return (
    <Stack gap="sm">
      <Text size="sm" c="dimmed">
        {v.stepName} · <Text span ff="monospace">{v.n}</Text> values from judged runs
        {v.limitSets > 1 && ' · the limits changed inside this selection; the latest are shown'}
        {subgroupSize > 1 && ` · within σ from subgroups of ${subgroupSize}`}
      </Text>
      {v.problem && (
        <Alert color="signalAmber" variant="light" title="No capability figures">
          {v.problem}
        </Alert>
      )}
      <SimpleGrid cols={{ base: 1, lg: 2 }} spacing="lg">
        <CapabilityHistogram view={v} />
        {v.capability && <CapabilityFigures view={v} />}
      </SimpleGrid>
    </Stack>
  );
}

function CapabilityHistogram({ view }: { view: CapabilityView }) {
  const h = view.histogram;
  if (!h) return <Text c="dimmed">No values to draw.</Text>;
  const { lowLimit, highLimit, guardedLow, guardedHigh } = view.limits;
  const d = digitsToShow(view.quantity, view.unit, undefined, [lowLimit, highLimit, guardedLow, guardedHigh]);
  const data = h.counts.map((count, i) => ({ mid: (h.edges[i] + h.edges[i + 1]) / 2, Units: count }));
  const line = (x: number | null, label: string, color: string, dashed: boolean) =>
    x === null ? [] : [{ x, label: `${label} ${formatFigure(x, d)}`, color, strokeDasharray: dashed ? '4 4' : undefined, labelPosition: 'top' as const }];
  return (
    <div>
      <BarChart
        h={280}
        data={data}
        dataKey="mid"
        series={[{ name: 'Units', color: 'slate.5' }]}
        barChartProps={{ barCategoryGap: 0 }}
        xAxisProps={{
          type: 'number',
          domain: [h.edges[0], h.edges[h.edges.length - 1]],
          tickFormatter: (x: number) => formatFigure(x, d),
        }}
        xAxisLabel={`${view.name} (${view.unit})`}
        yAxisLabel="Units"
        referenceLines={[
          ...line(lowLimit, 'LSL', 'signalRed.7', false),
          ...line(highLimit, 'USL', 'signalRed.7', false),
          ...(guardedLow !== lowLimit ? line(guardedLow, 'guard', 'signalAmber.7', true) : []),
          ...(guardedHigh !== highLimit ? line(guardedHigh, 'guard', 'signalAmber.7', true) : []),
        ]}
        aria-label={`Histogram of ${view.name}`}
      />
      <Text size="xs" c="dimmed">
        Bins: {h.rule === 'sturges' ? 'Sturges' : 'Freedman–Diaconis'}, width {formatFigure(h.binWidth, d + 1)} {view.unit}. Solid red lines: specification
        limits; dashed amber: guarded acceptance limits.
      </Text>
    </div>
  );
}

function IndexRow({ name, est, note }: { name: string; est: IndexEstimate | null; note: string }) {
  return (
    <Table.Tr>
      <Table.Th scope="row">{name}</Table.Th>
      <Table.Td ff="monospace">{est ? indexText(est.value) : '—'}</Table.Td>
      <Table.Td ff="monospace" c="dimmed">{est ? `${indexText(est.lower)} – ${indexText(est.upper)}` : 'one-sided limit'}</Table.Td>
      <Table.Td c="dimmed" fz="xs">{note}</Table.Td>
    </Table.Tr>
  );
}

function CapabilityFigures({ view }: { view: CapabilityView }) {
  const c = view.capability!;
  const d = digitsToShow(view.quantity, view.unit, undefined, [view.limits.lowLimit, view.limits.highLimit]) + 1;
  return (
    <Stack gap="xs">
      <Group gap="xl">
        <Text size="sm">
          Mean <Text span ff="monospace" fw={600}>{formatFigure(c.mean, d)} {view.unit}</Text>
        </Text>
        <Text size="sm">
          σ within <Text span ff="monospace" fw={600}>{formatFigure(c.sigmaWithin, d)} {view.unit}</Text>
        </Text>
        <Text size="sm">
          σ overall <Text span ff="monospace" fw={600}>{formatFigure(c.sigmaOverall, d)} {view.unit}</Text>
        </Text>
      </Group>
      <Table aria-label="Capability indices">
        <Table.Thead>
          <Table.Tr>
            <Table.Th>Index</Table.Th>
            <Table.Th>Value</Table.Th>
            <Table.Th>95 % interval</Table.Th>
            <Table.Th>Method</Table.Th>
          </Table.Tr>
        </Table.Thead>
        <Table.Tbody>
          <IndexRow name="Cp" est={c.cp} note="σ within, chi-square" />
          <IndexRow name="Cpk" est={c.cpk} note="σ within, Bissell" />
          <IndexRow name="Pp" est={c.pp} note="σ overall, chi-square" />
          <IndexRow name="Ppk" est={c.ppk} note="σ overall, Bissell" />
        </Table.Tbody>
      </Table>
      <Table aria-label="Expected parts per million outside the limits">
        <Table.Thead>
          <Table.Tr>
            <Table.Th>Expected outside (ppm)</Table.Th>
            <Table.Th>below</Table.Th>
            <Table.Th>above</Table.Th>
            <Table.Th>total</Table.Th>
          </Table.Tr>
        </Table.Thead>
        <Table.Tbody>
          {([['with σ within', c.ppmWithin], ['with σ overall', c.ppmOverall]] as const).map(([label, p]) => (
            <Table.Tr key={label}>
              <Table.Th scope="row">{label}</Table.Th>
              <Table.Td ff="monospace">{view.limits.lowLimit === null ? 'no limit' : ppmText(p.below)}</Table.Td>
              <Table.Td ff="monospace">{view.limits.highLimit === null ? 'no limit' : ppmText(p.above)}</Table.Td>
              <Table.Td ff="monospace" fw={600}>{ppmText(p.total)}</Table.Td>
            </Table.Tr>
          ))}
        </Table.Tbody>
      </Table>
      <Text size="xs" c="dimmed">
        Normal model; the indices assume a stable process.{' '}
        {view.normalityPValue !== null &&
          `Anderson–Darling normality p-value ${view.normalityPValue < 0.001 ? '< 0.001' : view.normalityPValue.toFixed(3)}${view.normalityPValue < 0.05 ? ' — the values do not look normal, read ppm with care' : ''}.`}
      </Text>
    </Stack>
  );
}

/** The quantity picker the capability and control-chart panels share. */
export function QuantityPicker({
  choices,
  value,
  onChange,
  disabledReason,
}: {
  choices: { value: string; label: string; group: string }[];
  value: string | null;
  onChange: (v: string | null) => void;
  disabledReason: string | null;
}) {
  const groups = [...new Set(choices.map((c) => c.group))].map((g) => ({ group: g, items: choices.filter((c) => c.group === g).map(({ value: v, label }) => ({ value: v, label })) }));
  return (
    <Select
      label="Quantity"
      placeholder={disabledReason ?? 'Choose a measured quantity'}
      data={groups}
      value={value}
      onChange={onChange}
      searchable
      disabled={disabledReason !== null}
      w={{ base: '100%', sm: 420 }}
      nothingFoundMessage="No quantity matches"
    />
  );
}
