import { Badge, Paper, Tabs } from '@mantine/core';
import { PageHeader } from '@/components/layout/page-header';
import { hasAnyRole, useUser } from '@/lib/auth';
import { useHoldsLive } from '../hooks/use-holds-live';
import { AlertsPanel } from './alerts-panel';
import { HeldLotsPanel } from './held-lots-panel';
import { HoldRulesPanel } from './hold-rules-panel';
import { OutboxPanel } from './outbox-panel';

const LIVE_WORDS = { online: 'Live', connecting: 'Connecting…', offline: 'Not live: reload to see changes' } as const;

/** Holds and alerts: lots on hold (lifted by quality), hold rules per product, the alerts history and the e-mail outbox. */
export function HoldsScreen() {
  const { data: user } = useUser();
  const live = useHoldsLive();
  const canLift = hasAnyRole(user, ['quality', 'admin']);
  return (
    <>
      <PageHeader
        title="Holds and alerts"
        description="Lots stopped by a hold rule, the rules per product, and the e-mails sent to quality."
        actions={
          <Badge color={live === 'online' ? 'signalGreen' : 'slate'} variant="light" size="lg">
            {LIVE_WORDS[live]}
          </Badge>
        }
      />
      <HeldLotsPanel canLift={canLift} />
      <Paper withBorder radius="md" p="md" mt="xl">
        <Tabs defaultValue="rules" keepMounted={false}>
          <Tabs.List mb="md">
            <Tabs.Tab value="rules">Hold rules</Tabs.Tab>
            <Tabs.Tab value="alerts">Alerts</Tabs.Tab>
            <Tabs.Tab value="outbox">Outbox</Tabs.Tab>
          </Tabs.List>
          <Tabs.Panel value="rules">
            <HoldRulesPanel />
          </Tabs.Panel>
          <Tabs.Panel value="alerts">
            <AlertsPanel />
          </Tabs.Panel>
          <Tabs.Panel value="outbox">
            <OutboxPanel />
          </Tabs.Panel>
        </Tabs>
      </Paper>
    </>
  );
}
