import { baseDigits, guardDiffers as guardDiffersOf } from '@contract/value-format';

/*
 * Compatibility names for the station screen, which the lead moves onto `@contract/value-format` after merge.
 * No digit logic lives here: every rule is the contract's one formatter (station-api/src/contract).
 * New code imports `@contract/value-format` directly.
 */
export { FLAG_UNIT, formatLimits, formatValue } from '@contract/value-format';

/** @deprecated use `baseDigits` (or `digitsToShow`) from `@contract/value-format` */
export const digitsFor = baseDigits;

/** @deprecated use `guardDiffers` from `@contract/value-format`, which takes the measurement */
export function guardDiffers(
  low: number | null | undefined,
  high: number | null | undefined,
  guardedLow: number | null | undefined,
  guardedHigh: number | null | undefined,
): boolean {
  return guardDiffersOf({ lowLimit: low ?? null, highLimit: high ?? null, guardedLow: guardedLow ?? null, guardedHigh: guardedHigh ?? null });
}
