import type { RunEndReasonName, RunView, StationStatePayload, StepOutline, UnitView } from '../realtime/station-events';
import type { Role } from '../users/user.entity';
import type { EngineClock } from './engine-clock';
import type { RunVerdict } from './test-run.entity';

/** Who asks for a run and with what authority. */
export interface RunRequester {
  id: number;
  roles: Role[];
  /** Shown on the run; looked up when not given */
  displayName?: string;
}

export interface StartRunInput {
  stationId: number;
  serial: string;
  requester: RunRequester;
  /** The operator confirmed the fixture is closed and safe to power (audited as `run.safety_confirmed`) */
  safetyConfirmed: boolean;
  /** Engineer's reason to retest a unit that already passed */
  overrideReason?: string;
  /** Time source for this run (the history seeder and the benchmark pass a virtual clock) */
  clock?: EngineClock;
  /** Write the safety confirmation to the audit trail (off for seeded history) */
  audit?: boolean;
  /** Called as each step begins, before its first fixture command (benchmark instrumentation) */
  onStepStarted?: (runId: number, stepKey: string, stepIndex: number) => void;
  /** Called after each step with its wall time (benchmark instrumentation) */
  onStepTimed?: (timing: StepTiming) => void;
  /** Benchmarks: after each step's measurements are committed and their events are out */
  onStepStored?: (stored: StepStored) => void;
}

export interface StepTiming {
  runId: number;
  stepKey: string;
  /** Wall time of the step: its fixture commands, judging, the commit of its measurements and their events, ms */
  wallMs: number;
}

export interface RunOutcome {
  runId: number;
  verdict: Exclude<RunVerdict, RunVerdict.Running>;
  failedStepKey?: string;
  errorMessage?: string;
  /** Why the run ended without a judged verdict (absent for pass and fail) */
  endReason?: RunEndReasonName;
  durationMs: number;
}

export interface StartedRun {
  run: RunView;
  /** Settles when the run has finished and everything is stored; never rejects */
  done: Promise<RunOutcome>;
}

/** What a scan checked and found. */
export interface ScanResult {
  unit: UnitView;
  lot: { id: number; code: string; state: string };
  product: { id: number; partNumber: string; name: string; vinNomV: number; voutNomV: number; ioutRatedA: number };
  attempt: number;
  plan: { versionId: number; code: string; name: string; version: number; stopAtFirstFailure: boolean; maxAttempts: number; steps: StepOutline[] };
}

export interface StationStatus {
  stationId: number;
  stationCode: string;
  stationName: string;
  state: StationStatePayload['state'];
  reasons: string[];
  /** Non-blocking warnings (see StationStatePayload) */
  warnings: string[];
  currentRunId?: number;
  currentSerial?: string;
  fixture: { id: number; code: string; calibrationDueAt: string; contactCyclesUsed: number; contactCyclesAllowed: number } | null;
  activeLot: { id: number; code: string; partNumber: string; state: string } | null;
}

/** Why a running test is asked to stop: the operator, or the server shutting down. */
export type StopCause = 'operator_stop' | 'server_shutdown';

export interface StepStored {
  runId: number;
  stepKey: string;
  /** How many measurements the step committed (one transaction) */
  measurements: number;
  /** From the step's judgment to its measurements committed (durable) and their events handed to the publisher, ms */
  judgedToStoredMs: number;
}
