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
  /** Days before the calibration due date from which it warns (CALIBRATION_WARN_DAYS); 30 when absent */
  calibrationWarnDays?: number;
}

export interface Readiness {
  state: StationState;
  reasons: string[];
  /** Reasons that forbid starting a run (a subset of `reasons`) */
  blocking: string[];
  /** What will block soon but does not yet (calibration due soon, contacts nearly worn); never stops a run */
  warnings: string[];
}

const DAY_MS = 86_400_000;
/** Contact cycles used, as a fraction of those allowed, from which a probe change is announced */
export const CONTACT_WARN_FRACTION = 0.9;
export const DEFAULT_CALIBRATION_WARN_DAYS = 30;

const dateFmt = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });
const countFmt = new Intl.NumberFormat('en-US');

/** "3 Nov 2026" */
export function plainDate(d: Date): string {
  return dateFmt.format(d);
}

/** What readiness reads of a fixture. */
export type ReadinessFixture = NonNullable<ReadinessInput['fixture']>;

/** "Calibration overdue since 3 Nov 2026", or undefined while it is still valid (the due date itself is valid). */
export function calibrationBlock(f: Pick<ReadinessFixture, 'calibrationDueAt'>, now: Date): string | undefined {
  return f.calibrationDueAt.getTime() < now.getTime() ? `Calibration overdue since ${plainDate(f.calibrationDueAt)}` : undefined;
}

/** "Contact cycles at limit (50,000 of 50,000)", or undefined while cycles remain. */
export function contactBlock(f: Pick<ReadinessFixture, 'contactCyclesUsed' | 'contactCyclesAllowed'>): string | undefined {
  return f.contactCyclesUsed >= f.contactCyclesAllowed
    ? `Contact cycles at limit (${countFmt.format(f.contactCyclesUsed)} of ${countFmt.format(f.contactCyclesAllowed)})`
    : undefined;
}

/**
 * The fixture's warnings, worded for the station, the board and the fixtures page alike: a calibration due
 * within `warnDays` days (counted in whole days, rounded up, so "in 1 day" until the due moment), and contact
 * cycles at 90 % of the allowance or more but not yet exhausted. Nothing already blocking is repeated.
 */
export function fixtureWarnings(f: Pick<ReadinessFixture, 'calibrationDueAt' | 'contactCyclesUsed' | 'contactCyclesAllowed'>, now: Date, warnDays = DEFAULT_CALIBRATION_WARN_DAYS): string[] {
  const out: string[] = [];
  const leftMs = f.calibrationDueAt.getTime() - now.getTime();
  if (leftMs >= 0 && leftMs <= warnDays * DAY_MS) {
    const days = Math.ceil(leftMs / DAY_MS);
    const when = days === 0 ? 'today' : `in ${days} day${days === 1 ? '' : 's'}`;
    out.push(`Calibration due ${plainDate(f.calibrationDueAt)} (${when}); book the recalibration`);
  }
  const used = f.contactCyclesUsed;
  const allowed = f.contactCyclesAllowed;
  if (used < allowed && used >= CONTACT_WARN_FRACTION * allowed) {
    const pct = Math.floor((used / allowed) * 100);
    out.push(`Contact cycles at ${pct} % (${countFmt.format(used)} of ${countFmt.format(allowed)}); plan a probe change`);
  }
  return out;
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
    const calibration = calibrationBlock(fixture, now);
    if (calibration) blocking.push(calibration);
    const contacts = contactBlock(fixture);
    if (contacts) blocking.push(contacts);
  }
  const warnings = fixture ? fixtureWarnings(fixture, now, input.calibrationWarnDays) : [];
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
  return { state, reasons: state === 'testing' ? [] : reasons, blocking: noLot ? ['No active lot', ...blocking] : blocking, warnings };
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
