import { Badge, Group, Paper, Select, Skeleton, Stack, Text, Title } from '@mantine/core';
import { useEffect, useMemo, useState, type ReactNode } from 'react';
import { useSearchParams } from 'react-router-dom';
import { ErrorNotice } from '@/components/errors/error-notice';
import { PageHeader } from '@/components/layout/page-header';
import type { QuantitySelection } from '../api/get-capability';
import type { RuleSet } from '../api/get-control-chart';
import type { ParetoDimension } from '../api/get-failure-pareto';
import { useQuantities } from '../api/get-quantities';
import { useYieldFigures, type BreakdownDimension } from '../api/get-yield-figures';
import { yieldFiltersFromParams, type YieldFilters } from '../api/yield-filters';
import { useYieldLive } from '../hooks/use-yield-live';
import { BreakdownTable } from './breakdown-table';
import { CapabilityPanel, QuantityPicker } from './capability-panel';
import { ControlChartPanel } from './control-chart-panel';
import { ExportButton } from './export-button';
import { FilterBar } from './filter-bar';
import { ParetoPanel } from './pareto-panel';
import { RepairCausePareto } from './repair-cause-pareto';
import { TrendChart } from './trend-chart';
import { YieldCards } from './yield-cards';

function Section({ title, children, actions }: { title: string; children: ReactNode; actions?: ReactNode }) {
  return (
    <Paper withBorder p="md" component="section" aria-labelledby={`q-${title}`}>
      <Group justify="space-between" mb="sm" wrap="wrap">
        <Title order={2} fz="xl" id={`q-${title}`}>
          {title}
        </Title>
        {actions}
      </Group>
      {children}
    </Paper>
  );
}

const liveWords = { connecting: 'Connecting…', live: 'Live', lost: 'Live link lost — figures may be behind', refused: 'Live updates refused' } as const;

/** Quality → yield, failures and capability for engineers and quality, filtered through the address. */
export function QualityScreen() {
  const [params, setParams] = useSearchParams();
  const filters = yieldFiltersFromParams(params);
  const by = (params.get('by') as BreakdownDimension | null) ?? 'lot';
  const paretoBy = (params.get('pareto') as ParetoDimension | null) ?? 'step';
  const [bar, setBar] = useState<string | null>(null);
  const [quantityKey, setQuantityKey] = useState<string | null>(null);
  const [subgroupSize, setSubgroupSize] = useState(1);
  const [rules, setRules] = useState<RuleSet>('western-electric');
  const link = useYieldLive();

  const setParam = (change: Record<string, string>) => {
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(change)) {
      if (v) next.set(k, v);
      else next.delete(k);
    }
    setParams(next, { replace: true });
  };
  const onFilters = (change: Partial<YieldFilters>) => {
    setBar(null);
    setParam(change as Record<string, string>);
  };

  const figures = useYieldFigures(filters, by);
  const scope = useMemo(() => ({ productId: filters.productId || undefined, lotId: filters.lotId || undefined }), [filters.productId, filters.lotId]);
  const quantities = useQuantities(scope);
  const quantityChoices = (quantities.data ?? []).map((q) => ({ value: `${q.step}|${q.quantity}`, label: `${q.name} (${q.unit})`, group: q.stepName }));
  // a new product or lot has other quantities: start from its first one
  useEffect(() => {
    if (!quantities.data) return;
    if (!quantityKey || !quantities.data.some((q) => `${q.step}|${q.quantity}` === quantityKey)) {
      const first = quantities.data[0];
      setQuantityKey(first ? `${first.step}|${first.quantity}` : null);
    }
  }, [quantities.data, quantityKey]);
  const selection: QuantitySelection | null =
    scope.productId || scope.lotId ? (quantityKey ? { step: quantityKey.split('|')[0], quantity: quantityKey.split('|')[1] } : null) : null;
  const pickerReason = !(scope.productId || scope.lotId) ? 'Choose a product or a lot in the filters first' : quantities.data?.length === 0 ? 'No measured quantities for this selection' : null;

  return (
    <>
      <PageHeader
        title="Quality"
        description="Yield, failures and process capability of the units tested, with live updates as runs finish."
        actions={
          <>
            <Badge variant="light" color={link === 'live' ? 'signalGreen' : link === 'connecting' ? 'slate' : 'signalAmber'}>
              {liveWords[link]}
            </Badge>
            <ExportButton filters={filters} />
          </>
        }
      />
      <Stack gap="lg">
        <FilterBar filters={filters} onChange={onFilters} />
        {figures.isPending && <Skeleton h={160} />}
        {figures.isError && <ErrorNotice error={figures.error} title="Yield figures could not be loaded" onRetry={() => void figures.refetch()} />}
        {figures.data && (
          <>
            <YieldCards data={figures.data} />
            <Section title="Yield breakdown">
              <BreakdownTable by={by} onByChange={(v) => setParam({ by: v })} rows={figures.data.breakdown} />
            </Section>
            <Section title="Daily trend">
              <TrendChart days={figures.data.trend} />
            </Section>
          </>
        )}
        <Section title="Failure Pareto" actions={<ExportButton filters={filters} scope={{ only: 'failing' }} label="Export failing measurements (CSV)" />}>
          <ParetoPanel filters={filters} by={paretoBy} onByChange={(v) => setParam({ pareto: v })} selected={bar} onSelect={setBar} />
          <RepairCausePareto filters={filters} />
        </Section>
        <Section
          title="Capability and control chart"
          actions={selection && <ExportButton filters={filters} scope={selection} label="Export this quantity (CSV)" />}
        >
          <Group align="flex-end" gap="sm" mb="md" wrap="wrap">
            <QuantityPicker choices={quantityChoices} value={quantityKey} onChange={setQuantityKey} disabledReason={pickerReason} />
            <Select
              label="Subgroup size"
              data={[{ value: '1', label: '1 — individuals and moving range' }, ...[2, 3, 4, 5, 6, 7, 8, 9, 10].map((n) => ({ value: String(n), label: `${n} — X̄ and R` }))]}
              value={String(subgroupSize)}
              onChange={(v) => v && setSubgroupSize(Number(v))}
              allowDeselect={false}
              w={260}
            />
            <Select
              label="Run rules"
              data={[
                { value: 'western-electric', label: 'Western Electric (4 rules)' },
                { value: 'nelson', label: 'Nelson (8 tests)' },
              ]}
              value={rules}
              onChange={(v) => v && setRules(v as RuleSet)}
              allowDeselect={false}
              w={240}
            />
          </Group>
          {!selection ? (
            <Text c="dimmed">{pickerReason ?? 'Choose a quantity.'}</Text>
          ) : (
            <Stack gap="xl">
              <div>
                <Title order={3} fz="lg" mb="xs">
                  Capability
                </Title>
                <CapabilityPanel filters={filters} selection={selection} subgroupSize={subgroupSize} />
              </div>
              <div>
                <Title order={3} fz="lg" mb="xs">
                  Control chart
                </Title>
                <ControlChartPanel filters={filters} selection={selection} options={{ subgroupSize, rules }} />
              </div>
            </Stack>
          )}
        </Section>
      </Stack>
    </>
  );
}
