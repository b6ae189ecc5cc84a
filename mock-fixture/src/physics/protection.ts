import type { UnitModel } from './model-types';
import { solveOperatingPoint } from './operating-point';

/** Result of an overload check, as `PROT:TEST?` reports it. */
export interface ProtectionResult {
  /** The output fell below half its nominal value under the overload */
  folded: boolean;
  /** After the overload was removed the output came back within 5 % of its value before the test */
  recovered: boolean;
  voutDuringV: number;
  voutAfterV: number;
}

/** Fold-back is recognised below this fraction of the nominal output (fixture's own criterion). */
export const FOLDED_BELOW_FRACTION = 0.5;
/** Recovery is recognised within this fraction of the output before the test (fixture's own criterion). */
export const RECOVERED_WITHIN_FRACTION = 0.05;

/**
 * Apply an overload to the module, remove it and report. The protection is not latching, so the output
 * after the test is the steady state at the previous load again.
 * @param vinV input voltage (V)
 * @param priorLoadA load before and after the test (A; 0 with the load off)
 * @param overloadA load during the test (A)
 */
export function protectionTest(unit: UnitModel, vinV: number, priorLoadA: number, overloadA: number): ProtectionResult {
  const before = solveOperatingPoint(unit, { sourceOn: true, vinV, loadA: priorLoadA });
  const during = solveOperatingPoint(unit, { sourceOn: true, vinV, loadA: overloadA });
  const after = solveOperatingPoint(unit, { sourceOn: true, vinV, loadA: priorLoadA });
  const nominalV = unit.ratings.voutV;
  return {
    folded: during.voutV < FOLDED_BELOW_FRACTION * nominalV,
    recovered:
      before.voutV > FOLDED_BELOW_FRACTION * nominalV &&
      Math.abs(after.voutV - before.voutV) <= RECOVERED_WITHIN_FRACTION * before.voutV,
    voutDuringV: during.voutV,
    voutAfterV: after.voutV,
  };
}
