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
  fixture: { voltageUncertaintyV: number },
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

/**
 * Expanded uncertainty for a limit, in the limit's unit: the limit's own value, else the fixture's
 * output-voltage uncertainty for volt quantities (V or mV), else 0.
 */
export function uncertaintyFor(limit: LimitSpec, fixture: { voltageUncertaintyV: number }): number {
  if (limit.uncertainty !== undefined && limit.uncertainty !== null) return limit.uncertainty;
  if (limit.unit === 'V') return fixture.voltageUncertaintyV;
  if (limit.unit === 'mV') return fixture.voltageUncertaintyV * 1000;
  return 0;
}
