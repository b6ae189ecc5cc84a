/**
 * The live events of the station server: event name → payload. The one place these shapes are defined;
 * the server emits only through `StationEventsPublisher` and the UI imports these types.
 * Pure types (no runtime imports) so any client can import this file.
 *
 * Rooms: `station:<id>` gets that station's events, `board` gets every station's events.
 * Every payload carries `stationId` and `emittedAt` (ms since the Unix epoch, server clock).
 */

import type { Decision, EndReason } from '../contract/run-outcome';

export type StationState = 'idle' | 'ready' | 'testing' | 'fault' | 'blocked';
export type RunVerdictName = 'running' | 'pass' | 'fail' | 'error' | 'aborted';
export type MeasurementVerdictName = 'pass' | 'fail' | 'guard_fail';
/** ILAC-G8:09/2019 §4.2.3 non-binary decision statement of a measurement (list: contract/run-outcome.ts) */
export type DecisionStatementName = Decision;
/** Why a run ended without a judged verdict (list and words: contract/run-outcome.ts); null for judged runs */
export type RunEndReasonName = EndReason;

export interface StationEventBase {
  stationId: number;
  /** When the server sent the event, ms since the Unix epoch */
  emittedAt: number;
}

/** A limit as the plan states it (inclusive bounds, in `unit`). */
export interface LimitView {
  key: string;
  name: string;
  unit: string;
  low?: number;
  high?: number;
  uncertainty?: number;
  rule: 'simple' | 'guarded';
}

/** A plan step as the operator screen lays it out before values arrive. */
export interface StepOutline {
  key: string;
  name: string;
  kind: string;
  limits: LimitView[];
}

/** One run, flat, with the names a screen shows (no second fetch needed). */
export interface RunView {
  id: number;
  stationId: number;
  stationCode: string;
  unitId: number;
  serial: string;
  lotId: number;
  lotCode: string;
  productId: number;
  partNumber: string;
  planVersionId: number;
  planCode: string;
  planVersion: number;
  /** SHA-256 of the plan version's steps the run used (a version never changes once released) */
  planChecksum?: string;
  operatorId: number;
  operatorName: string;
  fixtureId: number;
  fixtureCode: string;
  /** 1 for the first test of the unit, 2 for the first retest, ... */
  attempt: number;
  verdict: RunVerdictName;
  /** ISO 8601 */
  startedAt: string;
  finishedAt: string | null;
  durationMs: number | null;
  failedStepKey: string | null;
  errorMessage: string | null;
  /** Why the run ended without a judged verdict; null for pass, fail and running */
  endReason: RunEndReasonName | null;
  fixtureIdentity: string | null;
  fixtureCalibrationDueAt: string | null;
  fixtureContactCycles: number | null;
  overrideReason: string | null;
  overrideByName: string | null;
}

export interface UnitView {
  id: number;
  serial: string;
  state: 'untested' | 'passed' | 'failed' | 'in_repair' | 'scrapped';
  testCount: number;
  lotCode: string;
  partNumber: string;
  lastTestedAt: string | null;
}

/** One judged quantity with the limits in force when it was judged. */
export interface MeasurementView {
  id: number;
  runId: number;
  stepIndex: number;
  stepKey: string;
  stepName: string;
  quantity: string;
  name: string;
  /** null when the quantity could not be obtained (e.g. the output never recovered) */
  value: number | null;
  unit: string;
  lowLimit: number | null;
  highLimit: number | null;
  guardedLow: number | null;
  guardedHigh: number | null;
  /** Expanded uncertainty U (k = 2) used for the guard band, in `unit` */
  uncertainty: number;
  rule: string;
  verdict: MeasurementVerdictName;
  /** ILAC-G8:09/2019 §4.2.3 statement; null when there was no plausible value (or recorded before it was stored) */
  decision: DecisionStatementName | null;
  raw: Record<string, unknown> | null;
  startedAt: string;
  measuredAt: string;
}

export interface StationStatePayload extends StationEventBase {
  state: StationState;
  /** Why the station is not ready, in plain words; empty when ready or testing */
  reasons: string[];
  /** What will block soon but does not yet (calibration due soon, contacts nearly worn), in plain words; never stops a run */
  warnings: string[];
  currentRunId?: number;
  currentSerial?: string;
}

export interface RunStartedPayload extends StationEventBase {
  run: RunView;
  unit: UnitView;
  steps: StepOutline[];
}

export interface StepStartedPayload extends StationEventBase {
  runId: number;
  stepKey: string;
  stepIndex: number;
}

export interface MeasurementJudgedPayload extends StationEventBase {
  runId: number;
  stepKey: string;
  measurement: MeasurementView;
}

export interface RunFinishedPayload extends StationEventBase {
  runId: number;
  verdict: Exclude<RunVerdictName, 'running'>;
  failedStepKey?: string;
  /** Every measurement that did not pass, in order */
  failures: MeasurementView[];
  errorMessage?: string;
  /** Why the run ended without a judged verdict (absent for pass and fail) */
  endReason?: RunEndReasonName;
  durationMs: number;
  /** The unit after the run (state, test count) */
  unit: UnitView;
}

/** Server → client events. */
export interface StationEventMap {
  'station:state': StationStatePayload;
  'run:started': RunStartedPayload;
  'step:started': StepStartedPayload;
  'measurement:judged': MeasurementJudgedPayload;
  'run:finished': RunFinishedPayload;
}
export type StationEventName = keyof StationEventMap;
export const STATION_EVENT_NAMES: readonly StationEventName[] = [
  'station:state',
  'run:started',
  'step:started',
  'measurement:judged',
  'run:finished',
];

/** Client → server messages; each is acknowledged with a {@link JoinAck}. */
export interface ClientMessageMap {
  'station:join': { stationId: number };
  'station:leave': { stationId: number };
  'board:join': Record<string, never>;
}

export type JoinAck = { ok: true; room: string } | { ok: false; message: string };

/** Sent just before the server drops a connection it will not serve (bad or expired token). */
export interface AuthErrorPayload {
  message: string;
}

export const stationRoom = (stationId: number): string => `station:${stationId}`;
export const BOARD_ROOM = 'board';
