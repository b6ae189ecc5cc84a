import { Button, Group, Pagination, Paper, Select, Skeleton, Stack, Text, Title } from '@mantine/core';
import { IconListDetails } from '@tabler/icons-react';
import { useCallback, useState } from 'react';
import { ErrorNotice } from '@/components/errors/error-notice';
import { PageHeader } from '@/components/layout/page-header';
import { hasAnyRole, useUser } from '@/lib/auth';
import { useLotChoices } from '../api/get-lot-choices';
import { useRepairQueue } from '../api/get-repair-queue';
import type { QueueState, RepairQueueQuery } from '../api/repair-types';
import { CauseListDrawer } from './cause-list-drawer';
import { CauseParetoPanel } from './cause-pareto-panel';
import { QueueTable, type QueueSortState } from './queue-table';
import { RepairModal, type RepairTarget } from './repair-modal';
import { ScanBox } from './scan-box';

/** Rows per page; the server pages (GET /api/repair-queue limit/offset). */
export const REPAIR_PAGE_SIZE = 25;

interface QueueFilters {
  search: string;
  state: '' | QueueState;
  lotId: string;
  step: string;
}

const noFilters: QueueFilters = { search: '', state: '', lotId: '', step: '' };

/**
 * Repair: the units waiting for repair or on the bench. Scan a repair tag (or type part of a serial) to find a
 * unit; filter, sort and page on the server; receive a unit, then record its repair (symptom, cause, action,
 * disposition). Below, the Pareto by cause.
 */
export function RepairScreen() {
  const me = useUser();
  const [filters, setFilters] = useState<QueueFilters>(noFilters);
  const [sort, setSort] = useState<QueueSortState>({ sort: 'failedAt', dir: 'asc' });
  const [page, setPage] = useState(1);
  const [target, setTarget] = useState<RepairTarget | null>(null);
  const [causesOpen, setCausesOpen] = useState(false);

  const query: RepairQueueQuery = {
    search: filters.search || undefined,
    state: filters.state || undefined,
    lotId: filters.lotId ? Number(filters.lotId) : undefined,
    step: filters.step || undefined,
    sort: sort.sort,
    dir: sort.dir,
    limit: REPAIR_PAGE_SIZE,
    offset: (page - 1) * REPAIR_PAGE_SIZE,
  };
  const queue = useRepairQueue(query);
  const lots = useLotChoices();
  const filter = (change: Partial<QueueFilters>) => {
    setFilters((f) => ({ ...f, ...change }));
    setPage(1);
  };
  const onSearch = useCallback((search: string) => {
    setFilters((f) => (f.search === search ? f : { ...f, search }));
    setPage(1);
  }, []);
  const filtered = JSON.stringify(filters) !== JSON.stringify(noFilters);

  const total = queue.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / REPAIR_PAGE_SIZE));
  const first = total === 0 ? 0 : (page - 1) * REPAIR_PAGE_SIZE + 1;
  const last = Math.min(total, page * REPAIR_PAGE_SIZE);
  const canMaintainCauses = hasAnyRole(me.data, ['engineer', 'admin']);

  return (
    <>
      <PageHeader
        title="Repair"
        description="Units waiting for repair or on the bench. Scan a repair tag to find a unit, receive it, then record its repair."
        actions={
          canMaintainCauses && (
            <Button variant="default" leftSection={<IconListDetails size={16} aria-hidden />} onClick={() => setCausesOpen(true)}>
              Repair causes
            </Button>
          )
        }
      />
      <Paper withBorder p="md" mb="md" radius="md" role="search" aria-label="Find units in the repair queue">
        <Group align="flex-end" gap="sm" wrap="wrap">
          <ScanBox value={filters.search} onSearch={onSearch} />
          <Select
            label="State"
            placeholder="Any state"
            w={150}
            clearable
            data={[
              { value: 'failed', label: 'Waiting' },
              { value: 'in_repair', label: 'On the bench' },
            ]}
            value={filters.state || null}
            onChange={(v) => filter({ state: (v ?? '') as QueueFilters['state'] })}
          />
          <Select
            label="Lot"
            placeholder="All lots"
            w={170}
            clearable
            searchable
            data={(lots.data ?? []).map((l) => ({ value: String(l.id), label: l.code }))}
            value={filters.lotId || null}
            onChange={(v) => filter({ lotId: v ?? '' })}
            error={lots.isError ? 'Lots could not be loaded' : undefined}
          />
          <Select
            label="Failed step"
            placeholder="Any step"
            w={220}
            clearable
            data={(queue.data?.steps ?? []).map((s) => ({ value: s.key, label: s.name }))}
            value={filters.step || null}
            onChange={(v) => filter({ step: v ?? '' })}
          />
          <Button variant="default" disabled={!filtered} onClick={() => filter(noFilters)}>
            Clear
          </Button>
        </Group>
      </Paper>

      {queue.isError ? (
        <ErrorNotice error={queue.error} title="The repair queue could not be loaded" onRetry={() => void queue.refetch()} />
      ) : queue.isPending ? (
        <Stack gap="xs" aria-busy="true" aria-label="Loading the repair queue">
          <Skeleton h={36} />
          <Skeleton h={36} />
          <Skeleton h={36} />
        </Stack>
      ) : queue.data.items.length === 0 ? (
        <Paper withBorder p="lg" radius="md">
          <Text>{filtered ? (filters.search ? `No unit in the repair queue matches “${filters.search}”.` : 'No unit in the repair queue matches these filters.') : 'No unit is waiting for repair.'}</Text>
        </Paper>
      ) : (
        <Paper withBorder radius="md" p={0}>
          <Text size="sm" c="dimmed" px="md" pt="sm" aria-live="polite" data-testid="repair-count">
            {first}–{last} of {total} {total === 1 ? 'unit' : 'units'}
            {pages > 1 ? ` · page ${page} of ${pages}` : ''}
          </Text>
          <QueueTable items={queue.data.items} sort={sort} onSort={(s) => (setSort(s), setPage(1))} busy={queue.isFetching} onStep={(item, step) => setTarget({ serial: item.serial, state: item.state, step })} />
          {pages > 1 && (
            <Group justify="center" p="sm">
              <Pagination total={pages} value={page} onChange={setPage} aria-label="Repair queue pages" />
            </Group>
          )}
        </Paper>
      )}

      <Paper withBorder p="md" mt="lg" radius="md" component="section" aria-labelledby="cause-pareto-title">
        <Title order={2} fz="lg" mb="sm" id="cause-pareto-title">
          Pareto by cause
        </Title>
        <CauseParetoPanel lotId={filters.lotId ? Number(filters.lotId) : undefined} />
      </Paper>
      <RepairModal target={target} onClose={() => setTarget(null)} />
      {canMaintainCauses && <CauseListDrawer opened={causesOpen} onClose={() => setCausesOpen(false)} />}
    </>
  );
}
