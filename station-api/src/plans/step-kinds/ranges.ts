import type { StepParams } from '../plan-definition';
import type { Bound, PhysicalRange, ProductRatings, QuantityDef, RangeContext } from './types';

/**
 * Physical ranges shared by several step kinds, and the two checks that read them: a reading outside its range
 * is implausible (runStep), and a limit whose acceptance zone lies outside it is refused (plan checks).
 */

/** The input voltage a step runs at: its own vinV, else the product's nominal input. */
export const stepVinV = (c: RangeContext): number => c.params.vinV ?? c.product.vinNomV;

/** Allowance below 0 V for meter offset and noise on an absent output (common practice, no source). */
const OUTPUT_OFFSET_FRACTION = 0.05;

/** Output voltage of a buck module: from 0 V (less a meter allowance) up to its input voltage. */
export const OUTPUT_VOLTAGE_RANGE: PhysicalRange = {
  min: (c) => -OUTPUT_OFFSET_FRACTION * c.product.voutNomV,
  max: stepVinV,
  text: '−5 % of V_nom ≤ V_out ≤ V_in',
  law:
    'a buck (step-down) converter cannot raise its input: V_out = D·V_in with duty 0 ≤ D ≤ 1 ' +
    '(Erickson & Maksimović, Fundamentals of Power Electronics, ch. 2, buck conversion ratio M(D) = D)',
};

/** A deviation of the output in mV (ripple, under- and overshoot): never negative, never more than V_in. */
export function outputSwingRange(what: string): PhysicalRange {
  return {
    min: 0,
    max: (c) => stepVinV(c) * 1000,
    text: `0 mV ≤ ${what} ≤ V_in`,
    law: `a peak or peak-to-peak deviation is not negative, and an output that stays within 0 V … V_in (buck, M(D) = D ≤ 1) cannot swing by more than V_in`,
  };
}

/** A yes/no answer stored as 1/0. */
export const FLAG_RANGE: PhysicalRange = { min: 0, max: 1, text: '0 or 1', law: 'a yes/no result is stored as 1 (yes) or 0 (no)' };

/** The value of a bound, or undefined when it needs a product that is not known. */
function boundValue(b: Bound | undefined, product: ProductRatings | undefined, params: StepParams): number | undefined {
  if (b === undefined) return undefined;
  if (typeof b === 'number') return b;
  return product ? b({ product, params }) : undefined;
}

/** A number as a person reads it in a message: 6 significant digits, no trailing zeros. */
export function shown(x: number): string {
  return String(Number(x.toPrecision(6)));
}

/**
 * Checks one reading against its quantity's physical range.
 * @returns a message naming the reading and the law, or undefined when it is plausible
 */
export function implausibility(def: QuantityDef, key: string, value: number, product: ProductRatings, params: StepParams): string | undefined {
  const r = def.range;
  const min = boundValue(r.min, product, params);
  const max = boundValue(r.max, product, params);
  const below = min !== undefined && (r.minOpen ? value <= min : value < min);
  const above = max !== undefined && (r.maxOpen ? value >= max : value > max);
  if (!below && !above) return undefined;
  const unit = def.unit === 'flag' ? '' : ` ${def.unit}`;
  return `${key} reads ${shown(value)}${unit}, outside its physical range ${r.text} (${r.law}); check the fixture's wiring and meters before judging this unit`;
}

/**
 * The acceptance zone of a limit (the tolerance narrowed by the guard band w = U under the guarded rule,
 * ILAC-G8:09/2019 §4.2.2; w = 0 under the simple rule) must leave some physically possible value, or no unit could
 * ever pass. A zone that shrinks to a single value counts as empty, as in measure/acceptance.ts guardedLimits.
 * @returns a message, or undefined when the zone is usable; flags are not checked here (they have their own rule)
 */
export function emptyZoneProblem(
  def: QuantityDef,
  limit: { low?: number; high?: number; uncertainty?: number; rule: 'simple' | 'guarded' },
  product: ProductRatings | undefined,
  params: StepParams,
): string | undefined {
  if (def.flag) return undefined;
  const w = limit.rule === 'guarded' ? (limit.uncertainty ?? 0) : 0;
  const accLow = limit.low === undefined ? undefined : limit.low + w;
  const accHigh = limit.high === undefined ? undefined : limit.high - w;
  const min = boundValue(def.range.min, product, params);
  const max = boundValue(def.range.max, product, params);
  const lower = accLow === undefined ? min : min === undefined ? accLow : Math.max(accLow, min);
  const upper = accHigh === undefined ? max : max === undefined ? accHigh : Math.min(accHigh, max);
  if (lower === undefined || upper === undefined || upper > lower) return undefined;
  const zone = `${accLow === undefined ? '−∞' : shown(accLow)} … ${accHigh === undefined ? '+∞' : shown(accHigh)} ${def.unit}`;
  const guard = w > 0 ? ` after the guard band U = ${shown(w)} ${def.unit}` : '';
  return (
    `the acceptance zone${guard} is ${zone}, which leaves no value inside the physical range ${def.range.text} (${def.range.law}); ` +
    'no unit could pass: widen the limit, lower the uncertainty or use the simple rule'
  );
}

/** Checks an output-voltage reading that feeds a computed quantity (regulation) against the buck's output range. */
export function outputReadingImplausible(reading: string, voutV: number, vinV: number, product: ProductRatings): string | undefined {
  return implausibility({ base: 'voutV', unit: 'V', name: reading, range: OUTPUT_VOLTAGE_RANGE }, reading, voutV, product, { vinV });
}
