/** Why a scan or a run start was refused; `code` is the machine-readable `details.code` of the API error. */
export type RefusalCode =
  | 'unknown_serial'
  | 'pattern_mismatch'
  | 'wrong_lot'
  | 'already_passed'
  | 'retest_limit'
  | 'station_blocked'
  | 'station_busy'
  /** the unit is in repair or scrapped */
  | 'unit_not_testable'
  /** a passed unit's retest was asked for without the engineer role */
  | 'override_not_allowed'
  | 'station_not_found'
  | 'run_not_found'
  | 'run_finished';

const STATUS: Record<RefusalCode, number> = {
  unknown_serial: 404,
  pattern_mismatch: 422,
  wrong_lot: 409,
  already_passed: 409,
  retest_limit: 409,
  station_blocked: 409,
  station_busy: 409,
  unit_not_testable: 409,
  override_not_allowed: 403,
  station_not_found: 404,
  run_not_found: 404,
  run_finished: 409,
};

/** A refusal before any power is applied, with a message for the person at the station. */
export class RunRefusal extends Error {
  readonly httpStatus: number;

  constructor(
    readonly code: RefusalCode,
    message: string,
    readonly extra: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = 'RunRefusal';
    this.httpStatus = STATUS[code];
  }
}
