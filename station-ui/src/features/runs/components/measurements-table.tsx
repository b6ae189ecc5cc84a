import { ActionIcon, Table, Text, VisuallyHidden } from '@mantine/core';
import { IconChevronDown, IconChevronRight } from '@tabler/icons-react';
import { decisionWords } from '@contract/run-outcome';
import { formatMeasured, formatValue } from '@contract/value-format';
import { Fragment, useState } from 'react';
import type { RunMeasurement as MeasurementView } from '../api/run-types';
import { VerdictBadge } from '@/components/verdict';
import { isVerdict } from '@/theme';
import { formatStamp, formatTime } from '../format';
import classes from './run-detail.module.css';

const COLUMNS = 11;

/** Decision rules as stored by the engine, in words (the rule names are the plan files' own). */
function ruleLabel(rule: string): string {
  if (rule === 'simple') return 'simple';
  if (rule === 'guarded') return 'guarded';
  return rule;
}

function ruleHint(rule: string): string | undefined {
  if (rule === 'simple') return 'Simple acceptance: judged against the specification limits';
  if (rule === 'guarded') return 'Guarded acceptance: the limits are pulled in by the uncertainty U';
  return undefined;
}

/**
 * Every measurement exactly as stored (values are never recomputed here), with the limits it was judged
 * against. A guard-band failure shows the FAIL look with its own words, so nobody reads it as a gross fail.
 */
export function MeasurementsTable({ measurements }: { measurements: MeasurementView[] }) {
  const [open, setOpen] = useState<ReadonlySet<number>>(new Set());
  const toggle = (id: number) =>
    setOpen((prev) => {
      const next = new Set(prev);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });

  if (measurements.length === 0) {
    return (
      <Text c="dimmed" py="md">
        No measurement was stored for this run.
      </Text>
    );
  }

  return (
    <Table.ScrollContainer minWidth={1080}>
      <Table verticalSpacing={6} horizontalSpacing="xs" aria-label="Measurements" className={classes.table}>
        <Table.Thead>
          <Table.Tr>
            <Table.Th w={36}>
              <VisuallyHidden>Raw readings</VisuallyHidden>
            </Table.Th>
            <Table.Th>Step</Table.Th>
            <Table.Th>Quantity</Table.Th>
            <Table.Th className={classes.num}>Value</Table.Th>
            <Table.Th>Spec limits</Table.Th>
            <Table.Th>Guarded limits</Table.Th>
            <Table.Th className={classes.num}>U (k = 2)</Table.Th>
            <Table.Th>Rule</Table.Th>
            <Table.Th>Verdict</Table.Th>
            <Table.Th title="Decision statement, ILAC-G8:09/2019 §4.2.3">Decision</Table.Th>
            <Table.Th>Measured</Table.Th>
          </Table.Tr>
        </Table.Thead>
        <Table.Tbody>
          {measurements.map((m) => {
            // value and limits with the same digits, so the comparison a reader makes agrees with the engine's
            const shown = formatMeasured(m);
            const decision = decisionWords(m.decision);
            const expanded = open.has(m.id);
            const failed = m.verdict !== 'pass';
            return (
              <Fragment key={m.id}>
                <Table.Tr data-measurement={m.quantity} data-verdict={m.verdict} className={failed ? classes.failedRow : undefined}>
                  <Table.Td>
                    <ActionIcon
                      variant="subtle"
                      color="graphite"
                      size="sm"
                      aria-expanded={expanded}
                      aria-label={`${expanded ? 'Hide' : 'Show'} raw readings of ${m.name}`}
                      disabled={m.raw === null}
                      onClick={() => toggle(m.id)}
                    >
                      {expanded ? <IconChevronDown size={16} aria-hidden /> : <IconChevronRight size={16} aria-hidden />}
                    </ActionIcon>
                  </Table.Td>
                  <Table.Td>
                    <div>{m.stepName}</div>
                    <div className={classes.stepKey}>{m.stepKey}</div>
                  </Table.Td>
                  <Table.Td>
                    <div>{m.name}</div>
                    <div className={classes.stepKey}>{m.quantity}</div>
                  </Table.Td>
                  <Table.Td className={`${classes.mono} ${classes.num}`} data-testid="measurement-value">
                    <strong>{shown.value}</strong>
                    {shown.unit && ` ${shown.unit}`}
                  </Table.Td>
                  <Table.Td className={classes.mono}>{shown.spec}</Table.Td>
                  <Table.Td className={classes.mono}>{shown.accept ?? <span className={classes.dim}>same as spec</span>}</Table.Td>
                  <Table.Td className={`${classes.mono} ${classes.num}`}>
                    {formatValue(m.uncertainty, m.quantity, m.unit).text}
                    {m.unit && m.unit !== 'flag' ? ` ${m.unit}` : ''}
                  </Table.Td>
                  <Table.Td title={ruleHint(m.rule)}>{ruleLabel(m.rule)}</Table.Td>
                  <Table.Td>{isVerdict(m.verdict) ? <VerdictBadge verdict={m.verdict} size="sm" /> : m.verdict}</Table.Td>
                  <Table.Td data-testid="measurement-decision">{decision ?? <span className={classes.dim}>not recorded</span>}</Table.Td>
                  <Table.Td className={classes.mono} title={formatStamp(m.measuredAt)}>
                    {formatTime(m.measuredAt)}
                  </Table.Td>
                </Table.Tr>
                {expanded && (
                  <Table.Tr>
                    <Table.Td colSpan={COLUMNS}>
                      <pre className={classes.raw} aria-label={`Raw readings of ${m.name}`}>
                        {JSON.stringify(m.raw, null, 2)}
                      </pre>
                    </Table.Td>
                  </Table.Tr>
                )}
              </Fragment>
            );
          })}
        </Table.Tbody>
      </Table>
    </Table.ScrollContainer>
  );
}
