import { Anchor, Badge, Button, Group, Paper, Skeleton, Stack, Table, Text, Title } from '@mantine/core';
import { IconChevronDown, IconChevronRight } from '@tabler/icons-react';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { formatMeasured, formatValue } from '@contract/value-format';
import { ErrorNotice } from '@/components/errors/error-notice';
import { VerdictBadge } from '@/components/verdict';
import { pages, paths } from '@/config/paths';
import { isApiError } from '@/lib/api-client';
import { isVerdict } from '@/theme';
import { useUnitHistory, type HistoryEvent, type HistoryMeasurement, type HistoryRun, type UnitHistory } from '../api/get-unit-history';
import { endReasonWords, formatDay, formatStamp, lotStateWords } from '../history-words';
import classes from './unit-history-screen.module.css';

type TimelineItem = { kind: 'run'; at: string; run: HistoryRun } | { kind: 'event'; at: string; event: HistoryEvent };

/** Runs and audit events in one list, newest first. */
export function timelineOf(h: Pick<UnitHistory, 'runs' | 'events'>): TimelineItem[] {
  const items: TimelineItem[] = [
    ...h.runs.map((run) => ({ kind: 'run' as const, at: run.startedAt, run })),
    ...h.events.map((event) => ({ kind: 'event' as const, at: event.at, event })),
  ];
  return items.sort((a, b) => (a.at < b.at ? 1 : a.at > b.at ? -1 : 0));
}

function MeasurementRows({ measurements }: { measurements: HistoryMeasurement[] }) {
  if (measurements.length === 0) return <Text c="dimmed" size="sm">No measurement was stored for this run.</Text>;
  return (
    <Table.ScrollContainer minWidth={760}>
      <Table verticalSpacing={4} fz="sm" aria-label="Measurements">
        <Table.Thead>
          <Table.Tr>
            <Table.Th>Step</Table.Th>
            <Table.Th>Quantity</Table.Th>
            <Table.Th className={classes.num}>Value</Table.Th>
            <Table.Th>Spec limits</Table.Th>
            <Table.Th>Guarded limits</Table.Th>
            <Table.Th className={classes.num}>U (k = 2)</Table.Th>
            <Table.Th>Verdict</Table.Th>
          </Table.Tr>
        </Table.Thead>
        <Table.Tbody>
          {measurements.map((m) => {
            const shown = formatMeasured(m);
            return (
              <Table.Tr key={m.id} className={m.verdict !== 'pass' ? classes.failedRow : undefined} data-measurement={m.quantity}>
                <Table.Td>{m.stepName}</Table.Td>
                <Table.Td>{m.name}</Table.Td>
                <Table.Td className={`${classes.mono} ${classes.num}`}>
                  <strong>{shown.value}</strong>
                  {shown.unit && ` ${shown.unit}`}
                </Table.Td>
                <Table.Td className={classes.mono}>{shown.spec}</Table.Td>
                <Table.Td className={classes.mono}>{shown.accept ?? <Text span c="dimmed" size="sm">same as spec</Text>}</Table.Td>
                <Table.Td className={`${classes.mono} ${classes.num}`}>
                  {formatValue(m.uncertainty, m.quantity, m.unit).text}
                  {m.unit && m.unit !== 'flag' ? ` ${m.unit}` : ''}
                </Table.Td>
                <Table.Td>
                  {isVerdict(m.verdict) ? <VerdictBadge verdict={m.verdict} size="sm" /> : m.verdict}
                  {m.decision && m.decision.startsWith('conditional') && (
                    <Text span size="xs" c="dimmed" ml={6}>
                      {m.decision.replace('_', ' ')}
                    </Text>
                  )}
                </Table.Td>
              </Table.Tr>
            );
          })}
        </Table.Tbody>
      </Table>
    </Table.ScrollContainer>
  );
}

function RunItem({ run, defaultOpen }: { run: HistoryRun; defaultOpen: boolean }) {
  const [open, setOpen] = useState(defaultOpen);
  const failed = run.measurements.filter((m) => m.verdict !== 'pass').length;
  const reason = endReasonWords(run.endReason);
  const cal = run.fixture;
  return (
    <Paper component="li" withBorder p="md" radius="md" className={classes.item} aria-label={`Run ${run.id}`}>
      <Group justify="space-between" align="flex-start" wrap="wrap" gap="sm">
        <Group gap="sm" wrap="wrap">
          {isVerdict(run.verdict) ? <VerdictBadge verdict={run.verdict} /> : <Badge variant="outline">{run.verdict === 'running' ? 'Testing' : run.verdict}</Badge>}
          <div>
            <Text fw={700}>
              Run{' '}
              <Anchor component={Link} to={paths.runDetail.href(run.id)}>
                #{run.id}
              </Anchor>{' '}
              · attempt {run.attempt}
            </Text>
            <Text size="sm" c="dimmed" className={classes.mono}>
              {formatStamp(run.startedAt)}
              {run.finishedAt ? ` – ${formatStamp(run.finishedAt).slice(11)}` : ' · still testing'}
            </Text>
          </div>
        </Group>
        <Button
          variant="default"
          size="xs"
          onClick={() => setOpen((o) => !o)}
          aria-expanded={open}
          leftSection={open ? <IconChevronDown size={16} aria-hidden /> : <IconChevronRight size={16} aria-hidden />}
        >
          {open ? 'Hide' : 'Show'} {run.measurements.length} measurements{failed > 0 ? ` (${failed} failed)` : ''}
        </Button>
      </Group>
      {(reason || run.errorMessage || run.overrideReason) && (
        <Text size="sm" mt="xs">
          {reason && <>Ended: {reason}. </>}
          {run.errorMessage && <>{run.errorMessage} </>}
          {run.overrideReason && <>Extra attempt allowed: {run.overrideReason}</>}
        </Text>
      )}
      <dl className={classes.trace} style={{ marginTop: 'var(--mantine-spacing-xs)' }}>
        <div>
          <dt>Plan version</dt>
          <dd>
            {run.plan.code} v{run.plan.version} <span className={classes.mono} title="Checksum of the steps">({run.plan.checksum.slice(0, 12)})</span>
          </dd>
        </div>
        <div>
          <dt>Station</dt>
          <dd>
            {run.station.code} · {run.station.name}
          </dd>
        </div>
        <div>
          <dt>Fixture and calibration</dt>
          <dd>
            {cal.code}
            {cal.calibrationDueAtRun ? `, calibration due ${formatDay(cal.calibrationDueAtRun)} when tested` : ''}
            {cal.certificate ? ` · certificate ${cal.certificate}` : ''}
          </dd>
        </div>
        <div>
          <dt>Operator</dt>
          <dd>{run.operator.displayName}</dd>
        </div>
      </dl>
      {open && (
        <Stack mt="sm">
          <MeasurementRows measurements={run.measurements} />
        </Stack>
      )}
    </Paper>
  );
}

function EventItem({ event, record }: { event: HistoryEvent; record: { field: string; value: string }[] }) {
  const repair = event.action.startsWith('unit.');
  return (
    <Paper component="li" withBorder p="md" radius="md" className={`${classes.item} ${repair ? classes.itemRepair : ''}`} aria-label={event.what}>
      <Text fw={700}>{event.what}</Text>
      <Text size="sm" c="dimmed" className={classes.mono}>
        {formatStamp(event.at)} · {event.actorDisplayName ?? event.actorName ?? 'the system'}
      </Text>
      {event.reason && (
        <Text size="sm" mt={4}>
          Note: {event.reason}
        </Text>
      )}
      {record.length > 0 && (
        <dl className={classes.record} style={{ marginTop: 'var(--mantine-spacing-xs)' }} aria-label="Repair record">
          {record.map((r) => (
            <div key={r.field} style={{ display: 'contents' }}>
              <dt>{r.field}</dt>
              <dd>{r.value}</dd>
            </div>
          ))}
        </dl>
      )}
      {event.changes.some((c) => c.field === 'State') && (
        <Text size="sm" mt={4} c="dimmed">
          {event.changes
            .filter((c) => c.field === 'State')
            .map((c) => `State: ${c.before ?? '—'} → ${c.after ?? '—'}`)
            .join(' ')}
        </Text>
      )}
    </Paper>
  );
}

/** Everything that happened to one unit: header with where it stands, then runs, repairs and dispositions, newest first. */
export function UnitHistoryScreen({ serial }: { serial: string }) {
  const history = useUnitHistory(serial);

  if (history.isPending) {
    return (
      <Stack aria-busy="true" aria-label="Loading the unit history">
        <Skeleton height={80} />
        <Skeleton height={120} />
        <Skeleton height={120} />
      </Stack>
    );
  }
  if (history.isError) {
    if (isApiError(history.error) && (history.error.status === 404 || history.error.status === 400)) {
      return (
        <Stack maw={640}>
          <Title order={1}>Unit history</Title>
          <Text size="lg" role="alert">
            {history.error.message}
          </Text>
        </Stack>
      );
    }
    return <ErrorNotice error={history.error} title="The unit history could not be loaded" onRetry={() => history.refetch()} />;
  }
  const { unit } = history.data;
  const timeline = timelineOf(history.data);
  const newestRun = history.data.runs[0]?.id;
  return (
    <>
      <Paper withBorder p="lg" radius="md" mb="lg">
        <Text size="sm" c="dimmed">
          Unit history
        </Text>
        <Title order={1} className={classes.serial}>
          {unit.serial}
        </Title>
        <dl className={classes.facts} style={{ marginTop: 'var(--mantine-spacing-sm)' }}>
          <div>
            <dt>Product</dt>
            <dd>
              {unit.product.partNumber} · {unit.product.name}
            </dd>
          </div>
          <div>
            <dt>Lot</dt>
            <dd>
              <Anchor component={Link} to={`${pages.lots.href()}?lot=${unit.lot.id}`}>
                {unit.lot.code}
              </Anchor>{' '}
              <Text span size="sm" c="dimmed">
                ({lotStateWords(unit.lot.state)})
              </Text>
            </dd>
          </div>
          <div>
            <dt>State</dt>
            <dd data-testid="unit-state">{unit.stateWords}</dd>
          </div>
          <div>
            <dt>Disposition</dt>
            <dd>{unit.disposition}</dd>
          </div>
          <div>
            <dt>Attempts used</dt>
            <dd>{unit.testCount}</dd>
          </div>
        </dl>
      </Paper>
      <Title order={2} size="h3" mb="sm">
        Timeline, newest first
      </Title>
      {timeline.length === 0 ? (
        <Text c="dimmed">This unit has not been tested yet, and nothing else has happened to it.</Text>
      ) : (
        <ol className={classes.timeline} aria-label="Timeline">
          {timeline.map((item) =>
            item.kind === 'run' ? (
              <RunItem key={`run-${item.run.id}`} run={item.run} defaultOpen={item.run.id === newestRun && item.run.verdict !== 'pass'} />
            ) : (
              <EventItem key={`event-${item.event.id}`} event={item.event} record={history.data.repairRecords[String(item.event.id)] ?? []} />
            ),
          )}
        </ol>
      )}
    </>
  );
}
