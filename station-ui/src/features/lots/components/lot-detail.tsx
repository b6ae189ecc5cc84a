import { Alert, Anchor, Badge, Divider, Group, Paper, ScrollArea, Select, SimpleGrid, Skeleton, Stack, Table, Text, Title } from '@mantine/core';
import { IconPlayerPause } from '@tabler/icons-react';
import { useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import { ErrorNotice } from '@/components/errors/error-notice';
import { paths } from '@/config/paths';
import { useLot, useLotUnits } from '../api/lots-api';
import type { UnitState } from '../api/types';
import { formatDay, formatWhen, LOT_STATE_WORDS, testedCount, UNIT_STATE_WORDS } from '../lot-words';
import classes from './lots.module.css';
import { ReleasePanel } from './release-panel';

function Fact({ label, value }: { label: string; value: string | number }) {
  return (
    <div>
      <Text size="xs" c="dimmed" tt="uppercase" fw={600}>
        {label}
      </Text>
      <Text fw={600} className={classes.mono}>
        {value}
      </Text>
    </div>
  );
}

/** One lot: its counts, its state (with the hold reason), release and close, and every unit linked to its history. */
export function LotDetailPanel({ lotId }: { lotId: number }) {
  const lot = useLot(lotId);
  const units = useLotUnits(lotId);
  const [show, setShow] = useState<UnitState | null>(null);
  const shown = useMemo(() => (units.data ?? []).filter((u) => !show || u.state === show), [units.data, show]);

  if (lot.isError) return <ErrorNotice error={lot.error} title="The lot could not be loaded" onRetry={() => void lot.refetch()} />;
  if (lot.isPending) return <Skeleton h={300} />;
  const l = lot.data;
  const look = LOT_STATE_WORDS[l.state];
  return (
    <Paper withBorder p="md" radius="md" aria-label={`Lot ${l.code}`} component="section">
      <Stack gap="md">
        <Group justify="space-between" align="flex-start" wrap="wrap">
          <div>
            <Title order={2} fz="xl" className={classes.mono}>
              {l.code}
            </Title>
            <Text c="dimmed">
              {l.product.partNumber} — {l.product.name}
            </Text>
          </div>
          <Badge size="lg" color={look.color} variant="light" styles={{ label: { textTransform: 'none', overflow: 'visible' } }}>
            {look.label}
          </Badge>
        </Group>
        {l.state === 'on_hold' && (
          <Alert color="signalAmber" variant="light" icon={<IconPlayerPause aria-hidden />} title="On hold: testing is blocked">
            {l.holdReason ?? 'No reason was recorded.'}
          </Alert>
        )}
        <SimpleGrid cols={{ base: 3, sm: 4 }} spacing="sm" verticalSpacing="xs">
          <Fact label="Planned" value={l.plannedQuantity} />
          <Fact label="Registered" value={l.unitCounts.total} />
          <Fact label="Tested" value={testedCount(l)} />
          <Fact label="Passed" value={l.unitCounts.passed} />
          <Fact label="Failed" value={l.unitCounts.failed} />
          <Fact label="In repair" value={l.unitCounts.in_repair} />
          <Fact label="Scrapped" value={l.unitCounts.scrapped} />
          <Fact label="Created" value={formatDay(l.createdAt)} />
        </SimpleGrid>
        {l.firstSerial && (
          <Text size="sm" c="dimmed">
            Serials <span className={classes.mono}>{l.firstSerial}</span> … <span className={classes.mono}>{l.lastSerial}</span>
          </Text>
        )}
        <Divider />
        <ReleasePanel lot={l} />
        <Divider />
        <Group justify="space-between" align="flex-end">
          <Title order={3} fz="lg">
            Units
          </Title>
          <Select
            aria-label="Show units"
            placeholder="Every state"
            clearable
            w={180}
            data={Object.entries(UNIT_STATE_WORDS).map(([value, w]) => ({ value, label: w.label }))}
            value={show}
            onChange={(v) => setShow(v as UnitState | null)}
          />
        </Group>
        {units.isError ? (
          <ErrorNotice error={units.error} title="The units could not be loaded" onRetry={() => void units.refetch()} />
        ) : units.isPending ? (
          <Skeleton h={120} />
        ) : (
          <ScrollArea.Autosize mah={420}>
            <Table aria-label={`Units of lot ${l.code}`} striped verticalSpacing={4} stickyHeader>
              <Table.Thead>
                <Table.Tr>
                  <Table.Th>Serial</Table.Th>
                  <Table.Th>State</Table.Th>
                  <Table.Th className={classes.numHead}>Tests</Table.Th>
                  <Table.Th>Last tested</Table.Th>
                </Table.Tr>
              </Table.Thead>
              <Table.Tbody>
                {shown.map((u) => (
                  <Table.Tr key={u.serial}>
                    <Table.Td>
                      <Anchor component={Link} to={paths.unitHistory.href(u.serial)} className={classes.mono}>
                        {u.serial}
                      </Anchor>
                    </Table.Td>
                    <Table.Td>
                      <Badge color={UNIT_STATE_WORDS[u.state].color} variant="light" styles={{ label: { textTransform: 'none', overflow: 'visible' } }}>
                        {UNIT_STATE_WORDS[u.state].label}
                      </Badge>
                    </Table.Td>
                    <Table.Td className={classes.num}>{u.testCount}</Table.Td>
                    <Table.Td className={classes.nowrap}>{formatWhen(u.lastTestedAt)}</Table.Td>
                  </Table.Tr>
                ))}
                {shown.length === 0 && (
                  <Table.Tr>
                    <Table.Td colSpan={4}>
                      <Text c="dimmed">No unit in this state.</Text>
                    </Table.Td>
                  </Table.Tr>
                )}
              </Table.Tbody>
            </Table>
          </ScrollArea.Autosize>
        )}
      </Stack>
    </Paper>
  );
}
