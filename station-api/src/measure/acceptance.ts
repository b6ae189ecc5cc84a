import { requireFinite, requirePositive } from './guards';

/**
 * Decision rules for judging one measured value against its specification limits.
 *
 * - `simple` — simple acceptance, w = 0 (ILAC-G8:09/2019 §4.2.1): pass when the value lies within the
 *   tolerance limits. The specific false-accept risk at the limit can reach 50 %.
 * - `guarded` — guarded acceptance with guard band w = U, the expanded (k = 2) uncertainty (ILAC-G8:09/2019,
 *   binary statement with guard band): the acceptance limits are TL − U at the top and TL + U at the bottom,
 *   which keeps the specific false-accept risk below 2.5 %. A value inside the tolerance but outside the
 *   acceptance limits gets the verdict `guard_fail`.
 *
 * Independently of the rule, a non-binary statement per ILAC-G8:09/2019 §4.2.3 is returned, using w = U:
 * `pass` inside the acceptance limit, `conditional_pass` in the guard band but within tolerance,
 * `conditional_fail` beyond tolerance but within TL + w, `fail` beyond TL + w.
 *
 * All limits are inclusive: a value exactly on an acceptance limit passes, one exactly on a tolerance limit is
 * within tolerance, one exactly on TL + w is a conditional fail. "Exactly" allows a relative 1e-12, so that a
 * limit formed in binary floating point (5.1 + 0.01 = 5.109999999999999) still admits the decimal value written on
 * it; that is far below any instrument's resolution.
 */

const REL_EPS = 1e-12;

/** a ≤ b, allowing the relative rounding slack described above. */
function le(a: number, b: number): boolean {
  return a <= b + REL_EPS * Math.max(Math.abs(a), Math.abs(b));
}

export type AcceptanceRule = 'simple' | 'guarded';
export type Verdict = 'pass' | 'fail' | 'guard_fail';
export type ConformityStatement = 'pass' | 'conditional_pass' | 'conditional_fail' | 'fail';

export interface AcceptanceLimit {
  /** Lower tolerance limit (inclusive), in the quantity's unit */
  low?: number;
  /** Upper tolerance limit (inclusive), in the quantity's unit */
  high?: number;
  /** Expanded uncertainty U (k = 2) in the quantity's unit; 0 when absent */
  uncertainty?: number;
  rule: AcceptanceRule;
}

export interface Judgement {
  verdict: Verdict;
  /** Lower acceptance limit, low + U (guarded rule with a lower limit only) */
  guardedLow?: number;
  /** Upper acceptance limit, high − U (guarded rule with an upper limit only) */
  guardedHigh?: number;
  statement: ConformityStatement;
}

function checkLimit(limit: AcceptanceLimit): number {
  if (limit === null || typeof limit !== 'object') throw new RangeError('limit must be an object with low and/or high');
  const { low, high, rule } = limit;
  if (rule !== 'simple' && rule !== 'guarded') {
    throw new RangeError(`unknown decision rule "${String(rule)}"; use "simple" or "guarded"`);
  }
  if (low === undefined && high === undefined) throw new RangeError('a limit needs a low value, a high value or both');
  if (low !== undefined) requireFinite('low', low);
  if (high !== undefined) requireFinite('high', high);
  if (low !== undefined && high !== undefined && low > high) {
    throw new RangeError(`low limit ${low} is above high limit ${high}`);
  }
  const u = limit.uncertainty ?? 0;
  requireFinite('uncertainty', u);
  if (u < 0) throw new RangeError(`uncertainty must be 0 or more, got ${u}`);
  return u;
}

/**
 * Acceptance limits for the guarded rule, w = U: low + U and high − U.
 * @param limit tolerance limits and expanded uncertainty (any one unit)
 * @returns the acceptance limits, present for each tolerance limit given
 * @throws RangeError when the guard bands meet or cross, leaving no value that could pass
 */
export function guardedLimits(limit: AcceptanceLimit): { low?: number; high?: number } {
  const u = checkLimit(limit);
  const low = limit.low === undefined ? undefined : limit.low + u;
  const high = limit.high === undefined ? undefined : limit.high - u;
  if (low !== undefined && high !== undefined && le(high, low)) {
    throw new RangeError(
      `guard band U = ${u} closes the acceptance zone: tolerance ${limit.low}…${limit.high} shrinks to ${low}…${high}; ` +
        'reduce the uncertainty, widen the tolerance or use the simple rule',
    );
  }
  return { low, high };
}

function statementFor(value: number, limit: AcceptanceLimit, u: number): ConformityStatement {
  const { low, high } = limit;
  const within = (lo: number | undefined, hi: number | undefined) =>
    (lo === undefined || le(lo, value)) && (hi === undefined || le(value, hi));
  const shift = (x: number | undefined, by: number) => (x === undefined ? undefined : x + by);
  if (!within(shift(low, -u), shift(high, u))) return 'fail';
  if (!within(low, high)) return 'conditional_fail';
  if (!within(shift(low, u), shift(high, -u))) return 'conditional_pass';
  return 'pass';
}

/**
 * Judges one measured value.
 * @param value measured value, in the limit's unit
 * @param limit tolerance limits, expanded uncertainty U and decision rule
 * @returns the binary verdict under the rule, the guarded acceptance limits (guarded rule) and the ILAC-G8
 *   §4.2.3 non-binary statement
 * @throws RangeError on a non-finite value, an inconsistent limit, or a guarded limit with no acceptance zone
 */
export function judge(value: number, limit: AcceptanceLimit): Judgement {
  requireFinite('value', value);
  const u = checkLimit(limit);
  const { low, high } = limit;
  const inTolerance = (low === undefined || le(low, value)) && (high === undefined || le(value, high));
  const statement = statementFor(value, limit, u);
  if (limit.rule === 'simple') return { verdict: inTolerance ? 'pass' : 'fail', statement };

  const g = guardedLimits(limit);
  const inAcceptance = (g.low === undefined || le(g.low, value)) && (g.high === undefined || le(value, g.high));
  const verdict: Verdict = !inTolerance ? 'fail' : inAcceptance ? 'pass' : 'guard_fail';
  const out: Judgement = { verdict, statement };
  if (g.low !== undefined) out.guardedLow = g.low;
  if (g.high !== undefined) out.guardedHigh = g.high;
  return out;
}

/**
 * Test uncertainty ratio, ANSI/NCSL Z540.3 Handbook: TUR = (high − low) / (2U).
 * @param low lower tolerance limit
 * @param high upper tolerance limit
 * @param U expanded uncertainty (k = 2, ~95 %), same unit
 * @returns the ratio (dimensionless; 4 means 4:1)
 */
export function tur(low: number, high: number, U: number): number {
  requireFinite('low', low);
  requireFinite('high', high);
  requirePositive('U', U);
  if (high <= low) throw new RangeError(`high limit ${high} must be above low limit ${low}`);
  return (high - low) / (2 * U);
}

/**
 * Root-difference-of-squares acceptance half-width, A = √(T² − U²) (a guard-banding method from memory,
 * unverified; not used by `judge`, offered for comparison reports).
 * @param T tolerance half-width
 * @param U expanded uncertainty, same unit
 * @returns acceptance half-width, same unit
 * @throws RangeError when U ≥ T (no acceptance zone would remain)
 */
export function rdsHalfWidth(T: number, U: number): number {
  requirePositive('T', T);
  requireFinite('U', U);
  if (U < 0) throw new RangeError(`U must be 0 or more, got ${U}`);
  if (U >= T) throw new RangeError(`uncertainty ${U} is not smaller than the tolerance half-width ${T}; no acceptance zone remains`);
  return Math.sqrt(T * T - U * U);
}
