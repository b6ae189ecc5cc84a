import { loadEnv } from './env.validation';

let warnDays: number | undefined;

/**
 * CALIBRATION_WARN_DAYS: how many days before a fixture's calibration falls due the screens warn. Read once
 * (the environment does not change while the server runs).
 */
export function calibrationWarnDays(): number {
  warnDays ??= loadEnv().CALIBRATION_WARN_DAYS;
  return warnDays;
}
