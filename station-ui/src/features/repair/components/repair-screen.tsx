import { Badge, Button, Group, Paper, Skeleton, Stack, Table, Text } from '@mantine/core';
import { useState } from 'react';
import { ErrorNotice } from '@/components/errors/error-notice';
import { PageHeader } from '@/components/layout/page-header';
import { useRepairQueue, type RepairQueueItem } from '../api/get-repair-queue';
import { ACTION_WORDS, actionsFor, describeFailure, formatWhen } from '../repair-words';
import { RepairModal, type RepairTarget } from './repair-modal';
import classes from './repair.module.css';

const STATE_LOOK: Record<RepairQueueItem['state'], { label: string; color: string }> = {
  failed: { label: 'Waiting', color: 'signalRed' },
  in_repair: { label: 'On the bench', color: 'signalAmber' },
};

/** Repair: units that failed (waiting) or are on the bench, oldest failure first, with their repair steps. */
export function RepairScreen() {
  const queue = useRepairQueue();
  const [target, setTarget] = useState<RepairTarget | null>(null);

  return (
    <>
      <PageHeader
        title="Repair"
        description="Failed units, oldest failure first. Receive a unit onto the bench, then return it for retest or scrap it."
      />
      {queue.isError ? (
        <ErrorNotice error={queue.error} title="The repair queue could not be loaded" onRetry={() => void queue.refetch()} />
      ) : queue.isPending ? (
        <Stack gap="xs" aria-busy="true">
          <Skeleton h={36} />
          <Skeleton h={36} />
          <Skeleton h={36} />
        </Stack>
      ) : queue.data.items.length === 0 ? (
        <Paper withBorder p="lg" radius="md">
          <Text>No unit is waiting for repair.</Text>
        </Paper>
      ) : (
        <Paper withBorder radius="md" className={classes.tableWrap}>
          <Table aria-label="Repair queue" striped highlightOnHover verticalSpacing="sm">
            <Table.Thead>
              <Table.Tr>
                <Table.Th>Serial</Table.Th>
                <Table.Th>Product</Table.Th>
                <Table.Th>Lot</Table.Th>
                <Table.Th>State</Table.Th>
                <Table.Th>Failed step</Table.Th>
                <Table.Th>Value (limits)</Table.Th>
                <Table.Th>Failed at</Table.Th>
                <Table.Th>Station</Table.Th>
                <Table.Th>Tests</Table.Th>
                <Table.Th>
                  <span className={classes.hidden}>Repair steps</span>
                </Table.Th>
              </Table.Tr>
            </Table.Thead>
            <Table.Tbody>
              {queue.data.items.map((item) => (
                <QueueRow key={item.unitId} item={item} onAction={(action) => setTarget({ serial: item.serial, action })} />
              ))}
            </Table.Tbody>
          </Table>
        </Paper>
      )}
      <RepairModal target={target} onClose={() => setTarget(null)} />
    </>
  );
}

function QueueRow({ item, onAction }: { item: RepairQueueItem; onAction: (action: RepairTarget['action']) => void }) {
  const run = item.lastFailingRun;
  const f = run?.firstFailure ?? null;
  const look = STATE_LOOK[item.state];
  return (
    <Table.Tr>
      <Table.Td className={classes.mono}>{item.serial}</Table.Td>
      <Table.Td>{item.lot.partNumber}</Table.Td>
      <Table.Td className={classes.mono}>{item.lot.code}</Table.Td>
      <Table.Td>
        <Badge color={look.color} variant="light">
          {look.label}
        </Badge>
      </Table.Td>
      <Table.Td>{f ? `${f.stepName}: ${f.name}` : (run?.failedStepKey ?? '—')}</Table.Td>
      <Table.Td className={classes.mono}>
        {f ? (
          <>
            {describeFailure(f).value}{' '}
            <Text span c="dimmed" inherit>
              ({describeFailure(f).limits})
            </Text>
          </>
        ) : (
          '—'
        )}
      </Table.Td>
      <Table.Td className={classes.mono}>{run ? formatWhen(run.finishedAt) : '—'}</Table.Td>
      <Table.Td>{run?.station.code ?? '—'}</Table.Td>
      <Table.Td className={classes.mono}>{item.testCount}</Table.Td>
      <Table.Td>
        <Group gap="xs" wrap="nowrap" justify="flex-end">
          {actionsFor(item.state).map((action) => (
            <Button
              key={action}
              size="xs"
              variant={action === 'scrap' ? 'subtle' : 'light'}
              color={action === 'scrap' ? 'signalRed' : undefined}
              aria-label={`${ACTION_WORDS[action].button} ${item.serial}`}
              onClick={() => onAction(action)}
            >
              {ACTION_WORDS[action].button}
            </Button>
          ))}
        </Group>
      </Table.Td>
    </Table.Tr>
  );
}
