import { Button, Group, Pagination, Paper, Select, Skeleton, Stack, Table, Text, TextInput, UnstyledButton } from '@mantine/core';
import { IconArrowDown, IconArrowUp, IconSearch, IconSelector, IconX } from '@tabler/icons-react';
import { useEffect, useState, type KeyboardEvent } from 'react';
import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { RUN_VERDICT_WORDS, STOPPED_WORD } from '@contract/run-outcome';
import type { RunRow as RunView, RunSortColumn } from '../api/run-types';
import { ErrorNotice } from '@/components/errors/error-notice';
import { PageHeader } from '@/components/layout/page-header';
import { paths } from '@/config/paths';
import { useLotChoices } from '../api/get-lots';
import { useRuns } from '../api/get-runs';
import { useStationChoices } from '../api/get-stations';
import { formatDuration, formatStamp } from '../format';
import { emptyRunFilters, runFiltersFromParams, runParamsFrom, runsQueryFrom, RUNS_PAGE_SIZE, type RunFilters, type RunSort } from '../run-filters';
import { RunVerdict } from './run-verdict';
import classes from './runs.module.css';

const verdictChoices = [
  { value: 'pass', label: 'PASS' },
  { value: 'fail', label: 'FAIL' },
  { value: 'error', label: 'ERROR' },
  { value: 'aborted', label: STOPPED_WORD },
  { value: 'running', label: 'Testing now' },
];

/** Engineering → Runs: every stored run, newest first, filtered through the address so a view can be shared. */
export function RunsScreen() {
  const [params, setParams] = useSearchParams();
  const { filters, page, sort } = runFiltersFromParams(params);
  const runs = useRuns(runsQueryFrom(filters, page, sort));
  const stations = useStationChoices();
  const lots = useLotChoices();
  const navigate = useNavigate();

  // The serial is typed, so it applies on Enter; the field follows the address on back/forward.
  const [serial, setSerial] = useState(filters.serial);
  useEffect(() => setSerial(filters.serial), [filters.serial]);

  const apply = (change: Partial<RunFilters>) => setParams(runParamsFrom({ ...filters, ...change }, 1, sort));
  const sortBy = (next: RunSort) => setParams(runParamsFrom(filters, 1, next));
  const th = (column: RunSortColumn, label: string, className?: string, title?: string) => (
    <SortableTh column={column} label={label} sort={sort} onSort={sortBy} className={className} title={title} />
  );
  const clear = () => {
    setSerial('');
    setParams(new URLSearchParams());
  };
  const hasFilters = JSON.stringify(filters) !== JSON.stringify(emptyRunFilters);

  const total = runs.data?.total ?? 0;
  const pages = Math.max(1, Math.ceil(total / RUNS_PAGE_SIZE));
  const first = total === 0 ? 0 : (page - 1) * RUNS_PAGE_SIZE + 1;
  const last = Math.min(total, page * RUNS_PAGE_SIZE);

  const open = (run: RunView) => void navigate(paths.runDetail.href(run.id));
  const onRowKey = (e: KeyboardEvent<HTMLTableRowElement>, run: RunView) => {
    if (e.key === 'Enter' && e.target === e.currentTarget) {
      e.preventDefault();
      open(run);
    }
  };

  return (
    <>
      <PageHeader title="Runs" description="Every test run with its measurements: find a unit's history by serial, lot, station or verdict." />
      <Paper
        withBorder
        p="md"
        mb="md"
        radius="md"
        component="form"
        aria-label="Filter the runs"
        onSubmit={(e) => {
          e.preventDefault();
          apply({ serial: serial.trim() });
        }}
      >
        <Group align="flex-end" gap="sm" wrap="wrap">
          <Select
            label="Station"
            placeholder="All stations"
            w={150}
            clearable
            data={(stations.data ?? []).map((s) => ({ value: String(s.id), label: s.code }))}
            value={filters.station || null}
            onChange={(v) => apply({ station: v ?? '' })}
            error={stations.isError ? 'Stations could not be loaded' : undefined}
          />
          <Select
            label="Lot"
            placeholder="All lots"
            w={230}
            clearable
            searchable
            data={(lots.data ?? []).map((l) => ({ value: String(l.id), label: `${l.code} · ${l.product.partNumber}` }))}
            value={filters.lot || null}
            onChange={(v) => apply({ lot: v ?? '' })}
            error={lots.isError ? 'Lots could not be loaded' : undefined}
          />
          <TextInput
            label="Serial"
            description="Any part, any case, then Enter"
            placeholder="e.g. K5A-2648-00017"
            w={210}
            className={classes.monoInput}
            maxLength={64}
            value={serial}
            onChange={(e) => setSerial(e.currentTarget.value)}
          />
          <Select
            label="Verdict"
            placeholder="Any verdict"
            w={150}
            clearable
            data={verdictChoices}
            value={filters.verdict || null}
            onChange={(v) => apply({ verdict: v ?? '' })}
          />
          <TextInput
            type="date"
            label="Started from"
            w={160}
            value={filters.from}
            max={filters.to || undefined}
            onChange={(e) => apply({ from: e.currentTarget.value })}
          />
          <TextInput
            type="date"
            label="to (inclusive)"
            w={160}
            value={filters.to}
            min={filters.from || undefined}
            onChange={(e) => apply({ to: e.currentTarget.value })}
          />
          <Group gap="xs">
            <Button type="submit" leftSection={<IconSearch size={16} aria-hidden />}>
              Find
            </Button>
            <Button variant="default" leftSection={<IconX size={16} aria-hidden />} onClick={clear} disabled={!hasFilters && !serial}>
              Clear
            </Button>
          </Group>
        </Group>
      </Paper>

      {runs.isPending ? (
        <Stack gap="xs" aria-busy="true" aria-label="Loading the runs">
          {[0, 1, 2, 3, 4, 5].map((i) => (
            <Skeleton key={i} height={32} />
          ))}
        </Stack>
      ) : runs.isError ? (
        <ErrorNotice error={runs.error} title="The runs could not be loaded" onRetry={() => runs.refetch()} />
      ) : runs.data.items.length === 0 ? (
        <Text c="dimmed" size="lg" py="xl" ta="center">
          {hasFilters ? 'No runs match these filters.' : 'No unit has been tested yet.'}
        </Text>
      ) : (
        <>
          <Text size="sm" c="dimmed" mb="xs" aria-live="polite" data-testid="runs-count">
            {first}–{last} of {total} {total === 1 ? 'run' : 'runs'}
            {pages > 1 ? ` · page ${page} of ${pages}` : ''}
          </Text>
          <Table.ScrollContainer minWidth={1100}>
            <Table
              verticalSpacing={6}
              horizontalSpacing={8}
              striped
              highlightOnHover
              aria-label="Runs"
              aria-busy={runs.isFetching}
              className={classes.table}
            >
              <Table.Thead>
                <Table.Tr>
                  {th('startedAt', 'Started')}
                  {th('serial', 'Serial')}
                  {th('product', 'Product')}
                  {th('lot', 'Lot')}
                  {th('station', 'Station')}
                  {th('fixture', 'Fixture')}
                  {th('operator', 'Operator')}
                  {th('attempt', 'Try', classes.num, 'Attempt: 1 for the first test, 2 for the first retest …')}
                  {th('plan', 'Plan')}
                  {th('verdict', 'Verdict')}
                  {th('failedStep', 'Failed step')}
                  {th('duration', 'Duration', classes.num)}
                </Table.Tr>
              </Table.Thead>
              <Table.Tbody>
                {runs.data.items.map((r) => (
                  <Table.Tr
                    key={r.id}
                    tabIndex={0}
                    className={classes.row}
                    data-run-id={r.id}
                    data-verdict={r.verdict}
                    aria-label={`Run ${r.id}, ${r.serial}, ${RUN_VERDICT_WORDS[r.verdict]}`}
                    onClick={() => open(r)}
                    onKeyDown={(e) => onRowKey(e, r)}
                  >
                    <Table.Td className={classes.mono} title={formatStamp(r.startedAt)}>
                      {formatStamp(r.startedAt).slice(0, 16)}
                    </Table.Td>
                    <Table.Td>
                      {/* a real link too, so a run opens in a new tab with the middle button */}
                      <Link to={paths.runDetail.href(r.id)} className={classes.serialLink} tabIndex={-1} onClick={(e) => e.stopPropagation()}>
                        {r.serial}
                      </Link>
                    </Table.Td>
                    <Table.Td className={classes.mono}>{r.partNumber}</Table.Td>
                    <Table.Td className={classes.mono}>{r.lotCode}</Table.Td>
                    <Table.Td className={classes.mono}>{r.stationCode}</Table.Td>
                    <Table.Td className={classes.mono}>{r.fixtureCode}</Table.Td>
                    <Table.Td>{r.operatorName}</Table.Td>
                    <Table.Td className={`${classes.mono} ${classes.num}`}>{r.attempt}</Table.Td>
                    <Table.Td className={classes.mono}>
                      {r.planCode} <span className={classes.dim}>v{r.planVersion}</span>
                    </Table.Td>
                    <Table.Td>
                      <RunVerdict verdict={r.verdict} />
                    </Table.Td>
                    <Table.Td title={r.failedStepKey ?? undefined}>
                      {/* the step's name as the plan gives it; its internal key only when the plan does not know it */}
                      {r.failedStepName ?? r.failedStepKey ?? <span className={classes.dim}>—</span>}
                    </Table.Td>
                    <Table.Td className={`${classes.mono} ${classes.num}`}>{formatDuration(r.durationMs)}</Table.Td>
                  </Table.Tr>
                ))}
              </Table.Tbody>
            </Table>
          </Table.ScrollContainer>
          {pages > 1 && (
            <Pagination
              mt="md"
              total={pages}
              value={page}
              onChange={(p) => setParams(runParamsFrom(filters, p, sort))}
              aria-label="Run pages"
            />
          )}
        </>
      )}
    </>
  );
}

const SORT_NAMES: Partial<Record<RunSortColumn, string>> = { attempt: 'attempt', startedAt: 'start time' };

/** A column heading that sorts the list on the server: ascending first (newest first for the start time). */
function SortableTh({ column, label, sort, onSort, className, title }: { column: RunSortColumn; label: string; sort: RunSort; onSort: (s: RunSort) => void; className?: string; title?: string }) {
  const active = sort.sort === column;
  const first: RunSort['dir'] = column === 'startedAt' ? 'desc' : 'asc';
  const next: RunSort['dir'] = active ? (sort.dir === 'asc' ? 'desc' : 'asc') : first;
  const Icon = !active ? IconSelector : sort.dir === 'asc' ? IconArrowUp : IconArrowDown;
  return (
    <Table.Th aria-sort={active ? (sort.dir === 'asc' ? 'ascending' : 'descending') : 'none'} className={className} title={title}>
      <UnstyledButton className={classes.sortButton} onClick={() => onSort({ sort: column, dir: next })} aria-label={`Sort by ${SORT_NAMES[column] ?? label.toLowerCase()}, ${next === 'asc' ? 'ascending' : 'descending'}`}>
        {label}
        <Icon size={14} aria-hidden />
      </UnstyledButton>
    </Table.Th>
  );
}
