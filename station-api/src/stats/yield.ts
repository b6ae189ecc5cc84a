import { requireFinite } from '../measure/guards';
import { twoSidedZ } from './normal';

/**
 * Yield figures of a test station and their confidence intervals.
 *
 * Definitions (the yield metrics of Six Sigma practice, as commonly stated in quality-engineering texts):
 * - first-pass yield FPY = units that passed on their first attempt / units tested;
 * - final yield = units that passed in the end (after retests or rework) / units tested;
 * - rolled throughput yield RTY = product of the first-pass yields of the process steps in sequence.
 *
 * The interval for a single proportion is the Wilson score interval (E. B. Wilson, JASA 22:209–212, 1927), the
 * method Newcombe (Statistics in Medicine 17:857–872, 1998) recommends over the Wald interval: it never leaves
 * [0, 1] and keeps a useful width at x = 0 and x = n.
 */

export interface ProportionInterval {
  /** successes (e.g. units that passed) */
  x: number;
  /** trials (e.g. units tested) */
  n: number;
  /** x / n, or null when n = 0 (no data, nothing to estimate) */
  estimate: number | null;
  /** lower confidence bound, 0..1 (exactly 0 when x = 0) */
  lower: number;
  /** upper confidence bound, 0..1 (exactly 1 when x = n) */
  upper: number;
  /** two-sided confidence level, e.g. 0.95 */
  confidence: number;
  method: 'Wilson score';
}

function requireCount(name: string, v: number): void {
  requireFinite(name, v);
  if (v < 0 || !Number.isInteger(v)) throw new RangeError(`${name} must be a whole number of units, 0 or more, got ${v}`);
}

/**
 * Wilson score interval for a binomial proportion x/n:
 * (p̂ + z²/(2n) ± z·√(p̂(1 − p̂)/n + z²/(4n²))) / (1 + z²/n), z = Φ⁻¹(1 − α/2).
 * @param x successes, whole number 0..n
 * @param n trials, whole number ≥ 0; n = 0 gives estimate null and the uninformative interval [0, 1]
 * @param confidence two-sided confidence level, default 0.95
 * @throws RangeError on negative or fractional counts, x > n, or a confidence outside (0, 1)
 */
export function wilsonInterval(x: number, n: number, confidence = 0.95): ProportionInterval {
  const z = twoSidedZ(confidence);
  return { ...wilsonBounds(x, n, z), confidence, method: 'Wilson score' };
}

/**
 * The Wilson score bounds for a given critical value z (e.g. 1.96 when a report fixes z rather than the level).
 * Same checks and edge cases as `wilsonInterval`.
 */
export function wilsonBounds(x: number, n: number, z: number): { x: number; n: number; estimate: number | null; lower: number; upper: number } {
  requireCount('x', x);
  requireCount('n', n);
  if (x > n) throw new RangeError(`successes (${x}) cannot exceed trials (${n})`);
  requireFinite('z', z);
  if (!(z > 0)) throw new RangeError(`critical value z must be greater than 0, got ${z}`);
  if (n === 0) return { x, n, estimate: null, lower: 0, upper: 1 };
  const p = x / n;
  const z2 = z * z;
  const denom = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denom;
  const half = (z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n))) / denom;
  // At x = 0 and x = n the formula gives 0 and 1 exactly in real arithmetic; floating point leaves ~1e-17,
  // which would print as a non-zero bound.
  const lower = x === 0 ? 0 : Math.max(0, centre - half);
  const upper = x === n ? 1 : Math.min(1, centre + half);
  return { x, n, estimate: p, lower, upper };
}

export interface YieldCounts {
  /** units tested at least once in the population */
  unitsTested: number;
  /** units whose first attempt passed */
  passedFirstAttempt: number;
  /** units whose latest attempt passed (after any retest or repair) */
  passedFinally: number;
}

export interface YieldFigures {
  firstPass: ProportionInterval;
  final: ProportionInterval;
}

/**
 * First-pass and final yield of a population of units, each with its Wilson score interval.
 * @throws RangeError when the counts are inconsistent (a first-pass unit also passes finally)
 */
export function yieldFigures(counts: YieldCounts, confidence = 0.95): YieldFigures {
  const { unitsTested, passedFirstAttempt, passedFinally } = counts;
  requireCount('unitsTested', unitsTested);
  requireCount('passedFirstAttempt', passedFirstAttempt);
  requireCount('passedFinally', passedFinally);
  if (passedFirstAttempt > passedFinally) {
    throw new RangeError(
      `units passed on the first attempt (${passedFirstAttempt}) cannot exceed units passed in the end (${passedFinally})`,
    );
  }
  return {
    firstPass: wilsonInterval(passedFirstAttempt, unitsTested, confidence),
    final: wilsonInterval(passedFinally, unitsTested, confidence),
  };
}

export interface StepCounts {
  /** name of the process step, for the report */
  step: string;
  /** units that entered the step */
  entered: number;
  /** units that passed the step the first time, without rework or retest */
  passedFirstTime: number;
}

export interface RolledThroughputYield {
  /** Π FPYᵢ; null when any step has no units */
  rty: number | null;
  /** RTY^(1/k) over k steps, the average per-step yield; null when rty is null */
  normalizedYield: number | null;
  /** each step's first-pass yield with its own Wilson interval */
  steps: Array<ProportionInterval & { step: string }>;
}

/**
 * Rolled throughput yield: the probability that a unit passes every step in sequence the first time, estimated
 * as the product of the steps' first-pass yields.
 *
 * No single interval is given for the product: the steps see different, dependent sets of units, and a product of
 * per-step bounds would not have the stated confidence. Each step carries its own Wilson interval instead; for one
 * station where a unit passes all steps in one run, RTY equals the FPY of the run, and that FPY has an interval.
 * @throws RangeError on an empty list or inconsistent counts
 */
export function rolledThroughputYield(steps: readonly StepCounts[], confidence = 0.95): RolledThroughputYield {
  if (!Array.isArray(steps) || steps.length === 0) throw new RangeError('rolled throughput yield needs at least one step');
  const out = steps.map((s) => ({ step: s.step, ...wilsonInterval(s.passedFirstTime, s.entered, confidence) }));
  if (out.some((s) => s.estimate === null)) return { rty: null, normalizedYield: null, steps: out };
  const rty = out.reduce((acc, s) => acc * (s.estimate as number), 1);
  return { rty, normalizedYield: Math.pow(rty, 1 / out.length), steps: out };
}
