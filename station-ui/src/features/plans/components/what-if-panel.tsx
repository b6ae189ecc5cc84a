import { Alert, Anchor, Button, Group, NumberInput, Paper, Select, SimpleGrid, Stack, Table, Text, TextInput, Title } from '@mantine/core';
import { useMutation } from '@tanstack/react-query';
import { useState } from 'react';
import { Link } from 'react-router-dom';
import { paths } from '@/config/paths';
import { runWhatIf } from '../api/plans-api';
import type { Interval, WhatIfResult, WhatIfScope } from '../api/types';

const pct = (x: number | null) => (x === null ? '—' : `${(x * 100).toFixed(1)} %`);
const interval = (i: Interval) => `${pct(i.estimate)} (95 % CI ${pct(i.lower)} … ${pct(i.upper)}, ${i.x} of ${i.n})`;

/** The summary a release decision needs: counts, yield now and predicted, and the units that change. */
export function WhatIfSummary({ r }: { r: WhatIfResult }) {
  const changedLimits = r.perLimit.filter((l) => l.passToFail + l.failToPass > 0);
  return (
    <Stack gap="sm" aria-label="What-if summary">
      <Text size="sm" c="dimmed">Re-judged {r.measurementsJudged} stored measurements of {r.unitsInScope} units ({r.scopeText}); nothing was written.</Text>
      <SimpleGrid cols={4}>
        <Paper withBorder p="xs"><Text size="xs" c="dimmed">PASS → FAIL</Text><Text fz={26} fw={700} ff="monospace">{r.passToFail}</Text></Paper>
        <Paper withBorder p="xs"><Text size="xs" c="dimmed">FAIL → PASS</Text><Text fz={26} fw={700} ff="monospace">{r.failToPass}</Text></Paper>
        <Paper withBorder p="xs"><Text size="xs" c="dimmed">FPY now</Text><Text ff="monospace">{interval(r.currentFpy)}</Text></Paper>
        <Paper withBorder p="xs"><Text size="xs" c="dimmed">FPY predicted (Wilson)</Text><Text ff="monospace">{interval(r.predictedFpy)}</Text></Paper>
      </SimpleGrid>
      {r.unknown > 0 && <Text size="sm">{r.unknown} unit(s) cannot be predicted: their first run stopped before limits others were measured on.</Text>}
      {r.unmeasuredLimits.length > 0 && <Text size="sm" c="dimmed">No stored measurements for: {r.unmeasuredLimits.map((l) => `${l.stepKey}/${l.limitKey}`).join(', ')}.</Text>}
      {changedLimits.length > 0 && (
        <Table withTableBorder aria-label="Verdict changes per limit">
          <Table.Thead><Table.Tr><Table.Th>Step</Table.Th><Table.Th>Limit</Table.Th><Table.Th>PASS → FAIL</Table.Th><Table.Th>FAIL → PASS</Table.Th><Table.Th>Measured</Table.Th></Table.Tr></Table.Thead>
          <Table.Tbody>
            {changedLimits.map((l) => (
              <Table.Tr key={`${l.stepKey}/${l.limitKey}`}><Table.Td>{l.stepKey}</Table.Td><Table.Td>{l.limitName} ({l.limitKey})</Table.Td><Table.Td>{l.passToFail}</Table.Td><Table.Td>{l.failToPass}</Table.Td><Table.Td>{l.measured}</Table.Td></Table.Tr>
            ))}
          </Table.Tbody>
        </Table>
      )}
      {r.affected.length > 0 && (
        <Table withTableBorder aria-label="Units changing verdict">
          <Table.Thead><Table.Tr><Table.Th>Serial</Table.Th><Table.Th>Now</Table.Th><Table.Th>With this draft</Table.Th><Table.Th>Limits</Table.Th></Table.Tr></Table.Thead>
          <Table.Tbody>
            {r.affected.slice(0, 50).map((a) => (
              <Table.Tr key={a.unitId}>
                <Table.Td><Anchor component={Link} to={paths.runDetail.href(a.runId)} ff="monospace">{a.serial}</Anchor></Table.Td>
                <Table.Td>{a.before.toUpperCase()}</Table.Td>
                <Table.Td>{a.after.toUpperCase()}</Table.Td>
                <Table.Td>{a.limits.map((l) => l.limitKey).join(', ')}</Table.Td>
              </Table.Tr>
            ))}
          </Table.Tbody>
        </Table>
      )}
    </Stack>
  );
}

/** Chooses the stored units to re-judge and shows what the draft would do to them. */
export function WhatIfPanel({ versionId, onResult, result }: { versionId: number; onResult: (r: WhatIfResult) => void; result: WhatIfResult | null }) {
  const [kind, setKind] = useState<'last_units' | 'lot' | 'dates'>('last_units');
  const [units, setUnits] = useState<number | string>(200);
  const [lotId, setLotId] = useState<string>('');
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('');
  const run = useMutation({ mutationFn: (scope: WhatIfScope) => runWhatIf(versionId, scope), onSuccess: onResult });
  const scope = (): WhatIfScope =>
    kind === 'last_units' ? { scope: kind, units: Number(units) } : kind === 'lot' ? { scope: kind, lotId: Number(lotId) } : { scope: kind, from, to };
  return (
    <Paper withBorder p="md">
      <Title order={3} mb="xs">What if this draft were released?</Title>
      <Group align="flex-end" mb="sm">
        <Select label="Units" w={200} value={kind} allowDeselect={false} onChange={(v) => setKind((v ?? 'last_units') as typeof kind)}
          data={[{ value: 'last_units', label: 'Last N units' }, { value: 'lot', label: 'One lot' }, { value: 'dates', label: 'Date range' }]} />
        {kind === 'last_units' && <NumberInput label="N" w={120} min={1} max={100000} value={units} onChange={setUnits} />}
        {kind === 'lot' && <TextInput label="Lot id" w={120} value={lotId} onChange={(e) => setLotId(e.currentTarget.value)} />}
        {kind === 'dates' && (
          <>
            <TextInput label="From" placeholder="2026-11-01" w={140} value={from} onChange={(e) => setFrom(e.currentTarget.value)} />
            <TextInput label="To" placeholder="2026-11-30" w={140} value={to} onChange={(e) => setTo(e.currentTarget.value)} />
          </>
        )}
        <Button onClick={() => run.mutate(scope())} loading={run.isPending}>Re-judge stored results</Button>
      </Group>
      {run.isError && <Alert color="red" mb="sm">{run.error.message}</Alert>}
      {result && <WhatIfSummary r={result} />}
    </Paper>
  );
}
