import { Badge, Button, Group, Table, Text, UnstyledButton } from '@mantine/core';
import { IconArrowDown, IconArrowUp, IconSelector } from '@tabler/icons-react';
import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import type { QueueSort, RepairQueueItem, SortDir } from '../api/repair-types';
import { describeFailure, formatWhen, REASON_WORDS, STEP_BUTTON, stepsFor, type RepairStep } from '../repair-words';
import classes from './repair.module.css';

const STATE_LOOK: Record<RepairQueueItem['state'], { label: string; color: string }> = {
  failed: { label: 'Waiting', color: 'signalRed' },
  in_repair: { label: 'On the bench', color: 'signalAmber' },
};

export interface QueueSortState {
  sort: QueueSort;
  dir: SortDir;
}

interface QueueTableProps {
  items: RepairQueueItem[];
  sort: QueueSortState;
  onSort: (next: QueueSortState) => void;
  onStep: (item: RepairQueueItem, step: RepairStep) => void;
  busy: boolean;
}

/** The queue page: sortable headings (the server sorts), serials linking to the unit's history, a readable state. */
export function QueueTable({ items, sort, onSort, onStep, busy }: QueueTableProps) {
  const th = (key: QueueSort, label: string, extra?: string) => (
    <SortableTh key={key} column={key} label={label} sort={sort} onSort={onSort} className={extra} />
  );
  return (
    // laid out to fit 1024 px with the navigation open (no sideways scrolling); below that it scrolls
    <Table.ScrollContainer minWidth={700}>
      <Table aria-label="Repair queue" aria-busy={busy} striped highlightOnHover verticalSpacing="xs" horizontalSpacing="xs" className={classes.table}>
        <Table.Thead>
          <Table.Tr>
            {th('serial', 'Serial')}
            {th('state', 'State')}
            {th('step', 'Failed step')}
            {th('failedAt', 'Last failure')}
            <Table.Th>
              <span className={classes.hidden}>Repair steps</span>
            </Table.Th>
          </Table.Tr>
        </Table.Thead>
        <Table.Tbody>
          {items.map((item) => (
            <QueueRow key={item.unitId} item={item} onStep={(step) => onStep(item, step)} />
          ))}
        </Table.Tbody>
      </Table>
    </Table.ScrollContainer>
  );
}

function SortableTh({ column, label, sort, onSort, className }: { column: QueueSort; label: string; sort: QueueSortState; onSort: (s: QueueSortState) => void; className?: string }) {
  const active = sort.sort === column;
  const Icon = !active ? IconSelector : sort.dir === 'asc' ? IconArrowUp : IconArrowDown;
  return (
    <Table.Th aria-sort={active ? (sort.dir === 'asc' ? 'ascending' : 'descending') : 'none'} className={className}>
      <UnstyledButton
        className={classes.sortButton}
        onClick={() => onSort({ sort: column, dir: active && sort.dir === 'asc' ? 'desc' : 'asc' })}
        aria-label={`Sort by ${label.toLowerCase()}${active && sort.dir === 'asc' ? ', descending' : ''}`}
      >
        {label}
        <Icon size={14} aria-hidden />
      </UnstyledButton>
    </Table.Th>
  );
}

function QueueRow({ item, onStep }: { item: RepairQueueItem; onStep: (step: RepairStep) => void }) {
  const run = item.lastFailingRun;
  const f = run?.firstFailure ?? null;
  const look = STATE_LOOK[item.state];
  let failure: ReactNode = '—';
  if (f) {
    const shown = describeFailure(f);
    failure = (
      <>
        <Text size="sm" lh={1.3}>
          {f.stepName}
        </Text>
        <Text size="xs" c="dimmed" className={classes.figures} title={f.name}>
          {shown.value} ({shown.limits})
        </Text>
      </>
    );
  } else if (run?.failedStepKey) failure = run.failedStepKey;
  return (
    <Table.Tr data-serial={item.serial}>
      <Table.Td>
        <Link to={paths.unitHistory.href(item.serial)} className={`${classes.mono} ${classes.serialLink}`}>
          {item.serial}
        </Link>
        {/* lot and product under the serial: one column less, so the row fits 1024 px */}
        <Text size="xs" c="dimmed" className={classes.mono}>
          {item.lot.code} · {item.lot.partNumber}
        </Text>
      </Table.Td>
      <Table.Td className={classes.stateCell}>
        {/* the label keeps its full width: at 1024 px the squeezed column once cut it to "W…" */}
        <Badge color={look.color} variant="light" className={classes.stateBadge} title={REASON_WORDS[item.reason]}>
          {look.label}
        </Badge>
        {item.state === 'failed' && (
          <Text size="xs" c="dimmed" mt={2}>
            {REASON_WORDS[item.reason]}
          </Text>
        )}
      </Table.Td>
      <Table.Td className={classes.failure}>{failure}</Table.Td>
      <Table.Td>
        <Text size="sm" className={classes.mono}>
          {run ? formatWhen(run.finishedAt) : '—'}
        </Text>
        <Text size="xs" c="dimmed">
          {run ? `${run.station.code} · ` : ''}
          {item.testCount} {item.testCount === 1 ? 'test' : 'tests'}
        </Text>
      </Table.Td>
      <Table.Td>
        <Group gap={4} justify="flex-end" className={classes.steps}>
          {stepsFor(item.state).map((step) => (
            <Button key={step} size="xs" variant={step === 'record' ? 'filled' : 'light'} aria-label={`${STEP_BUTTON[step]} ${item.serial}`} onClick={() => onStep(step)}>
              {STEP_BUTTON[step]}
            </Button>
          ))}
        </Group>
      </Table.Td>
    </Table.Tr>
  );
}
