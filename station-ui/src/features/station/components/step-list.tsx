import type { LimitView, MeasurementView, StepOutline } from '@station-events';
import { useEffect, useLayoutEffect, useRef } from 'react';
import { VerdictBadge } from '@/components/verdict';
import { decisionWords } from '@contract/run-outcome';
import { formatLimits, formatMeasured, formatValue } from '@contract/value-format';
import { limitStatus, measurementKey, stepStatus, type LiveRun, type StepStatus } from '../live-run';
import { recordPaintLatency } from '../paint-latency';
import classes from './step-list.module.css';

interface MeasuredValueProps {
  measurement: MeasurementView | undefined;
  limit: LimitView;
  emittedAtMs?: number;
}

/** The value cell: a dash until the value arrives, then the figure; its width never changes. */
function MeasuredValue({ measurement, limit, emittedAtMs }: MeasuredValueProps) {
  const id = measurement?.id;
  useLayoutEffect(() => {
    // once per judged value, after the commit that put it on screen
    if (id !== undefined && emittedAtMs !== undefined) recordPaintLatency(emittedAtMs);
  }, [id, emittedAtMs]);
  // a judged value is written at the digits of its limits (the shared formatter); before it arrives, a dash
  const { text, unit } = measurement
    ? (({ value, unit: u }) => ({ text: value, unit: u }))(formatMeasured(measurement))
    : formatValue(undefined, limit.key, limit.unit);
  return (
    <span className={classes.value} data-figure data-measured={measurement ? 'yes' : 'no'}>
      <span className={classes.number}>{text}</span>
      <span className={classes.unit}>{unit}</span>
    </span>
  );
}

function ResultMark({ status }: { status: StepStatus }) {
  switch (status) {
    case 'pass':
    case 'fail':
    case 'guard_fail':
      return <VerdictBadge verdict={status} size="md" className={classes.badge} />;
    case 'measuring':
      return <span className={classes.measuring}>measuring…</span>;
    case 'not_run':
      return <span className={classes.pending}>not run</span>;
    default:
      return (
        <span className={classes.pending} aria-label="waiting">
          —
        </span>
      );
  }
}

function ResultCell({ status, measurement }: { status: StepStatus; measurement?: MeasurementView }) {
  // null until a value arrives, and for a value stored before decisions were kept
  const decision = decisionWords(measurement?.decision);
  return (
    <>
      <ResultMark status={status} />
      {/* the decision's line is kept even when empty, so a row never grows when a value arrives */}
      <span className={classes.decision} data-testid="decision" data-visible={decision ? 'yes' : 'no'}>
        {decision ?? '\u00a0'}
      </span>
    </>
  );
}

interface LimitRowProps {
  live: LiveRun;
  step: StepOutline;
  stepIndex: number;
  limit: LimitView;
  first: boolean;
}

function LimitRow({ live, step, stepIndex, limit, first }: LimitRowProps) {
  const key = measurementKey(step.key, limit.key);
  const m = live.measurements[key];
  const status = limitStatus(live, stepIndex, limit.key);
  // once judged: value, specification and acceptance limits at the same digits; before that, the plan's
  // limits at the precision they were stated
  const shown = m ? formatMeasured(m) : null;
  const spec = shown ? shown.spec : formatLimits(limit.low, limit.high, limit.key, limit.unit);
  const accept = shown?.accept ?? null;
  const multi = step.limits.length > 1;
  return (
    <tr data-testid={`row-${key}`} data-status={status}>
      {first && (
        // a step with several checks names itself once, beside all of them; a single check uses both columns
        <td className={classes.stepCell} rowSpan={multi ? step.limits.length : undefined} colSpan={multi ? undefined : 2}>
          <span className={classes.stepName} title={step.name}>
            <span className={classes.stepNo}>{stepIndex + 1}</span>
            <span className={classes.stepText} data-multi={multi ? 'yes' : 'no'}>
              {step.name}
            </span>
          </span>
        </td>
      )}
      {multi && (
        <td className={classes.checkCell} title={limit.name}>
          {limit.name}
        </td>
      )}
      <td className={classes.valueCell}>
        <MeasuredValue measurement={m} limit={limit} emittedAtMs={live.emittedAtMs[key]} />
      </td>
      <td className={classes.limitCell}>
        <span className={classes.spec}>{spec}</span>
        {limit.rule === 'guarded' && (
          // reserved even before the value arrives, so the row does not grow when it does
          <span className={classes.guard} data-visible={accept ? 'yes' : 'no'}>
            {accept ? `guard ${accept}` : 'guard band'}
          </span>
        )}
      </td>
      <td className={classes.resultCell}>
        <ResultCell status={status} measurement={m} />
      </td>
    </tr>
  );
}

export interface StepListProps {
  live: LiveRun;
}

/**
 * The plan's steps, one row per judged quantity, laid out from the `run:started` outline before any
 * value arrives. Fixed column widths and reserved lines mean a streamed value never moves anything.
 */
export function StepList({ live }: StepListProps) {
  const tableRef = useRef<HTMLTableElement>(null);
  const firstFailed = live.finished ? live.steps.findIndex((_, i) => ['fail', 'guard_fail'].includes(stepStatus(live, i))) : -1;
  const focusIndex = live.finished ? firstFailed : live.currentStepIndex;
  // keep the step under way (or the first failed one) in view when the list is taller than its box
  useEffect(() => {
    if (focusIndex === null || focusIndex < 0) return;
    tableRef.current?.querySelectorAll('tbody')[focusIndex]?.scrollIntoView({ block: 'nearest' });
  }, [focusIndex]);
  return (
    <table className={classes.table} aria-label="Test steps" ref={tableRef}>
      <colgroup>
        <col className={classes.colStep} />
        <col className={classes.colCheck} />
        <col className={classes.colValue} />
        <col className={classes.colLimit} />
        <col className={classes.colResult} />
      </colgroup>
      <thead>
        <tr>
          <th scope="col" colSpan={2}>
            Step
          </th>
          <th scope="col" className={classes.right}>
            Measured
          </th>
          <th scope="col">Limits</th>
          <th scope="col">Result</th>
        </tr>
      </thead>
      {live.steps.map((step, i) => (
        <tbody
          key={step.key}
          className={classes.step}
          data-step={step.key}
          data-current={!live.finished && live.currentStepIndex === i ? 'yes' : 'no'}
          data-status={stepStatus(live, i)}
          aria-current={!live.finished && live.currentStepIndex === i ? 'step' : undefined}
        >
          {step.limits.map((limit, j) => (
            <LimitRow key={limit.key} live={live} step={step} stepIndex={i} limit={limit} first={j === 0} />
          ))}
        </tbody>
      ))}
    </table>
  );
}
