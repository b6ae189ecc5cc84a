import { isRefusalCode, type RefusalCode } from '@contract/refusal-codes';
import { isApiError } from '@/lib/api-client';

/** Why the server would not start a test (`details.code`): the server's own list (station-api/src/contract). */
export type { RefusalCode };

/**
 * What this screen says when no server code applies: the scan never reached the server (`no_server`), the
 * live link is down so nothing may start (`no_link`), the server refused the input without a code
 * (`invalid_scan`), or anything else (`other`). Kept apart from the server's list on purpose.
 */
export type LocalRefusalKind = 'invalid_scan' | 'no_server' | 'no_link' | 'other';

/** What the operator reads after a refused scan: a headline for two metres away and one plain sentence. */
export interface RefusalMessage {
  /** `details.code`, or a local kind when the server sent none */
  code: RefusalCode | LocalRefusalKind;
  title: string;
  detail: string;
  /** True when an engineer may test the unit anyway after giving a reason */
  canOverride?: boolean;
}

export interface RefusalContext {
  /** The serial as scanned */
  serial: string;
  /** The part number of the station's lot, when known, to name what the label should be */
  partNumber?: string;
  /** The signed-in person holds the engineer role */
  isEngineer?: boolean;
}

function detailsOf(error: unknown): Record<string, unknown> {
  if (!isApiError(error)) return {};
  const d = error.details;
  return d && typeof d === 'object' && !Array.isArray(d) ? (d as Record<string, unknown>) : {};
}

const text = (v: unknown): string | undefined => (typeof v === 'string' && v.trim() ? v : undefined);
const count = (v: unknown): number | undefined => (typeof v === 'number' && Number.isFinite(v) ? v : undefined);

/**
 * Turns a refused scan or start into words the operator can act on. Each `details.code` gets its own
 * headline; the server's own sentence is kept where it carries facts this screen does not know
 * (a blocking reason, a repair state).
 */
export function describeRefusal(error: unknown, ctx: RefusalContext): RefusalMessage {
  const serial = ctx.serial || 'This unit';
  if (!isApiError(error)) {
    return {
      code: 'other',
      title: 'Scan not handled',
      detail: 'Something went wrong on this screen. Scan the unit again; if it repeats, tell your shift lead.',
    };
  }
  if (error.status === 0) {
    return { code: 'no_server', title: 'Station server not reachable', detail: 'Nothing was started. Check the network cable, then scan again.' };
  }
  const d = detailsOf(error);
  const code = isRefusalCode(error.code) ? error.code : undefined;
  switch (code) {
    case 'unknown_serial':
      return {
        code: 'unknown_serial',
        title: 'Unknown serial',
        detail: `${serial} is not registered. Check the label; if it is right, ask your shift lead to register the unit.`,
      };
    case 'not_a_serial':
      return {
        code: 'not_a_serial',
        title: 'Not a serial',
        detail: `“${serial}” is not a unit serial. Scan the label on the unit itself.`,
      };
    case 'pattern_mismatch':
      return {
        code: 'pattern_mismatch',
        title: 'Not a serial of this lot',
        // no article before the part number: "a OB-…" reads wrong, and the part number may be unknown
        detail: ctx.partNumber
          ? `“${serial}” does not have the form of the serials of ${ctx.partNumber}. Scan the label on the unit itself.`
          : `“${serial}” does not have the form of this product's serials. Scan the label on the unit itself.`,
      };
    case 'wrong_lot': {
      const unitLot = text(d.unitLot);
      const activeLot = text(d.activeLot);
      return {
        code: 'wrong_lot',
        title: 'Wrong lot: set it aside',
        detail:
          unitLot && activeLot
            ? `${serial} belongs to lot ${unitLot}, but this station is testing lot ${activeLot}.`
            : `${serial} belongs to another lot than the one this station is testing.`,
      };
    }
    case 'already_passed':
      return {
        code: 'already_passed',
        title: 'Already passed',
        detail: ctx.isEngineer
          ? `${serial} has passed before. To test it again, give the reason for the override.`
          : `${serial} has passed before. Testing it again needs an engineer's override.`,
        canOverride: !!ctx.isEngineer,
      };
    case 'retest_limit': {
      const tested = count(d.testCount);
      const max = count(d.maxAttempts);
      return {
        code: 'retest_limit',
        title: 'Retest limit reached: send it to repair',
        detail:
          tested !== undefined && max !== undefined
            ? `${serial} has been tested ${tested} times; the plan allows ${max}. Send it to repair.`
            : `${serial} has been tested as often as the plan allows. Send it to repair.`,
      };
    }
    case 'station_blocked': {
      const reasons = Array.isArray(d.reasons) ? d.reasons.filter((r): r is string => typeof r === 'string' && r.length > 0) : [];
      return {
        code: 'station_blocked',
        title: 'Station blocked',
        detail: reasons.length > 0 ? `Nothing was powered: ${reasons.join('; ')}.` : error.message,
      };
    }
    case 'station_busy':
      return { code: 'station_busy', title: 'Station busy', detail: 'A test is running on this station. Wait for its result, then scan again.' };
    case 'unit_not_testable': {
      // the title follows the unit's state: a scrapped unit is not "held for repair"
      const state = text(d.unitState);
      const title = state === 'scrapped' ? 'Unit scrapped: set it aside' : state === 'in_repair' ? 'Unit held for repair' : 'Unit cannot be tested';
      return { code: 'unit_not_testable', title, detail: error.message };
    }
    case 'override_not_allowed':
      return {
        code: 'override_not_allowed',
        title: 'Engineer needed',
        detail: `Only an engineer can test ${serial} again: it has already passed.`,
      };
    case 'unit_busy': {
      const where = text(d.station);
      return {
        code: 'unit_busy',
        title: 'Unit under test elsewhere',
        detail: where
          ? `${serial} is being tested at ${where} right now. Wait for that test to end, then scan it again.`
          : `${serial} is being tested on another station right now. Wait for that test to end, then scan it again.`,
      };
    }
    case 'station_not_found':
      return { code: 'station_not_found', title: 'Station not found', detail: 'This station no longer exists. Choose the station again.' };
    // a stop request's answers: the run is gone or has already ended
    case 'run_not_found':
      return { code: 'run_not_found', title: 'Run not found', detail: `${error.message} Scan the unit again.` };
    case 'run_finished':
      return { code: 'run_finished', title: 'Run already finished', detail: 'The test had ended before the stop arrived; its verdict is shown.' };
    case undefined:
      break;
    default:
      // a code the server added that this screen has no words for yet fails the type-check here
      return code satisfies never;
  }
  if (error.status === 400) {
    return { code: 'invalid_scan', title: 'Scan not read', detail: `${error.message}. Scan the label again.` };
  }
  return { code: 'other', title: 'Scan refused', detail: error.message };
}
