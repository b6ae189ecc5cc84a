import { Alert, Group, Stack, Table, Text } from '@mantine/core';
import { formatFigure } from '@contract/value-format';
import type { Analysis, IndexEstimate } from '../api/types';
import { columnDigits, indexText, ppmText, pValueText } from './characterization-format';

function Figure({ label, value, unit }: { label: string; value: string; unit?: string }) {
  return (
    <Stack gap={0}>
      <Text size="xs" c="dimmed">
        {label}
      </Text>
      <Text ff="monospace" fw={600} fz="lg">
        {value}
        {unit && (
          <Text span ff="monospace" fz="sm" fw={400}>
            {' '}
            {unit}
          </Text>
        )}
      </Text>
    </Stack>
  );
}

function IndexRow({ name, est, note }: { name: string; est: IndexEstimate | null | undefined; note: string }) {
  return (
    <Table.Tr>
      <Table.Th scope="row">{name}</Table.Th>
      <Table.Td ff="monospace">{est ? indexText(est.value) : '—'}</Table.Td>
      <Table.Td ff="monospace" c="dimmed">
        {est ? `${indexText(est.lower)} – ${indexText(est.upper)}` : 'needs both limits'}
      </Table.Td>
      <Table.Td c="dimmed" fz="xs">
        {note}
      </Table.Td>
    </Table.Tr>
  );
}

/** n, mean, σ, the normality test with its reading, Cp/Cpk/Pp/Ppk with 95 % intervals and ppm outside. */
export function FiguresPanel({ analysis: a }: { analysis: Analysis }) {
  const unit = a.column.unit;
  const d = columnDigits(a.column, [a.limits.low, a.limits.high]) + 1;
  const t = a.normality.primary;
  const c = a.capability;
  return (
    <Stack gap="sm">
      <Group gap="xl" wrap="wrap">
        <Figure label="n" value={String(a.n)} />
        <Figure label="Mean" value={formatFigure(a.mean, d)} unit={unit} />
        <Figure label="σ overall (s)" value={formatFigure(a.sd, d)} unit={unit} />
        <Figure label="σ within (moving range)" value={formatFigure(a.sigmaWithin, d)} unit={unit} />
      </Group>
      {a.missing > 0 && (
        <Text size="xs" c="dimmed">
          {a.missing} unit{a.missing === 1 ? '' : 's'} without a value for this quantity (empty cells) left out.
        </Text>
      )}
      <Stack gap={2} aria-label="Normality test">
        <Text size="sm">
          {t ? (
            <>
              {t.test} normality test: p ={' '}
              <Text span ff="monospace" fw={600}>
                {pValueText(t.pValue)}
              </Text>
              {a.normality.shapiroWilk && t.test !== 'Shapiro–Wilk' && (
                <Text span c="dimmed" size="sm">
                  {' '}
                  (Shapiro–Wilk p = <Text span ff="monospace">{pValueText(a.normality.shapiroWilk.pValue)}</Text>)
                </Text>
              )}
            </>
          ) : (
            'No normality test'
          )}
        </Text>
        <Text size="sm" c={t && t.pValue < 0.05 ? 'signalAmber.9' : 'dimmed'}>
          {a.normality.reading}
        </Text>
      </Stack>
      <Table aria-label="Capability indices" withTableBorder={false}>
        <Table.Thead>
          <Table.Tr>
            <Table.Th>Index</Table.Th>
            <Table.Th>Value</Table.Th>
            <Table.Th>95 % interval</Table.Th>
            <Table.Th>σ used, interval</Table.Th>
          </Table.Tr>
        </Table.Thead>
        <Table.Tbody>
          <IndexRow name="Cp" est={c?.cp} note="within, chi-square" />
          <IndexRow name="Cpk" est={c?.cpk} note="within, Bissell" />
          <IndexRow name="Pp" est={c?.pp} note="overall, chi-square" />
          <IndexRow name="Ppk" est={c?.ppk} note="overall, Bissell" />
        </Table.Tbody>
      </Table>
      <Group gap="xl" aria-label="Expected outside the proposed limits">
        <Figure label="Expected outside proposed limits" value={a.ppmOutside ? ppmText(a.ppmOutside.total) : '—'} unit="ppm" />
        {a.ppmOutside && (
          <Text size="xs" c="dimmed">
            below <Text span ff="monospace" fz="xs">{ppmText(a.ppmOutside.below)}</Text> · above{' '}
            <Text span ff="monospace" fz="xs">{ppmText(a.ppmOutside.above)}</Text> ppm · normal model with mean and s
          </Text>
        )}
      </Group>
      {a.problems.length > 0 && (
        <Alert color="slate" variant="light" p="xs">
          {a.problems.map((p) => (
            <Text size="sm" key={p}>
              {p}
            </Text>
          ))}
        </Alert>
      )}
    </Stack>
  );
}
