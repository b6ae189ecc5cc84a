import { BarChart } from '@mantine/charts';
import { Text } from '@mantine/core';
import { formatFigure } from '@contract/value-format';
import type { Analysis } from '../api/types';
import { columnDigits } from './characterization-format';
import { uText } from './suggestion-settings';

type Line = { x: number; label: string; color: string; strokeDasharray?: string; labelPosition: 'insideTopLeft' | 'insideTopRight' | 'insideBottomLeft' | 'insideBottomRight' };

/** Histogram of one quantity with the proposed limits (solid), the suggested ones (dashed) and, when U > 0, the suggestion's guarded limits (dotted) drawn. */
export function DataHistogram({ analysis }: { analysis: Analysis }) {
  const h = analysis.histogram;
  if (!h) return <Text c="dimmed">No values to draw.</Text>;
  const { low, high } = analysis.limits;
  const s = analysis.suggestion?.tolerance;
  // the guarded limits differ from the suggested ones only when the suggestion has a guard band
  const g = analysis.suggestion && analysis.suggestion.uncertainty > 0 ? analysis.suggestion.acceptance : undefined;
  const d = columnDigits(analysis.column, [low, high]);
  const data = h.counts.map((count, i) => ({ mid: (h.edges[i] + h.edges[i + 1]) / 2, Units: count }));
  // labels inside the plot: a low line's to its right, a high line's to its left; proposed at the top, suggested at the bottom
  const line = (x: number | null | undefined, label: string, color: string, dash: string | undefined, side: 'low' | 'high'): Line[] =>
    x === null || x === undefined
      ? []
      : [
          {
            x,
            label: `${label} ${formatFigure(x, d)}`,
            color,
            strokeDasharray: dash,
            labelPosition: dash ? (side === 'low' ? 'insideBottomLeft' : 'insideBottomRight') : side === 'low' ? 'insideTopLeft' : 'insideTopRight',
          },
        ];
  // a suggested limit already taken as the proposal is drawn once, as the proposal
  const same = (a: number | null | undefined, b: number | null | undefined) => a !== null && a !== undefined && b !== null && b !== undefined && formatFigure(a, d) === formatFigure(b, d);
  // the suggested limits widen the axis only when they are drawn, so the bars keep their width
  const lo = Math.min(h.edges[0], ...[s?.low].filter((x): x is number => x !== undefined));
  const hi = Math.max(h.edges[h.edges.length - 1], ...[s?.high].filter((x): x is number => x !== undefined));
  const pad = (hi - lo) * 0.02;
  return (
    <div>
      <BarChart
        h={300}
        data={data}
        dataKey="mid"
        series={[{ name: 'Units', color: 'slate.5' }]}
        barChartProps={{ barCategoryGap: 0 }}
        xAxisProps={{ type: 'number', domain: [lo - pad, hi + pad], tickFormatter: (x: number) => formatFigure(x, d), allowDataOverflow: true }}
        xAxisLabel={`${analysis.column.key} (${analysis.column.unit})`}
        yAxisLabel="Units"
        referenceLines={[
          ...line(low, 'low', 'signalRed.7', undefined, 'low'),
          ...line(high, 'high', 'signalRed.7', undefined, 'high'),
          ...(same(s?.low, low) ? [] : line(s?.low, 'suggested', 'copper.6', '5 4', 'low')),
          ...(same(s?.high, high) ? [] : line(s?.high, 'suggested', 'copper.6', '5 4', 'high')),
          // guarded labels sit at the top (the suggested ones take the bottom), so both stay readable side by side
          ...line(g?.low, 'guarded', 'slate.7', '2 3', 'low').map((l) => ({ ...l, labelPosition: 'insideTopLeft' as const })),
          ...line(g?.high, 'guarded', 'slate.7', '2 3', 'high').map((l) => ({ ...l, labelPosition: 'insideTopRight' as const })),
        ]}
        aria-label={`Histogram of ${analysis.column.key}`}
      />
      <Text size="xs" c="dimmed">
        {analysis.n} values · bins: {h.rule === 'sturges' ? 'Sturges' : 'Freedman–Diaconis'}, width <Text span ff="monospace" fz="xs">{formatFigure(h.binWidth, d + 1)} {analysis.column.unit}</Text>. Solid red:
        proposed limits; dashed copper: suggested limits (mean ± {analysis.suggestion?.k ?? 4}·s)
        {g ? (
          <>
            ; dotted slate: suggested limits guarded by U = <Text span ff="monospace" fz="xs">{uText(analysis.suggestion!.uncertainty)} {analysis.column.unit}</Text>
          </>
        ) : null}
        .
      </Text>
    </div>
  );
}
