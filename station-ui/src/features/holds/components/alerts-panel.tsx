import { Anchor, Badge, Skeleton, Table, Text } from '@mantine/core';
import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import { useHoldAlerts } from '../api/get-hold-alerts';
import { whenText } from '../holds-words';
import classes from './holds.module.css';

/** Every alert, newest first: rules that tripped and evaluations that failed. */
export function AlertsPanel() {
  const alerts = useHoldAlerts();
  if (alerts.isPending) return <Skeleton height={120} />;
  if (alerts.isError) return <Text c="signalRed">The alerts could not be loaded: {alerts.error.message}</Text>;
  if (alerts.data.length === 0) return <Text c="dimmed">No alert so far.</Text>;
  return (
    <div className={classes.tableWrap}>
      <Table aria-label="Alerts" striped verticalSpacing="sm">
        <Table.Thead>
          <Table.Tr>
            <Table.Th>When</Table.Th>
            <Table.Th>Kind</Table.Th>
            <Table.Th>Lot</Table.Th>
            <Table.Th>What happened</Table.Th>
            <Table.Th>Run</Table.Th>
          </Table.Tr>
        </Table.Thead>
        <Table.Tbody>
          {alerts.data.map((a) => (
            <Table.Tr key={a.id}>
              <Table.Td className={classes.mono}>{whenText(a.at)}</Table.Td>
              <Table.Td>
                {a.kind === 'hold' ? (
                  <Badge color="signalAmber" variant="light" classNames={{ label: classes.badgeLabel }}>
                    Lot held
                  </Badge>
                ) : (
                  <Badge color="signalRed" variant="light" classNames={{ label: classes.badgeLabel }}>
                    Rules not checked
                  </Badge>
                )}
              </Table.Td>
              <Table.Td className={classes.mono}>{a.lotCode ?? '—'}</Table.Td>
              <Table.Td className={classes.wrapText}>
                {a.message}
                {a.ruleDescription && (
                  <Text size="xs" c="dimmed">
                    {a.ruleDescription}
                  </Text>
                )}
              </Table.Td>
              <Table.Td>
                {a.runId !== null ? (
                  <Anchor component={Link} to={paths.runDetail.href(a.runId)}>
                    {a.runId}
                  </Anchor>
                ) : (
                  '—'
                )}
              </Table.Td>
            </Table.Tr>
          ))}
        </Table.Tbody>
      </Table>
    </div>
  );
}
