import { Paper, SimpleGrid, Stack, Text } from '@mantine/core';
import { Figure } from '@/components/figure';
import type { YieldFiguresView } from '../api/get-yield-figures';
import type { ProportionInterval } from '../api/yield-filters';
import { intervalText } from './yield-format';

function YieldCard({ title, p, explain }: { title: string; p: ProportionInterval; explain: string }) {
  return (
    <Paper withBorder p="md" component="section" aria-label={title}>
      <Stack gap={4}>
        <Text fw={700}>{title}</Text>
        <Figure value={p.estimate === null ? null : 100 * p.estimate} unit="%" digits={1} size={36} />
        <Text size="sm">
          <Text span ff="monospace">{intervalText(p)}</Text> <Text span c="dimmed">(95 % Wilson score interval)</Text>
        </Text>
        <Text size="sm" c="dimmed">
          <Text span ff="monospace">{p.x}</Text> of <Text span ff="monospace">{p.n}</Text> units · {explain}
        </Text>
      </Stack>
    </Paper>
  );
}

/** The three headline figures: first-pass, final and rolled throughput yield. */
export function YieldCards({ data }: { data: YieldFiguresView }) {
  const { overall, rty } = data;
  return (
    <SimpleGrid cols={{ base: 1, sm: 3 }} spacing="md">
      <YieldCard title="First-pass yield (FPY)" p={overall.firstPass} explain="passed their first judged test" />
      <YieldCard title="Final yield" p={overall.final} explain="passed in the end and not scrapped" />
      <Paper withBorder p="md" component="section" aria-label="Rolled throughput yield (RTY)">
        <Stack gap={4}>
          <Text fw={700}>Rolled throughput yield (RTY)</Text>
          <Figure value={rty.value === null ? null : 100 * rty.value} unit="%" digits={1} size={36} />
          <Text size="sm" c="dimmed" title={rty.note}>
            Product of {rty.steps.length} step first-pass yields; each step has its own interval, RTY none.
          </Text>
          {rty.steps.length > 0 && (
            <Text size="sm" c="dimmed">
              Lowest step:{' '}
              {(() => {
                const worst = [...rty.steps].sort((a, b) => (a.firstPass.estimate ?? 1) - (b.firstPass.estimate ?? 1))[0];
                return (
                  <>
                    {worst.stepName}{' '}
                    <Text span ff="monospace">
                      {((worst.firstPass.estimate ?? 0) * 100).toFixed(1)} % ({intervalText(worst.firstPass)})
                    </Text>
                  </>
                );
              })()}
            </Text>
          )}
        </Stack>
      </Paper>
    </SimpleGrid>
  );
}
