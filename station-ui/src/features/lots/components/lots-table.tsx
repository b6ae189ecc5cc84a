import { Badge, Group, Select, Table, Text, TextInput, Tooltip, UnstyledButton } from '@mantine/core';
import { IconArrowDown, IconArrowUp, IconSearch } from '@tabler/icons-react';
import { useMemo, useState } from 'react';
import type { Lot, LotState } from '../api/types';
import { formatDay, LOT_STATE_WORDS, testedCount } from '../lot-words';
import classes from './lots.module.css';

type SortKey = 'code' | 'product' | 'planned' | 'registered' | 'tested' | 'passed' | 'state' | 'created';

const VALUE: Record<SortKey, (l: Lot) => string | number> = {
  code: (l) => l.code,
  product: (l) => l.product.partNumber,
  planned: (l) => l.plannedQuantity,
  registered: (l) => l.unitCounts.total,
  tested: testedCount,
  passed: (l) => l.unitCounts.passed,
  state: (l) => LOT_STATE_WORDS[l.state].label,
  created: (l) => l.createdAt,
};

const COLUMNS: { key: SortKey; label: string; numeric?: boolean }[] = [
  { key: 'code', label: 'Lot' },
  { key: 'product', label: 'Product' },
  { key: 'planned', label: 'Planned', numeric: true },
  { key: 'registered', label: 'Registered', numeric: true },
  { key: 'tested', label: 'Tested', numeric: true },
  { key: 'passed', label: 'Passed', numeric: true },
  { key: 'state', label: 'State' },
  { key: 'created', label: 'Created' },
];

/** Sorts and filters the lots list: text in the lot code or product, and a state. */
export function filterAndSort(lots: readonly Lot[], text: string, state: LotState | null, sort: { key: SortKey; desc: boolean }): Lot[] {
  const needle = text.trim().toLowerCase();
  const rows = lots.filter(
    (l) => (!state || l.state === state) && (!needle || l.code.toLowerCase().includes(needle) || l.product.partNumber.toLowerCase().includes(needle) || l.product.name.toLowerCase().includes(needle)),
  );
  const get = VALUE[sort.key];
  return rows.sort((a, b) => {
    const x = get(a);
    const y = get(b);
    const c = typeof x === 'number' && typeof y === 'number' ? x - y : String(x).localeCompare(String(y), undefined, { numeric: true });
    return sort.desc ? -c : c;
  });
}

interface LotsTableProps {
  lots: Lot[];
  selectedId: number | null;
  onSelect: (id: number) => void;
}

/** The lots with their counts and state in words; sortable by every column, filterable by text and state. */
export function LotsTable({ lots, selectedId, onSelect }: LotsTableProps) {
  const [text, setText] = useState('');
  const [state, setState] = useState<LotState | null>(null);
  const [sort, setSort] = useState<{ key: SortKey; desc: boolean }>({ key: 'created', desc: true });
  const rows = useMemo(() => filterAndSort(lots, text, state, sort), [lots, text, state, sort]);
  const toggle = (key: SortKey) => setSort((s) => (s.key === key ? { key, desc: !s.desc } : { key, desc: key === 'created' }));

  return (
    <>
      <Group mb="sm" gap="sm" wrap="wrap">
        <TextInput
          aria-label="Search lots"
          placeholder="Lot code or product"
          leftSection={<IconSearch size={16} aria-hidden />}
          value={text}
          onChange={(e) => setText(e.currentTarget.value)}
          w={240}
        />
        <Select
          aria-label="State"
          placeholder="Every state"
          clearable
          data={Object.entries(LOT_STATE_WORDS).map(([value, w]) => ({ value, label: w.label }))}
          value={state}
          onChange={(v) => setState(v as LotState | null)}
          w={200}
        />
        <Text size="sm" c="dimmed">
          {rows.length === lots.length ? `${lots.length} lots` : `${rows.length} of ${lots.length} lots`}
        </Text>
      </Group>
      <div className={classes.tableWrap}>
        <Table aria-label="Lots" highlightOnHover verticalSpacing="xs" horizontalSpacing={8} fz="sm">
          <Table.Thead>
            <Table.Tr>
              {COLUMNS.map((c) => {
                const active = sort.key === c.key;
                return (
                  <Table.Th key={c.key} aria-sort={active ? (sort.desc ? 'descending' : 'ascending') : 'none'} className={c.numeric ? classes.numHead : undefined}>
                    <UnstyledButton onClick={() => toggle(c.key)} fw={700} fz="sm" aria-label={`Sort by ${c.label.toLowerCase()}`}>
                      <Group gap={4} wrap="nowrap" justify={c.numeric ? 'flex-end' : 'flex-start'}>
                        {c.label}
                        {active && (sort.desc ? <IconArrowDown size={14} aria-hidden /> : <IconArrowUp size={14} aria-hidden />)}
                      </Group>
                    </UnstyledButton>
                  </Table.Th>
                );
              })}
            </Table.Tr>
          </Table.Thead>
          <Table.Tbody>
            {rows.length === 0 && (
              <Table.Tr>
                <Table.Td colSpan={COLUMNS.length}>
                  <Text c="dimmed">No lot matches.</Text>
                </Table.Td>
              </Table.Tr>
            )}
            {rows.map((l) => (
              <Table.Tr
                key={l.id}
                className={`${classes.row} ${l.id === selectedId ? classes.selected : ''}`}
                aria-selected={l.id === selectedId}
                onClick={() => onSelect(l.id)}
              >
                <Table.Td className={classes.mono}>
                  <UnstyledButton className={classes.mono} fw={600} fz="sm" onClick={() => onSelect(l.id)} aria-label={`Open lot ${l.code}`}>
                    {l.code}
                  </UnstyledButton>
                </Table.Td>
                <Table.Td className={classes.nowrap}>
                  <Tooltip label={l.product.name} openDelay={400}>
                    <span>{l.product.partNumber}</span>
                  </Tooltip>
                </Table.Td>
                <Table.Td className={classes.num}>{l.plannedQuantity}</Table.Td>
                <Table.Td className={classes.num}>{l.unitCounts.total}</Table.Td>
                <Table.Td className={classes.num}>{testedCount(l)}</Table.Td>
                <Table.Td className={classes.num}>{l.unitCounts.passed}</Table.Td>
                <Table.Td>
                  <Badge size="sm" color={LOT_STATE_WORDS[l.state].color} variant="light" styles={{ label: { textTransform: 'none', overflow: 'visible' } }}>
                    {LOT_STATE_WORDS[l.state].label}
                  </Badge>
                  {l.state === 'on_hold' && l.holdReason && (
                    <Text size="xs" c="dimmed" mt={2} maw={260}>
                      {l.holdReason}
                    </Text>
                  )}
                </Table.Td>
                <Table.Td className={classes.nowrap}>{formatDay(l.createdAt)}</Table.Td>
              </Table.Tr>
            ))}
          </Table.Tbody>
        </Table>
      </div>
    </>
  );
}
