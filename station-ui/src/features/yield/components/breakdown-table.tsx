import { Group, Select, Table, Text, UnstyledButton } from '@mantine/core';
import { IconArrowDown, IconArrowUp, IconArrowsSort } from '@tabler/icons-react';
import { useMemo, useState } from 'react';
import { BREAKDOWN_DIMENSIONS, type BreakdownDimension, type YieldGroup } from '../api/get-yield-figures';
import { intervalText, pctText } from './yield-format';

const dimensionLabels: Record<BreakdownDimension, string> = {
  lot: 'Lot',
  product: 'Product',
  station: 'Station',
  fixture: 'Fixture',
  operator: 'Operator',
  day: 'Day',
  shift: 'Shift',
};

type SortKey = 'label' | 'units' | 'fpy' | 'final';
const sorters: Record<SortKey, (a: YieldGroup, b: YieldGroup) => number> = {
  label: (a, b) => a.label.localeCompare(b.label, undefined, { numeric: true }),
  units: (a, b) => a.unitsTested - b.unitsTested,
  fpy: (a, b) => (a.firstPass.estimate ?? -1) - (b.firstPass.estimate ?? -1),
  final: (a, b) => (a.final.estimate ?? -1) - (b.final.estimate ?? -1),
};

function SortHeader({ label, col, sort, onSort }: { label: string; col: SortKey; sort: { key: SortKey; desc: boolean }; onSort: (k: SortKey) => void }) {
  const active = sort.key === col;
  const Icon = !active ? IconArrowsSort : sort.desc ? IconArrowDown : IconArrowUp;
  return (
    <Table.Th aria-sort={active ? (sort.desc ? 'descending' : 'ascending') : 'none'}>
      <UnstyledButton onClick={() => onSort(col)} fw={700} fz="sm">
        <Group gap={4} wrap="nowrap">
          {label}
          <Icon size={14} aria-hidden />
        </Group>
      </UnstyledButton>
    </Table.Th>
  );
}

interface BreakdownTableProps {
  by: BreakdownDimension;
  onByChange: (by: BreakdownDimension) => void;
  rows: YieldGroup[];
}

/** Yield per lot, station, day …: one row per group, sortable by any column. */
export function BreakdownTable({ by, onByChange, rows }: BreakdownTableProps) {
  const [sort, setSort] = useState<{ key: SortKey; desc: boolean }>({ key: 'label', desc: false });
  const sorted = useMemo(() => {
    const out = [...rows].sort(sorters[sort.key]);
    return sort.desc ? out.reverse() : out;
  }, [rows, sort]);
  const onSort = (key: SortKey) => setSort((s) => (s.key === key ? { key, desc: !s.desc } : { key, desc: key !== 'label' }));
  return (
    <>
      <Group justify="space-between" mb="xs">
        <Select
          label="Break down by"
          data={BREAKDOWN_DIMENSIONS.map((d) => ({ value: d, label: dimensionLabels[d] }))}
          value={by}
          onChange={(v) => v && onByChange(v as BreakdownDimension)}
          allowDeselect={false}
          w={200}
        />
        <Text size="sm" c="dimmed">
          Each unit counts in the group of its first judged test. Intervals: 95 % Wilson score.
        </Text>
      </Group>
      <Table.ScrollContainer minWidth={640}>
        <Table striped highlightOnHover aria-label={`Yield by ${dimensionLabels[by].toLowerCase()}`}>
          <Table.Thead>
            <Table.Tr>
              <SortHeader label={dimensionLabels[by]} col="label" sort={sort} onSort={onSort} />
              <SortHeader label="Units tested" col="units" sort={sort} onSort={onSort} />
              <SortHeader label="FPY" col="fpy" sort={sort} onSort={onSort} />
              <Table.Th>FPY interval</Table.Th>
              <SortHeader label="Final yield" col="final" sort={sort} onSort={onSort} />
              <Table.Th>Final interval</Table.Th>
            </Table.Tr>
          </Table.Thead>
          <Table.Tbody>
            {sorted.length === 0 && (
              <Table.Tr>
                <Table.Td colSpan={6}>
                  <Text c="dimmed">No judged units in this selection.</Text>
                </Table.Td>
              </Table.Tr>
            )}
            {sorted.map((g) => (
              <Table.Tr key={g.key}>
                <Table.Td>{g.label}</Table.Td>
                <Table.Td ff="monospace">{g.unitsTested}</Table.Td>
                <Table.Td ff="monospace">{pctText(g.firstPass.estimate)} %</Table.Td>
                <Table.Td ff="monospace" c="dimmed">{intervalText(g.firstPass)}</Table.Td>
                <Table.Td ff="monospace">{pctText(g.final.estimate)} %</Table.Td>
                <Table.Td ff="monospace" c="dimmed">{intervalText(g.final)}</Table.Td>
              </Table.Tr>
            ))}
          </Table.Tbody>
        </Table>
      </Table.ScrollContainer>
    </>
  );
}
