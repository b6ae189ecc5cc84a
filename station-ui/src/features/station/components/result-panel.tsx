import { Button, Kbd, Loader, Progress } from '@mantine/core';
import { STOPPED_WORD } from '@contract/run-outcome';
import { formatMeasured } from '@contract/value-format';
import type { MeasurementView } from '@station-events';
import { useEffect, useState, type CSSProperties, type ReactNode } from 'react';
import { StationStateMark } from '@/components/station-state';
import { VerdictShape } from '@/components/verdict';
import type { LiveLinkState } from '@/lib/socket';
import { verdictLooks } from '@/theme';
import type { StationStatus } from '../api/get-station-status';
import { formatClock, formatDuration } from '../format';
import { completedSteps, progressFraction, type FinishedVerdict, type LiveRun } from '../live-run';
import type { PrintState } from '../hooks/use-print-repair-tag';
import classes from './result-panel.module.css';

/**
 * The words of the operator's verdict. A stopped run reads "Stopped", the one word every screen uses for it
 * (issue 12): the operator pressed "stop", and the word says what they did.
 */
export const operatorVerdictWords: Record<FinishedVerdict, string> = {
  pass: 'PASS',
  fail: 'FAIL',
  error: 'ERROR',
  aborted: STOPPED_WORD,
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

/**
 * "Efficiency at 1.5 A: 92.96 %, limits ≥ 93.00 %": value and limits at the same digits (the shared
 * formatter adds a digit where rounding would hide the failure); a guard-band failure names the
 * acceptance limits it missed.
 */
export function failureParts(m: MeasurementView): { name: string; value: string; limits: string; guard: string } {
  const f = formatMeasured(m);
  const value = f.value === '—' ? 'no reading' : `${f.value}${f.unit ? ` ${f.unit}` : ''}`;
  const guard =
    m.verdict !== 'guard_fail' ? '' : f.accept ? `(inside spec, outside guard band ${f.accept})` : '(inside spec, outside guard band)';
  return { name: m.name, value, limits: `limits ${f.spec}`, guard };
}

export function describeFailure(m: MeasurementView): string {
  const p = failureParts(m);
  return `${p.name}: ${p.value}, ${p.limits}${p.guard ? ` ${p.guard}` : ''}`;
}

/** One failure line; a value and its limits never break across lines ("4.875 … / 5.125 V" misleads). */
function FailureLine({ m }: { m: MeasurementView }) {
  const p = failureParts(m);
  return (
    <span className={classes.failure} data-testid="verdict-failure">
      {p.name}: <span className={classes.keep}>{p.value}</span>, <span className={classes.keep}>{p.limits}</span>
      {p.guard ? <> {p.guard}</> : null}
    </span>
  );
}

/** "attempt 2 of 3", or "attempt 2" while the plan's allowance is not known. */
export function attemptWords(attempt: number, maxAttempts: number | undefined): string {
  return maxAttempts !== undefined ? `attempt ${attempt} of ${maxAttempts}` : `attempt ${attempt}`;
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
  maxAttempts?: number;
  abortArmed: boolean;
  aborting: boolean;
  onAbort: () => void;
}

function TestingView({ live, maxAttempts, abortArmed, aborting, onAbort }: TestingViewProps) {
  const total = live.steps.length;
  const index = live.currentStepIndex;
  const current = index !== null ? live.steps[index] : undefined;
  const pct = Math.round(progressFraction(live) * 100);
  return (
    <section className={classes.panel} data-mode="testing" aria-label="Test in progress">
      <div className={classes.testingHead}>
        <span className={classes.testingMark}>
          <StationStateMark state="testing" sizePx={26} />
        </span>
        <span className={classes.serial} data-testid="testing-serial">
          {live.run.serial}
        </span>
        <span className={classes.attempt} data-testid="testing-attempt">
          {attemptWords(live.run.attempt, maxAttempts)}
        </span>
        <Elapsed sinceMs={live.seenAtMs} />
        {abortArmed ? (
          <Button color="signalRed" size="lg" onClick={onAbort} loading={aborting} data-testid="abort-confirm" className={classes.stopButton}>
            Press&nbsp;<Kbd>Esc</Kbd>&nbsp;again to stop
          </Button>
        ) : (
          <Button variant="default" size="lg" onClick={onAbort} loading={aborting} className={classes.stopButton}>
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
    </section>
  );
}

/** Where sending a failed unit to repair stands. */
export type RepairSendState = { kind: 'idle' } | { kind: 'sending' } | { kind: 'sent' } | { kind: 'failed'; message: string };

interface VerdictViewProps {
  live: LiveRun;
  maxAttempts?: number;
  print: PrintState;
  onPrint: () => void;
  repair: RepairSendState;
  onSendToRepair: () => void;
}

/**
 * What to do with a failed unit, in the words of the retest policy: with attempts left it stays at the
 * station (re-seat and test again, or send it to repair); with none left it goes to the repair queue.
 * The words never claim the unit is on the queue when it is not.
 */
function failAdvice(attempt: number, maxAttempts: number | undefined, repair: RepairSendState): { text: string; canSend: boolean } {
  if (repair.kind === 'sent') return { text: 'Sent to the repair queue. Put the unit on the repair rack.', canSend: false };
  if (maxAttempts !== undefined && attempt >= maxAttempts) {
    return { text: `No attempts left: the unit goes to the repair queue. Put it on the repair rack.`, canSend: false };
  }
  if (maxAttempts !== undefined) {
    const left = maxAttempts - attempt;
    return {
      text: `${left} ${left === 1 ? 'attempt' : 'attempts'} left: re-seat the unit and test it again, or send it to repair.`,
      canSend: true,
    };
  }
  return { text: 'Re-seat the unit and test it again, or send it to repair.', canSend: true };
}

function VerdictView({ live, maxAttempts, print, onPrint, repair, onSendToRepair }: VerdictViewProps) {
  const f = live.finished!;
  const look = verdictLooks[f.verdict];
  const word = operatorVerdictWords[f.verdict];
  const checks = Object.keys(live.measurements).length;
  const advice = f.verdict === 'fail' ? failAdvice(live.run.attempt, maxAttempts, repair) : null;
  let lines: ReactNode[];
  switch (f.verdict) {
    case 'pass':
      lines = [`Passed all ${checks} checks in ${formatDuration(f.durationMs)}.`];
      break;
    case 'fail': {
      const shown = f.failures.slice(0, 2).map((m) => <FailureLine key={m.id} m={m} />);
      const more = f.failures.length - shown.length;
      lines = [
        ...shown,
        ...(more > 0 ? [`and ${more} more, marked in the list below.`] : []),
        <strong key="advice" data-testid="verdict-advice">
          {advice!.text}
        </strong>,
      ];
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
      <div className={classes.verdictGrid}>
        <div className={classes.verdictHead}>
          <VerdictShape shape={look.shape} size={96} className={classes.verdictShape} />
          <span className={classes.verdictWord} data-testid="verdict-word">
            {word}
          </span>
        </div>
        <div className={classes.verdictDetails} data-testid="verdict-details">
          <span className={classes.verdictSerial}>
            <span>{live.run.serial}</span>
            <span className={classes.verdictAttempt} data-testid="verdict-attempt">
              {attemptWords(live.run.attempt, maxAttempts)}
            </span>
          </span>
          {lines.map((l, i) => (
            <span key={i} className={classes.verdictLine}>
              {l}
            </span>
          ))}
        </div>
        {f.verdict === 'fail' && (
          <div className={classes.actions}>
            <Button size="lg" color="graphite.9" onClick={onPrint} loading={print.kind === 'loading'} data-testid="print-tag">
              Print repair tag&nbsp;<Kbd size="md">{PRINT_KEY}</Kbd>
            </Button>
            {advice?.canSend && (
              <Button size="lg" variant="white" color="graphite.9" onClick={onSendToRepair} loading={repair.kind === 'sending'} data-testid="send-to-repair">
                Send to repair
              </Button>
            )}
            {print.kind === 'sent' && (
              <a href={print.url} target="_blank" rel="noreferrer" className={classes.actionNote}>
                Tag sent to the printer · open it
              </a>
            )}
            {print.kind === 'failed' && (
              <span className={classes.actionNote} role="alert">
                {print.message}
              </span>
            )}
            {repair.kind === 'failed' && (
              <span className={classes.actionNote} role="alert">
                {repair.message}
              </span>
            )}
          </div>
        )}
      </div>
    </section>
  );
}

function StationView({ status, link, statusFailed }: { status: StationStatus | undefined; link: LiveLinkState; statusFailed: boolean }) {
  // never "Scan a unit" (or a green READY) while the screen cannot hear the server
  if (link === 'lost' || link === 'refused' || statusFailed) {
    return (
      <section className={classes.panel} data-mode="offline" data-testid="offline" role="status">
        <div className={classes.notReadyRow}>
          <VerdictShape shape="triangle-exclamation" size={56} className={classes.offlineShape} />
          <div>
            <div className={classes.offlineTitle}>Server not reachable</div>
            <div className={classes.readyDetail}>
              {link === 'refused'
                ? 'The station server refused this screen: sign in again.'
                : 'Do not test now. The screen reconnects by itself; check the network cable if this stays.'}
            </div>
          </div>
        </div>
      </section>
    );
  }
  if (!status || link === 'connecting') {
    return (
      <section className={classes.panel} data-mode="loading" data-testid="connecting">
        <div className={classes.connectingRow}>
          <Loader color="copper" aria-label="Connecting to the station server" />
          <span className={classes.readyDetail}>Connecting to the station server…</span>
        </div>
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
  starting: boolean;
  status: StationStatus | undefined;
  /** The status could not be fetched (the server does not answer) */
  statusFailed?: boolean;
  link: LiveLinkState;
  /** Attempts the run's plan allows, when known */
  maxAttempts?: number;
  abortArmed: boolean;
  aborting: boolean;
  onAbort: () => void;
  print: PrintState;
  onPrint: () => void;
  repair: RepairSendState;
  onSendToRepair: () => void;
}

/**
 * The big panel under the scan field: what the operator needs at a glance. A test in progress wins; then
 * the start being sent; then the last verdict (it stays until the next scan); then the station's own
 * state. Refused scans never come here: they have their own place (scan-notice.tsx), so a verdict is
 * never hidden by one.
 */
export function ResultPanel(props: ResultPanelProps) {
  const { live, starting, status, statusFailed = false, link, maxAttempts, abortArmed, aborting, onAbort, print, onPrint, repair, onSendToRepair } = props;
  if (live && !live.finished) {
    return <TestingView live={live} maxAttempts={maxAttempts} abortArmed={abortArmed} aborting={aborting} onAbort={onAbort} />;
  }
  if (starting) {
    return (
      <section className={classes.panel} data-mode="starting">
        <div className={classes.readyTitle}>
          <Loader color="copper" size="lg" /> Starting the test…
        </div>
      </section>
    );
  }
  if (live?.finished) {
    return <VerdictView live={live} maxAttempts={maxAttempts} print={print} onPrint={onPrint} repair={repair} onSendToRepair={onSendToRepair} />;
  }
  return <StationView status={status} link={link} statusFailed={statusFailed} />;
}
