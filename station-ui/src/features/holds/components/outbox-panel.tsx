import { Badge, Skeleton, Table, Text } from '@mantine/core';
import { useOutbox } from '../api/get-outbox';
import { OUTBOX_STATUS, whenText } from '../holds-words';
import classes from './holds.module.css';

/** What was sent, to whom, when, and whether it went out (with the mail server's error when not). */
export function OutboxPanel() {
  const outbox = useOutbox();
  if (outbox.isPending) return <Skeleton height={120} />;
  if (outbox.isError) return <Text c="signalRed">The outbox could not be loaded: {outbox.error.message}</Text>;
  if (outbox.data.length === 0) return <Text c="dimmed">No e-mail sent so far.</Text>;
  return (
    <div className={classes.tableWrap}>
      <Table aria-label="Outbox" striped verticalSpacing="sm">
        <Table.Thead>
          <Table.Tr>
            <Table.Th>Written</Table.Th>
            <Table.Th>To</Table.Th>
            <Table.Th>Subject</Table.Th>
            <Table.Th>Status</Table.Th>
            <Table.Th>Tries</Table.Th>
            <Table.Th>Delivered</Table.Th>
          </Table.Tr>
        </Table.Thead>
        <Table.Tbody>
          {outbox.data.map((m) => {
            const look = OUTBOX_STATUS[m.status];
            return (
              <Table.Tr key={m.id}>
                <Table.Td className={classes.mono}>{whenText(m.createdAt)}</Table.Td>
                <Table.Td className={classes.wrapText}>{m.to}</Table.Td>
                <Table.Td className={classes.wrapText}>{m.subject}</Table.Td>
                <Table.Td>
                  <Badge color={look.color} variant="light" classNames={{ label: classes.badgeLabel }}>
                    {look.label}
                  </Badge>
                  {m.lastError && (
                    <Text size="xs" c={m.status === 'failed' ? 'signalRed' : 'dimmed'} className={classes.wrapText}>
                      {m.lastError}
                    </Text>
                  )}
                </Table.Td>
                <Table.Td className={classes.mono}>{m.attempts}</Table.Td>
                <Table.Td className={classes.mono}>{whenText(m.sentAt)}</Table.Td>
              </Table.Tr>
            );
          })}
        </Table.Tbody>
      </Table>
    </div>
  );
}
