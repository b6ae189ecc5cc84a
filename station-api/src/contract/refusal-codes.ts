/*
 * Why a scan or a run start is refused: the machine-readable `details.code` of the API error. The one list;
 * the server's RunRefusal (src/runs/run-refusal.ts) and the screens (through the `@contract/*` alias) both
 * read it. Pure TypeScript, no imports.
 */

export const REFUSAL_CODES = [
  'unknown_serial',
  /** text that cannot be a serial at all (e.g. it contains spaces) */
  'not_a_serial',
  'pattern_mismatch',
  'wrong_lot',
  'already_passed',
  'retest_limit',
  'station_blocked',
  'station_busy',
  /** the unit is under test on another station */
  'unit_busy',
  /** the unit is in repair or scrapped */
  'unit_not_testable',
  /** a passed unit's retest was asked for without the engineer role */
  'override_not_allowed',
  'station_not_found',
  'run_not_found',
  'run_finished',
] as const;

export type RefusalCode = (typeof REFUSAL_CODES)[number];

export function isRefusalCode(code: unknown): code is RefusalCode {
  return typeof code === 'string' && (REFUSAL_CODES as readonly string[]).includes(code);
}
