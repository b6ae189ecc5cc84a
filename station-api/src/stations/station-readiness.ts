import type { StationState } from '../realtime/station-events';
import type { Station } from './station.entity';

/*
 * The one place a station's readiness is worked out and worded: the run engine's live state, the start
 * refusal and the stations list all read it.
 */

/** What the readiness check looks at; plain data so it can be tested without a database. */
export interface ReadinessInput {
  now: Date;
  station: { code: string; active: boolean };
  fixture?: {
    code: string;
    active: boolean;
    calibrationDueAt: Date;
    contactCyclesUsed: number;
    contactCyclesAllowed: number;
  };
  lot?: { code: string; state: string; holdReason?: string | null; partNumber: string };
  /** A released plan exists for the active lot's product */
  hasReleasedPlan: boolean;
  /** The last exchange with the fixture failed (message), or undefined when it answered / was not tried */
  fixtureFault?: string;
  /** A run in progress on this station */
  running?: { runId: number; serial: string };
}

export interface Readiness {
  state: StationState;
  reasons: string[];
  /** Reasons that forbid starting a run (a subset of `reasons`) */
  blocking: string[];
}

const dateFmt = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
const countFmt = new Intl.NumberFormat('en-US');

/** "3 Nov 2026" */
export function plainDate(d: Date): string {
  return dateFmt.format(d);
}

/**
 * The station's state and, in plain words, why it is not ready.
 * Order of precedence: testing > blocked > fault > idle (no active lot, nothing else wrong) > ready.
 */
export function readiness(input: ReadinessInput): Readiness {
  const blocking: string[] = [];
  const { station, fixture, lot, now } = input;
  if (!station.active) blocking.push(`Station ${station.code} is switched off in the settings`);
  if (!fixture) {
    blocking.push('Fixture not connected');
  } else {
    if (!fixture.active) blocking.push(`Fixture ${fixture.code} is out of service`);
    // due date itself is still usable: overdue means strictly after it
    if (fixture.calibrationDueAt.getTime() < now.getTime()) blocking.push(`Calibration overdue since ${plainDate(fixture.calibrationDueAt)}`);
    if (fixture.contactCyclesUsed >= fixture.contactCyclesAllowed) {
      blocking.push(`Contact cycles at limit (${countFmt.format(fixture.contactCyclesUsed)} of ${countFmt.format(fixture.contactCyclesAllowed)})`);
    }
  }
  let noLot = false;
  if (!lot) {
    noLot = true;
  } else {
    if (lot.state !== 'open') {
      const why = lot.state === 'on_hold' ? `on hold${lot.holdReason ? `: ${lot.holdReason}` : ''}` : lot.state;
      blocking.push(`Lot ${lot.code} is ${why}`);
    }
    if (!input.hasReleasedPlan) blocking.push(`No released plan for ${lot.partNumber}`);
  }
  const reasons = [...(noLot ? ['No active lot'] : []), ...blocking];
  if (input.fixtureFault && fixture) reasons.push(input.fixtureFault);

  let state: StationState;
  if (input.running) state = 'testing';
  else if (blocking.length > 0) state = 'blocked';
  else if (input.fixtureFault && fixture) state = 'fault';
  else if (noLot) state = 'idle';
  else state = 'ready';
  return { state, reasons: state === 'testing' ? [] : reasons, blocking: noLot ? ['No active lot', ...blocking] : blocking };
}

/**
 * What keeps a station from testing, judged from master data alone (no fixture traffic, a released plan
 * assumed): an empty list means it could test. Worded as {@link readiness} words it. Expects the station's
 * fixture and active lot (with product) loaded.
 */
export function staticBlockReasons(s: Station, now = new Date()): string[] {
  const lot = s.activeLot;
  return readiness({
    now,
    station: s,
    fixture: s.fixture ?? undefined,
    lot: lot ? { code: lot.code, state: lot.state, holdReason: lot.holdReason, partNumber: lot.product?.partNumber ?? '' } : undefined,
    hasReleasedPlan: true,
  }).blocking;
}
