import { Button, Group, Select, TextInput } from '@mantine/core';
import { IconX } from '@tabler/icons-react';
import { useFilterChoices } from '../api/get-filter-choices';
import { emptyYieldFilters, type YieldFilters } from '../api/yield-filters';

interface FilterBarProps {
  filters: YieldFilters;
  onChange: (change: Partial<YieldFilters>) => void;
}

/** Date range, lot, product and station: the selection every view on the screen shares. */
export function FilterBar({ filters, onChange }: FilterBarProps) {
  const choices = useFilterChoices();
  const lots = (choices.data?.lots ?? []).filter((l) => !filters.productId || l.productId === filters.productId);
  const dateProblem = filters.from && filters.to && filters.from > filters.to ? 'The first day is after the last day' : null;
  return (
    <Group align="flex-end" gap="sm" wrap="wrap" role="search" aria-label="Quality filters">
      <TextInput type="date" label="From" value={filters.from} onChange={(e) => onChange({ from: e.currentTarget.value })} error={dateProblem} w={170} />
      <TextInput type="date" label="To (included)" value={filters.to} onChange={(e) => onChange({ to: e.currentTarget.value })} w={170} />
      <Select
        label="Product"
        placeholder="All products"
        data={choices.data?.products ?? []}
        value={filters.productId || null}
        onChange={(v) => onChange({ productId: v ?? '', lotId: '' })}
        clearable
        searchable
        w={300}
      />
      <Select
        label="Lot"
        placeholder="All lots"
        data={lots.map(({ value, label }) => ({ value, label }))}
        value={filters.lotId || null}
        onChange={(v) => onChange({ lotId: v ?? '' })}
        clearable
        searchable
        w={230}
      />
      <Select
        label="Station"
        placeholder="All stations"
        data={choices.data?.stations ?? []}
        value={filters.stationId || null}
        onChange={(v) => onChange({ stationId: v ?? '' })}
        clearable
        w={160}
      />
      {JSON.stringify(filters) !== JSON.stringify(emptyYieldFilters) && (
        <Button variant="subtle" leftSection={<IconX size={16} aria-hidden />} onClick={() => onChange(emptyYieldFilters)}>
          Clear filters
        </Button>
      )}
    </Group>
  );
}
