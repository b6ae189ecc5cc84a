import type { PlanStep } from '../plans/plan-definition';
import { HoldRuleKind } from './hold-rule.entity';
import type { RuleFields } from './hold-rule-words';

/*
 * Bounds of a hold rule's fields, per kind. Minimum windows are common practice, no source: with fewer than 10
 * units one failure moves FPY by 10 points or more; Cpk from fewer than 20 values is too uncertain to stop a
 * line on (its 95 % interval spans roughly ±0.3 at Cpk 1.33); the run rules need at least 8 (WE) or 15 (Nelson
 * N7) points to be met at all. The upper bound keeps a window's query small.
 */
export const RULE_BOUNDS = {
  maxWindow: 1000,
  minWindow: { [HoldRuleKind.Fpy]: 10, [HoldRuleKind.Cpk]: 20, [HoldRuleKind.RunRule]: { 'western-electric': 10, nelson: 15 } },
  maxCpk: 5,
  failuresInRow: { min: 2, max: 50 },
} as const;

export interface FieldProblem {
  field: string;
  problems: string[];
}

type Fields = RuleFields & Record<string, unknown>;

const KIND_FIELDS: Record<HoldRuleKind, string[]> = {
  [HoldRuleKind.Fpy]: ['windowUnits', 'minFpyPct'],
  [HoldRuleKind.Cpk]: ['windowUnits', 'minCpk', 'stepKey', 'quantity'],
  [HoldRuleKind.RunRule]: ['windowUnits', 'stepKey', 'quantity', 'ruleSet'],
  [HoldRuleKind.ConsecutiveFailures]: ['failuresInRow'],
};
const ALL_FIELDS = ['windowUnits', 'minFpyPct', 'minCpk', 'stepKey', 'quantity', 'ruleSet', 'failuresInRow'];
const KIND_NAMES: Record<HoldRuleKind, string> = {
  [HoldRuleKind.Fpy]: 'a first-pass yield rule',
  [HoldRuleKind.Cpk]: 'a Cpk rule',
  [HoldRuleKind.RunRule]: 'a control-chart rule',
  [HoldRuleKind.ConsecutiveFailures]: 'a failures-in-a-row rule',
};

/**
 * Problems with a rule's fields, one entry per field, worded so a person can fix them. `steps`: the product's
 * released plan (null when it has none).
 */
export function checkRuleFields(r: Fields, steps: PlanStep[] | null, partNumber: string): FieldProblem[] {
  const out: FieldProblem[] = [];
  const add = (field: string, problem: string) => out.push({ field, problems: [problem] });
  const needed = KIND_FIELDS[r.kind];
  for (const f of ALL_FIELDS) {
    const given = r[f] !== undefined && r[f] !== null;
    if (given && !needed.includes(f)) add(f, `${f} does not apply to ${KIND_NAMES[r.kind]}; leave it out`);
    if (!given && needed.includes(f) && f !== 'ruleSet') add(f, `${f} is required for ${KIND_NAMES[r.kind]}`);
  }
  if (out.length > 0) return out;

  if (r.kind !== HoldRuleKind.ConsecutiveFailures) {
    const n = r.windowUnits as number;
    const min =
      r.kind === HoldRuleKind.RunRule ? RULE_BOUNDS.minWindow[HoldRuleKind.RunRule][r.ruleSet === 'nelson' ? 'nelson' : 'western-electric'] : RULE_BOUNDS.minWindow[r.kind];
    if (!(n >= min && n <= RULE_BOUNDS.maxWindow)) {
      add('windowUnits', `windowUnits must be from ${min} to ${RULE_BOUNDS.maxWindow} for ${KIND_NAMES[r.kind]} (got ${n}); fewer ${r.kind === HoldRuleKind.Fpy ? 'units' : 'tests'} say too little to stop a line`);
    }
  }
  if (r.kind === HoldRuleKind.Fpy) {
    const x = r.minFpyPct as number;
    if (!(x > 0 && x <= 100)) add('minFpyPct', `minFpyPct must be more than 0 and at most 100 percent (got ${x}), e.g. 92`);
  }
  if (r.kind === HoldRuleKind.Cpk) {
    const y = r.minCpk as number;
    if (!(y > 0 && y <= RULE_BOUNDS.maxCpk)) add('minCpk', `minCpk must be more than 0 and at most ${RULE_BOUNDS.maxCpk} (got ${y}), e.g. 1.33`);
  }
  if (r.kind === HoldRuleKind.ConsecutiveFailures) {
    const k = r.failuresInRow as number;
    const { min, max } = RULE_BOUNDS.failuresInRow;
    if (!(k >= min && k <= max)) add('failuresInRow', `failuresInRow must be from ${min} to ${max} (got ${k})`);
  }
  if (r.kind === HoldRuleKind.Cpk || r.kind === HoldRuleKind.RunRule) {
    if (!steps) {
      add('stepKey', `${partNumber} has no released test plan, so it has no quantities to watch yet; release a plan first`);
      return out;
    }
    const step = steps.find((s) => s.key === r.stepKey);
    if (!step) {
      add('stepKey', `step "${r.stepKey}" is not in the released plan of ${partNumber}; its steps are ${steps.map((s) => s.key).join(', ')}`);
      return out;
    }
    const limit = step.limits.find((l) => l.key === r.quantity);
    if (!limit) {
      add('quantity', `step "${step.key}" does not measure "${r.quantity}"; it measures ${step.limits.map((l) => l.key).join(', ') || 'nothing'}`);
    } else if (r.kind === HoldRuleKind.Cpk && limit.low === undefined && limit.high === undefined) {
      add('quantity', `"${r.quantity}" of step "${step.key}" has no limits, so it has no Cpk; choose a quantity with a low or high limit`);
    }
  }
  return out;
}
