import { Table } from '@mantine/core';

export interface CauseParetoBar {
  key: string;
  label: string;
  count: number;
  percent: number;
  cumulativePercent: number;
}

/** Repairs per cause, largest first, with each cause's share and the cumulative share (Repair and Quality screens). */
export function CauseParetoTable({ bars, label }: { bars: readonly CauseParetoBar[]; label: string }) {
  return (
    <Table aria-label={label} striped>
      <Table.Thead>
        <Table.Tr>
          <Table.Th>Cause</Table.Th>
          <Table.Th ta="right">Repairs</Table.Th>
          <Table.Th ta="right">Share</Table.Th>
          <Table.Th ta="right">Cumulative</Table.Th>
        </Table.Tr>
      </Table.Thead>
      <Table.Tbody>
        {bars.map((b) => (
          <Table.Tr key={b.key}>
            <Table.Td>{b.label}</Table.Td>
            <Table.Td ff="monospace" ta="right">
              {b.count}
            </Table.Td>
            <Table.Td ff="monospace" ta="right">
              {b.percent.toFixed(1)} %
            </Table.Td>
            <Table.Td ff="monospace" ta="right">
              {b.cumulativePercent.toFixed(1)} %
            </Table.Td>
          </Table.Tr>
        ))}
      </Table.Tbody>
    </Table>
  );
}
