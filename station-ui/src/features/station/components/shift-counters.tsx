import { Loader } from '@mantine/core';
import { formatFigure } from '@/components/figure';
import { useShiftSummary } from '../api/get-shift-summary';
import classes from './station-screen.module.css';

interface CounterProps {
  label: string;
  value: string;
  testId: string;
}

function Counter({ label, value, testId }: CounterProps) {
  return (
    <div className={classes.counter}>
      <span className={classes.counterValue} data-testid={testId}>
        {value}
      </span>
      <span className={classes.counterLabel}>{label}</span>
    </div>
  );
}

/** This station's shift so far: refreshed on every `run:finished` (hooks/use-station-live.ts). */
export function ShiftCounters({ stationId }: { stationId: number }) {
  const q = useShiftSummary(stationId);
  if (q.isPending) {
    return (
      <aside className={classes.counters} aria-label="This shift">
        <Loader size="sm" aria-label="Loading the shift counts" />
      </aside>
    );
  }
  if (q.isError || !q.data) {
    return (
      <aside className={classes.counters} aria-label="This shift">
        <span className={classes.counterLabel}>Shift counts not available</span>
      </aside>
    );
  }
  const s = q.data;
  return (
    <aside className={classes.counters} aria-label="This shift">
      <span className={classes.counterTitle}>{s.shiftName || 'This shift'}</span>
      <Counter label="tested" value={String(s.tested)} testId="shift-tested" />
      <Counter label="passed" value={String(s.passed)} testId="shift-passed" />
      <Counter label="failed" value={String(s.failed)} testId="shift-failed" />
      <Counter label="first-pass yield" value={s.firstPassYieldPct === null ? '—' : `${formatFigure(s.firstPassYieldPct, 1)} %`} testId="shift-fpy" />
      <Counter label="units per hour" value={s.unitsPerHour === null ? '—' : formatFigure(s.unitsPerHour, 0)} testId="shift-uph" />
    </aside>
  );
}
