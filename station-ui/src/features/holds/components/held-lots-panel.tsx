import { Anchor, Badge, Button, Card, Group, Paper, SimpleGrid, Skeleton, Stack, Text, Title } from '@mantine/core';
import { IconCircleCheck } from '@tabler/icons-react';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import { useHolds } from '../api/get-holds';
import type { Hold } from '../api/types';
import { figuresText, whenText } from '../holds-words';
import classes from './holds.module.css';
import { LiftHoldModal } from './lift-hold-modal';

interface HeldLotsPanelProps {
  /** Quality (and admin) may lift a hold; engineers see who can */
  canLift: boolean;
}

/** The lots on hold now: why, which rule, the figures and the run that tripped it, and the lift action. */
export function HeldLotsPanel({ canLift }: HeldLotsPanelProps) {
  const holds = useHolds('active');
  const [lifting, setLifting] = useState<Hold | null>(null);

  return (
    <section aria-label="Lots on hold">
      <Title order={2} fz={20} mb="sm">
        Lots on hold
      </Title>
      {holds.isPending ? (
        <Skeleton height={120} radius="md" />
      ) : holds.isError ? (
        <Text c="signalRed">The holds could not be loaded: {holds.error.message}</Text>
      ) : holds.data.length === 0 ? (
        <Paper withBorder radius="md" p="md">
          <Group gap="sm">
            <IconCircleCheck aria-hidden size={24} color="var(--mantine-color-signalGreen-6)" />
            <Text>No lot is on hold. Every lot can be tested.</Text>
          </Group>
        </Paper>
      ) : (
        <SimpleGrid cols={{ base: 1, lg: 2 }} spacing="md">
          {holds.data.map((h) => (
            <HeldLotCard key={h.id} hold={h} canLift={canLift} onLift={() => setLifting(h)} />
          ))}
        </SimpleGrid>
      )}
      <LiftHoldModal hold={lifting} onClose={() => setLifting(null)} />
    </section>
  );
}

function HeldLotCard({ hold, canLift, onLift }: { hold: Hold; canLift: boolean; onLift: () => void }) {
  const figures = figuresText(hold.figures);
  return (
    <Card withBorder radius="md" padding="md" className={classes.heldCard} aria-label={`Lot ${hold.lotCode} on hold`} component="article">
      <Stack gap={6}>
        <Group justify="space-between" align="flex-start" wrap="nowrap">
          <Group gap="xs">
            <Text className={classes.mono} fw={700} fz={20}>
              {hold.lotCode}
            </Text>
            <Badge color="signalAmber" variant="filled">
              On hold
            </Badge>
            <Text c="dimmed">{hold.partNumber}</Text>
          </Group>
          {canLift ? (
            <Button onClick={onLift} variant="filled">
              Lift hold
            </Button>
          ) : (
            <Text size="sm" c="dimmed" ta="right">
              Only quality can lift a hold
            </Text>
          )}
        </Group>
        <Text className={classes.reason}>{hold.reason}</Text>
        <Text size="sm">Rule: {hold.ruleDescription}</Text>
        {figures && <Text size="sm">{figures}</Text>}
        <Text size="sm" c="dimmed">
          Held {whenText(hold.heldAt)}
          {hold.runId !== null && (
            <>
              {' '}after{' '}
              <Anchor component={Link} to={paths.runDetail.href(hold.runId)}>
                run {hold.runId}
              </Anchor>
              {hold.serial && (
                <>
                  {' '}
                  (<span className={classes.mono}>{hold.serial}</span>
                  {hold.stationCode ? ` at ${hold.stationCode}` : ''})
                </>
              )}
            </>
          )}
        </Text>
      </Stack>
    </Card>
  );
}
