import { Alert, Badge, Stack, Table, Text, Title } from '@mantine/core';
import { useCompare } from '../api/plans-api';
import type { PlanComparison } from '../api/types';

const shown = (v: unknown) => (v === null || v === undefined ? '—' : typeof v === 'object' ? JSON.stringify(v) : String(v));

/** The comparison table alone, from a comparison in hand. */
export function ComparisonTable({ c }: { c: PlanComparison }) {
  if (c.identical) return <Alert color="gray">Version {c.toVersion} has the same steps and settings as version {c.fromVersion}.</Alert>;
  const rows: { what: string; where: string; before: string; after: string; tone: string }[] = [
    ...c.added.map((a) => ({ what: 'Step added', where: `${a.name} (${a.key})`, before: '—', after: `position ${a.position}`, tone: 'teal' })),
    ...c.removed.map((r) => ({ what: 'Step removed', where: `${r.name} (${r.key})`, before: `position ${r.position}`, after: '—', tone: 'red' })),
    ...c.reordered.map((r) => ({ what: 'Step moved', where: `${r.name} (${r.key})`, before: `position ${r.from}`, after: `position ${r.to}`, tone: 'gray' })),
    ...c.changed.flatMap((s) => s.changes.map((x) => ({ what: 'Changed', where: `${s.name} · ${x.field}`, before: shown(x.before), after: shown(x.after), tone: 'orange' }))),
    ...c.settings.map((x) => ({ what: 'Setting', where: x.field, before: shown(x.before), after: shown(x.after), tone: 'orange' })),
  ];
  return (
    <Table withTableBorder striped aria-label={`Changes from version ${c.fromVersion} to version ${c.toVersion}`}>
      <Table.Thead>
        <Table.Tr>
          <Table.Th>Change</Table.Th>
          <Table.Th>Where</Table.Th>
          <Table.Th>Version {c.fromVersion}</Table.Th>
          <Table.Th>Version {c.toVersion}</Table.Th>
        </Table.Tr>
      </Table.Thead>
      <Table.Tbody>
        {rows.map((r, k) => (
          <Table.Tr key={k}>
            <Table.Td><Badge color={r.tone} variant="light">{r.what}</Badge></Table.Td>
            <Table.Td>{r.where}</Table.Td>
            <Table.Td ff="monospace">{r.before}</Table.Td>
            <Table.Td ff="monospace">{r.after}</Table.Td>
          </Table.Tr>
        ))}
      </Table.Tbody>
    </Table>
  );
}

/** Side-by-side comparison of two versions of one plan, from the server's comparison. */
export function VersionComparison({ fromId, toId }: { fromId: number | null; toId: number | null }) {
  const q = useCompare(fromId, toId);
  if (fromId === null || toId === null) return <Text c="dimmed">Choose two versions to compare.</Text>;
  if (q.isPending) return <Text c="dimmed">Comparing…</Text>;
  if (q.isError) return <Alert color="red">{q.error.message}</Alert>;
  return (
    <Stack gap="xs">
      <Title order={4}>From version {q.data.fromVersion} to version {q.data.toVersion}</Title>
      <ComparisonTable c={q.data} />
    </Stack>
  );
}
