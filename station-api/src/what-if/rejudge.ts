import { judge } from '../measure/acceptance';
import type { LimitSpec, PlanStep } from '../plans/plan-definition';
import { parseLimitKey } from '../plans/step-kinds/limit-keys';
import type { AffectedUnit, LimitChangeCount, RejudgeResult } from '../contract/what-if-views';
import { wilsonInterval } from '../stats/yield';

/**
 * Re-judging stored measurements against a draft's limits, as plain data in and out (no database, no writes).
 *
 * Each unit is represented by its first judged run (verdict pass or fail). For every limit of the draft, the
 * stored value of the same step key and quantity is judged again with the draft's low/high, uncertainty and
 * decision rule (measure/acceptance.ts judge; a guard-band result counts as a fail, as it does at the station).
 * A stored measurement without a value fails, as it did. A unit's predicted verdict:
 * - fail when any re-judged limit fails;
 * - pass when every limit measured anywhere in the scope was measured on this unit and passes;
 * - unknown when its run stopped before some of those limits (stop at first failure), so it cannot be predicted.
 * Limits that no unit in the scope was measured on (a new step or quantity) are listed and judge nobody.
 */

export interface StoredMeasurement {
  runId: number;
  stepKey: string;
  quantity: string;
  value: number | null;
  /** stored verdict: pass, fail or guard_fail */
  verdict: string;
  uncertainty: number;
}

export interface UnitRun {
  runId: number;
  unitId: number;
  serial: string;
  /** stored run verdict: pass or fail */
  verdict: 'pass' | 'fail';
  startedAt: string;
}

export type Change = 'pass_to_fail' | 'fail_to_pass';

export type { AffectedUnit, LimitChangeCount, RejudgeResult } from '../contract/what-if-views';

/** Step key + quantity with the load read as a number, so `voutV@1.5` and `voutV@1.50A` meet. */
function measureKey(stepKey: string, quantity: string): string {
  const { base, atA } = parseLimitKey(quantity);
  return `${stepKey}\u0000${base}\u0000${atA === undefined ? '' : String(atA)}`;
}

const binary = (v: string): 'pass' | 'fail' => (v === 'pass' ? 'pass' : 'fail');

function rejudgeOne(limit: LimitSpec, m: StoredMeasurement): 'pass' | 'fail' {
  if (m.value === null || !Number.isFinite(m.value)) return 'fail';
  const uncertainty = limit.uncertainty ?? m.uncertainty;
  return judge(m.value, { low: limit.low, high: limit.high, uncertainty, rule: limit.rule }).verdict === 'pass' ? 'pass' : 'fail';
}

/**
 * @param steps the draft's steps (normalised, as stored)
 * @param runs one first judged run per unit
 * @param measurements the stored measurements of those runs
 * @param maxAffected longest list of affected units returned (counts are always complete)
 */
export function rejudge(steps: PlanStep[], runs: UnitRun[], measurements: StoredMeasurement[], maxAffected = 500): RejudgeResult {
  // a plan has a few dozen step/quantity pairs: parse each once, not once per stored row (what-if p95, issue 11)
  const keys = new Map<string, Map<string, string>>();
  const keyOf = (stepKey: string, quantity: string): string => {
    let byQuantity = keys.get(stepKey);
    if (!byQuantity) keys.set(stepKey, (byQuantity = new Map()));
    let key = byQuantity.get(quantity);
    if (key === undefined) byQuantity.set(quantity, (key = measureKey(stepKey, quantity)));
    return key;
  };
  const byRun = new Map<number, Map<string, StoredMeasurement>>();
  for (const m of measurements) {
    let map = byRun.get(m.runId);
    if (!map) byRun.set(m.runId, (map = new Map()));
    map.set(keyOf(m.stepKey, m.quantity), m);
  }
  const limits = steps.flatMap((s) => s.limits.map((l) => ({ step: s, limit: l, key: measureKey(s.key, l.key) })));
  const measuredSomewhere = limits.map((x) => runs.some((r) => byRun.get(r.runId)?.has(x.key)));
  const perLimit: LimitChangeCount[] = limits.map(({ step, limit }) => ({
    stepKey: step.key,
    stepName: step.name,
    limitKey: limit.key,
    limitName: limit.name,
    unit: limit.unit,
    passToFail: 0,
    failToPass: 0,
    measured: 0,
  }));
  const perStep = new Map(steps.map((s) => [s.key, { stepKey: s.key, stepName: s.name, passToFail: 0, failToPass: 0 }]));

  let judged = 0;
  let passToFail = 0;
  let failToPass = 0;
  let unknown = 0;
  let predictedPass = 0;
  let currentPass = 0;
  const affected: AffectedUnit[] = [];

  for (const run of runs) {
    if (run.verdict === 'pass') currentPass++;
    const stored = byRun.get(run.runId);
    let anyFail = false;
    let missing = false;
    const changedLimits: AffectedUnit['limits'] = [];
    const stepBefore = new Map<string, 'pass' | 'fail'>();
    const stepAfter = new Map<string, 'pass' | 'fail'>();
    for (let i = 0; i < limits.length; i++) {
      const { step, limit, key } = limits[i];
      if (!measuredSomewhere[i]) continue;
      const m = stored?.get(key);
      if (!m) {
        missing = true;
        continue;
      }
      judged++;
      perLimit[i].measured++;
      const before = binary(m.verdict);
      const after = rejudgeOne(limit, m);
      if (after === 'fail') anyFail = true;
      if (before !== after) {
        if (after === 'fail') perLimit[i].passToFail++;
        else perLimit[i].failToPass++;
        changedLimits.push({ stepKey: step.key, limitKey: limit.key, value: m.value, before, after });
      }
      if (before === 'fail') stepBefore.set(step.key, 'fail');
      else if (!stepBefore.has(step.key)) stepBefore.set(step.key, 'pass');
      if (after === 'fail') stepAfter.set(step.key, 'fail');
      else if (!stepAfter.has(step.key)) stepAfter.set(step.key, 'pass');
    }
    for (const [key, after] of stepAfter) {
      const before = stepBefore.get(key);
      const counts = perStep.get(key)!;
      if (before === 'pass' && after === 'fail') counts.passToFail++;
      if (before === 'fail' && after === 'pass') counts.failToPass++;
    }
    const predicted: 'pass' | 'fail' | 'unknown' = anyFail ? 'fail' : missing ? 'unknown' : 'pass';
    if (predicted === 'unknown') {
      unknown++;
      continue;
    }
    if (predicted === 'pass') predictedPass++;
    if (predicted !== run.verdict) {
      if (predicted === 'fail') passToFail++;
      else failToPass++;
      if (affected.length < maxAffected) {
        affected.push({ unitId: run.unitId, serial: run.serial, runId: run.runId, before: run.verdict, after: predicted, limits: changedLimits });
      }
    }
  }

  const predictedN = runs.length - unknown;
  return {
    unitsInScope: runs.length,
    measurementsJudged: judged,
    passToFail,
    failToPass,
    unknown,
    perStep: [...perStep.values()],
    perLimit,
    unmeasuredLimits: limits.filter((_, i) => !measuredSomewhere[i]).map(({ step, limit }) => ({ stepKey: step.key, limitKey: limit.key })),
    currentFpy: wilsonInterval(currentPass, runs.length),
    predictedFpy: wilsonInterval(predictedPass, predictedN),
    affected,
  };
}
