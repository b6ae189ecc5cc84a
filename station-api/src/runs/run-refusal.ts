import { HttpException } from '@nestjs/common';
import type { RefusalCode } from '../contract/refusal-codes';
import { REFUSAL_CODES } from '../contract/refusal-codes';

/** Why a scan or a run start was refused: the one list is contract/refusal-codes.ts (the screens read it too). */
export type { RefusalCode };
export { REFUSAL_CODES };

/** HTTP status of each refusal: the one place refusals are mapped to HTTP. */
export const REFUSAL_STATUS: Record<RefusalCode, number> = {
  not_a_serial: 422,
  unknown_serial: 404,
  pattern_mismatch: 422,
  wrong_lot: 409,
  already_passed: 409,
  retest_limit: 409,
  station_blocked: 409,
  station_busy: 409,
  unit_busy: 409,
  unit_not_testable: 409,
  override_not_allowed: 403,
  station_not_found: 404,
  run_not_found: 404,
  run_finished: 409,
};


/**
 * A refusal before any power is applied, with a message for the person at the station. An HttpException,
 * so the global error filter answers it as every API error (`details.code` plus any extra details) and no
 * route needs to map it.
 */
export class RunRefusal extends HttpException {
  readonly httpStatus: number;

  constructor(
    readonly code: RefusalCode,
    message: string,
    readonly extra: Record<string, unknown> = {},
  ) {
    super({ message, details: { code, ...extra } }, REFUSAL_STATUS[code]);
    this.name = 'RunRefusal';
    this.httpStatus = REFUSAL_STATUS[code];
  }
}

/** Longest text taken as a serial; the demo patterns produce 14 characters, a scan error gives far more. */
const MAX_SERIAL_LENGTH = 64;
/** Characters a serial label may carry (after upper-casing): letters, digits and a few separators. */
const SERIAL_CHARS = /^[A-Z0-9][A-Z0-9._/-]*$/;

/**
 * A scanned or typed serial as it is looked up: trimmed and upper-cased (a serial typed by hand in lower
 * case is the same unit). Refuses with `not_a_serial` text that cannot be a serial at all.
 */
export function normaliseSerial(input: string): string {
  const serial = String(input ?? '').trim().toUpperCase();
  if (!serial || serial.length > MAX_SERIAL_LENGTH || !SERIAL_CHARS.test(serial)) {
    const shown = serial.length > 40 ? `${serial.slice(0, 40)}…` : serial;
    throw new RunRefusal(
      'not_a_serial',
      serial ? `"${shown}" is not a serial number. Scan the label on the unit again.` : 'No serial number was given. Scan the label on the unit.',
    );
  }
  return serial;
}
