import { HoldRuleKind } from './hold-rule.entity';
import { plainNumber } from './rule-evaluation';

/** What a rule's fields mean, as the Holds page and the e-mail say it. */
export interface RuleFields {
  kind: HoldRuleKind;
  windowUnits?: number | null;
  minFpyPct?: number | null;
  minCpk?: number | null;
  stepKey?: string | null;
  quantity?: string | null;
  ruleSet?: string | null;
  failuresInRow?: number | null;
}

export const RULE_KIND_WORDS: Record<HoldRuleKind, string> = {
  [HoldRuleKind.Fpy]: 'First-pass yield',
  [HoldRuleKind.Cpk]: 'Cpk of a quantity',
  [HoldRuleKind.RunRule]: 'Control-chart signal',
  [HoldRuleKind.ConsecutiveFailures]: 'Failures in a row',
};

const RULE_SET_WORDS: Record<string, string> = { 'western-electric': 'Western Electric rules', nelson: 'Nelson rules' };

/** "Hold when FPY of the last 50 units is below 92 %" etc. */
export function describeRule(r: RuleFields): string {
  const q = `${r.stepKey ?? '?'} · ${r.quantity ?? '?'}`;
  switch (r.kind) {
    case HoldRuleKind.Fpy:
      return `Hold when the first-pass yield of the last ${r.windowUnits} units is below ${plainNumber(r.minFpyPct ?? 0)} %`;
    case HoldRuleKind.Cpk:
      return `Hold when Cpk of ${q} over the last ${r.windowUnits} tests is below ${plainNumber(r.minCpk ?? 0)}`;
    case HoldRuleKind.RunRule:
      return `Hold when ${RULE_SET_WORDS[r.ruleSet ?? 'western-electric'] ?? r.ruleSet} signal on ${q} over the last ${r.windowUnits} tests`;
    case HoldRuleKind.ConsecutiveFailures:
      return `Hold after ${r.failuresInRow} failed tests in a row at one station`;
  }
}
