import type { LimitSpec, PlanStep } from '../plans/plan-definition';
import { ConformityStatement, guardedLimits, judge, Verdict } from './acceptance';

/** What judging needs of a quantity a step produced (the step-kind registry's `Quantity` fits it). */
export interface QuantityReading {
  value: number | null;
  raw: Record<string, unknown>;
  /** Why there is no value, in plain words */
  problem?: string;
  /** Set when the reading is outside the quantity's physical range; the message names the reading */
  implausible?: string;
}

/** A judged limit, as it is stored. */
export interface JudgedRow {
  stepIndex: number;
  stepKey: string;
  stepName: string;
  quantity: string;
  name: string;
  value?: number;
  unit: string;
  lowLimit?: number;
  highLimit?: number;
  guardedLow?: number;
  guardedHigh?: number;
  uncertainty: number;
  rule: string;
  verdict: Verdict;
  /** ILAC-G8:09/2019 §4.2.3 non-binary statement; null when there was no plausible value to state on */
  decision: ConformityStatement | null;
  raw: Record<string, unknown>;
  startedAt: Date;
  measuredAt: Date;
  /** The reading was physically impossible: the run ends in error with this message, the unit is not judged */
  implausible?: string;
}

/**
 * Judges one limit of a step against the quantity the step produced (`q`, or undefined when the step gave
 * none), with the limit's decision rule and the expanded uncertainty from {@link uncertaintyFor}. A missing
 * value fails; an implausible one fails too and carries its message for the run to end in error.
 */
export function judgeLimit(
  stepIndex: number,
  step: Pick<PlanStep, 'key' | 'name'>,
  limit: LimitSpec,
  q: QuantityReading | undefined,
  fixture: UncertaintySource,
  startedAt: Date,
  measuredAt: Date,
): JudgedRow {
  const uncertainty = uncertaintyFor(limit, fixture);
  const spec = { low: limit.low, high: limit.high, uncertainty, rule: limit.rule };
  let verdict: Verdict;
  let decision: ConformityStatement | null = null;
  let guarded: { low?: number; high?: number } = {};
  let problem: string | undefined = q ? q.problem : `step produced no ${limit.key}`;
  if (q && q.implausible) {
    // never judged against the limit: a physically impossible reading says the setup is wrong, not the unit
    verdict = 'fail';
    problem = q.implausible;
    if (limit.rule === 'guarded') guarded = guardedLimits(spec);
  } else if (q && q.value !== null) {
    const j = judge(q.value, spec);
    verdict = j.verdict;
    decision = j.statement;
    guarded = { low: j.guardedLow, high: j.guardedHigh };
  } else {
    // no value: the unit gave nothing to judge, which fails the limit
    verdict = 'fail';
    if (limit.rule === 'guarded') guarded = guardedLimits(spec);
  }
  return {
    stepIndex,
    stepKey: step.key,
    stepName: step.name,
    quantity: limit.key,
    name: limit.name,
    value: q?.value ?? undefined,
    unit: limit.unit,
    lowLimit: limit.low,
    highLimit: limit.high,
    guardedLow: guarded.low,
    guardedHigh: guarded.high,
    uncertainty,
    rule: limit.rule,
    verdict,
    decision,
    raw: { ...(q?.raw ?? {}), ...(problem ? { problem } : {}) },
    startedAt,
    measuredAt,
    ...(q?.implausible ? { implausible: q.implausible } : {}),
  };
}

/** Where the expanded uncertainties of a run come from besides the plan: the fixture and its current calibration. */
export interface UncertaintySource {
  /** The fixture's voltmeter uncertainty, volts (k = 2) */
  voltageUncertaintyV: number;
  /**
   * U (k = 2) per quantity as the fixture's current calibration certificate states it, keyed by the quantity
   * name a limit key starts with (`voutV` covers `voutV@1.5`), in that quantity's unit (the plan checks hold
   * every limit to the registry's unit)
   */
  calibrated?: Readonly<Record<string, number>>;
}

/**
 * Expanded uncertainty for a limit, in the limit's unit. The rule (docs/calibration.md):
 * 1. the current calibration's U for the limit's quantity, when the certificate states one: it replaces the
 *    plan's value, which is a planning estimate made before the fixture was calibrated;
 * 2. else the limit's own value from the plan;
 * 3. else the fixture's output-voltage uncertainty for volt quantities (V or mV);
 * 4. else 0.
 */
export function uncertaintyFor(limit: LimitSpec, fixture: UncertaintySource): number {
  // the quantity is the key before any `@<load>` (plans/step-kinds/limit-keys.ts; measure/ stays free of the registry)
  const stated = fixture.calibrated?.[limit.key.split('@')[0]];
  if (typeof stated === 'number' && Number.isFinite(stated) && stated >= 0) return stated;
  if (limit.uncertainty !== undefined && limit.uncertainty !== null) return limit.uncertainty;
  if (limit.unit === 'V') return fixture.voltageUncertaintyV;
  if (limit.unit === 'mV') return fixture.voltageUncertaintyV * 1000;
  return 0;
}
