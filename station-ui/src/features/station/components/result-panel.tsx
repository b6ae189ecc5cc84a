import { Button, Kbd, Loader, Progress } from '@mantine/core';
import type { MeasurementView } from '@station-events';
import { useEffect, useState, type CSSProperties, type ReactNode } from 'react';
import { StationStateMark } from '@/components/station-state';
import { VerdictShape } from '@/components/verdict';
import { verdictLooks } from '@/theme';
import type { StationStatus } from '../api/get-station-status';
import { formatClock, formatDuration, formatLimits, formatValue } from '../format';
import { completedSteps, progressFraction, type FinishedVerdict, type LiveRun } from '../live-run';
import type { RefusalMessage } from '../refusal-messages';
import type { PrintState } from '../hooks/use-print-repair-tag';
import classes from './result-panel.module.css';

/**
 * The words of the operator's verdict. "STOPPED" rather than the office screens' "ABORTED": the operator
 * pressed "stop", and the word says what they did.
 */
export const operatorVerdictWords: Record<FinishedVerdict, string> = {
  pass: 'PASS',
  fail: 'FAIL',
  error: 'ERROR',
  aborted: 'STOPPED',
};

/** Key that prints the repair tag of a failed unit (a function key: a scanner never sends one). */
export const PRINT_KEY = 'F8';

function lookStyle(verdict: FinishedVerdict): CSSProperties {
  const color = verdictLooks[verdict].color;
  return {
    '--v-base': `var(--mantine-color-${color}-6)`,
    '--v-deep': `var(--mantine-color-${color}-7)`,
    '--v-tint': `var(--mantine-color-${color}-0)`,
  } as CSSProperties;
}

/** "Output voltage at 3 A: 4.612 V, limits 4.900 … 5.100 V" */
export function describeFailure(m: MeasurementView): string {
  const v = formatValue(m.value, m.quantity, m.unit);
  const value = v.text === '—' ? 'no reading' : `${v.text}${v.unit ? ` ${v.unit}` : ''}`;
  const guard = m.verdict === 'guard_fail' ? ' (inside spec, outside guard band)' : '';
  return `${m.name}: ${value}, limits ${formatLimits(m.lowLimit, m.highLimit, m.quantity, m.unit)}${guard}`;
}

function Elapsed({ sinceMs, stopped }: { sinceMs: number; stopped?: boolean }) {
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (stopped) return;
    const t = window.setInterval(() => setNow(Date.now()), 250);
    return () => window.clearInterval(t);
  }, [stopped]);
  return (
    <span className={classes.clock} aria-label="Elapsed time">
      {formatClock(now - sinceMs)}
    </span>
  );
}

interface TestingViewProps {
  live: LiveRun;
  abortArmed: boolean;
  aborting: boolean;
  onAbort: () => void;
  notice?: ReactNode;
}

function TestingView({ live, abortArmed, aborting, onAbort, notice }: TestingViewProps) {
  const total = live.steps.length;
  const index = live.currentStepIndex;
  const current = index !== null ? live.steps[index] : undefined;
  const pct = Math.round(progressFraction(live) * 100);
  return (
    <section className={classes.panel} data-mode="testing" aria-label="Test in progress">
      <div className={classes.testingHead}>
        <StationStateMark state="testing" sizePx={26} />
        <span className={classes.serial} data-testid="testing-serial">
          {live.run.serial}
        </span>
        <Elapsed sinceMs={live.seenAtMs} />
        {abortArmed ? (
          <Button color="signalRed" size="lg" onClick={onAbort} loading={aborting} data-testid="abort-confirm">
            Press&nbsp;<Kbd>Esc</Kbd>&nbsp;again to stop
          </Button>
        ) : (
          <Button variant="default" size="lg" onClick={onAbort} loading={aborting}>
            <Kbd>Esc</Kbd>&nbsp;Stop the test
          </Button>
        )}
      </div>
      <div className={classes.stepLine} aria-live="polite">
        {current ? (
          <span className={classes.stepText}>
            Step {index! + 1} of {total}: <strong>{current.name}</strong>
          </span>
        ) : (
          <span className={classes.stepText}>Preparing the fixture…</span>
        )}
        <span className={classes.doneCount}>
          {completedSteps(live)} of {total} done
        </span>
      </div>
      <Progress value={pct} size={18} radius="sm" color="copper" aria-label="Test progress" transitionDuration={200} />
      {notice && <div className={classes.notice}>{notice}</div>}
    </section>
  );
}

interface VerdictViewProps {
  live: LiveRun;
  print: PrintState;
  onPrint: () => void;
}

function VerdictView({ live, print, onPrint }: VerdictViewProps) {
  const f = live.finished!;
  const look = verdictLooks[f.verdict];
  const word = operatorVerdictWords[f.verdict];
  const checks = Object.keys(live.measurements).length;
  let lines: ReactNode[];
  switch (f.verdict) {
    case 'pass':
      lines = [`Passed all ${checks} checks in ${formatDuration(f.durationMs)}.`];
      break;
    case 'fail': {
      const shown = f.failures.slice(0, 2).map((m) => (
        <span key={m.id} className={classes.failure}>
          {describeFailure(m)}
        </span>
      ));
      const more = f.failures.length - shown.length;
      lines = [...shown, ...(more > 0 ? [`and ${more} more, marked in the list below.`] : []), 'The unit is on the repair queue.'];
      break;
    }
    case 'error':
      lines = [f.errorMessage ?? 'The fixture or the software reported a fault.', <strong key="n">Unit not judged — test it again.</strong>];
      break;
    default:
      lines = ['Stopped before the end.', <strong key="n">Unit not judged — test it again.</strong>];
  }
  return (
    <section
      className={classes.panel}
      data-mode="verdict"
      data-verdict={f.verdict}
      style={lookStyle(f.verdict)}
      aria-label={`Result: ${word}`}
      data-testid="verdict"
    >
      <div className={classes.verdictRow}>
        <VerdictShape shape={look.shape} size={108} className={classes.verdictShape} />
        <span className={classes.verdictWord} data-testid="verdict-word">
          {word}
        </span>
        <div className={classes.verdictDetails}>
          <span className={classes.verdictSerial}>{live.run.serial}</span>
          {lines.map((l, i) => (
            <span key={i} className={classes.verdictLine}>
              {l}
            </span>
          ))}
        </div>
        {f.verdict === 'fail' && (
          <div className={classes.printBox}>
            <Button size="lg" color="graphite.9" onClick={onPrint} loading={print.kind === 'loading'} data-testid="print-tag">
              Print repair tag&nbsp;<Kbd size="md">{PRINT_KEY}</Kbd>
            </Button>
            {print.kind === 'sent' && (
              <a href={print.url} target="_blank" rel="noreferrer" className={classes.printNote}>
                Tag sent to the printer · open it
              </a>
            )}
            {print.kind === 'failed' && (
              <span className={classes.printNote} role="alert">
                {print.message}
              </span>
            )}
          </div>
        )}
      </div>
    </section>
  );
}

function RefusalView({ refusal }: { refusal: RefusalMessage }) {
  return (
    <section className={classes.panel} data-mode="refusal" data-refusal={refusal.code} role="alert" data-testid="refusal">
      <div className={classes.refusalRow}>
        <VerdictShape shape="triangle-exclamation" size={72} className={classes.refusalShape} />
        <div>
          <div className={classes.refusalTitle}>{refusal.title}</div>
          <div className={classes.refusalDetail}>{refusal.detail}</div>
          <div className={classes.refusalHint}>No test was started. Scan the next unit when ready.</div>
        </div>
      </div>
    </section>
  );
}

function StationView({ status }: { status: StationStatus | undefined }) {
  if (!status) {
    return (
      <section className={classes.panel} data-mode="loading">
        <Loader color="copper" aria-label="Loading the station" />
      </section>
    );
  }
  if (status.state === 'ready' || status.state === 'testing') {
    return (
      <section className={classes.panel} data-mode="ready" data-testid="ready-prompt">
        <div className={classes.readyTitle}>Scan a unit</div>
        <div className={classes.readyDetail}>
          {status.activeLot ? (
            <>
              Lot <strong>{status.activeLot.code}</strong> · {status.activeLot.partNumber}
            </>
          ) : null}
          {status.fixture ? <> · fixture {status.fixture.code}</> : null}
        </div>
      </section>
    );
  }
  return (
    <section className={classes.panel} data-mode="not-ready" data-state={status.state} data-testid="not-ready">
      <div className={classes.notReadyRow}>
        <StationStateMark state={status.state} sizePx={40} />
        <ul className={classes.reasons}>
          {(status.reasons.length > 0 ? status.reasons : ['The station cannot test now.']).map((r) => (
            <li key={r}>{r}</li>
          ))}
        </ul>
      </div>
    </section>
  );
}

export interface ResultPanelProps {
  live: LiveRun | null | undefined;
  refusal: RefusalMessage | null;
  starting: boolean;
  status: StationStatus | undefined;
  abortArmed: boolean;
  aborting: boolean;
  onAbort: () => void;
  print: PrintState;
  onPrint: () => void;
}

/**
 * The big panel under the scan field: what the operator needs at a glance. A test in progress wins; then
 * a refused scan; then the start being sent; then the last verdict (it stays until the next scan); then
 * the station's own state.
 */
export function ResultPanel({ live, refusal, starting, status, abortArmed, aborting, onAbort, print, onPrint }: ResultPanelProps) {
  if (live && !live.finished) {
    return (
      <TestingView
        live={live}
        abortArmed={abortArmed}
        aborting={aborting}
        onAbort={onAbort}
        notice={refusal ? `${refusal.title}: ${refusal.detail}` : undefined}
      />
    );
  }
  if (refusal) return <RefusalView refusal={refusal} />;
  if (starting) {
    return (
      <section className={classes.panel} data-mode="starting">
        <div className={classes.readyTitle}>
          <Loader color="copper" size="lg" /> Starting the test…
        </div>
      </section>
    );
  }
  if (live?.finished) return <VerdictView live={live} print={print} onPrint={onPrint} />;
  return <StationView status={status} />;
}
