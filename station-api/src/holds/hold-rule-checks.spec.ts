import { describe, expect, it } from 'vitest';
import type { PlanStep } from '../plans/plan-definition';
import { checkRuleFields } from './hold-rule-checks';
import { HoldRuleKind } from './hold-rule.entity';

const steps: PlanStep[] = [
  { key: 'vout-no-load', name: 'Output at no load', kind: 'vout_at_load' as PlanStep['kind'], params: {}, limits: [{ key: 'voutV', name: 'Output voltage', unit: 'V', low: 4.875, high: 5.125, rule: 'guarded' }] },
  { key: 'info', name: 'Info', kind: 'vout_at_load' as PlanStep['kind'], params: {}, limits: [{ key: 'tempC', name: 'Temperature', unit: '°C', rule: 'simple' }] },
];
const fields = (problems: ReturnType<typeof checkRuleFields>) => problems.map((p) => p.field);

describe('hold rule checks', () => {
  it('accepts a sound rule of each kind', () => {
    expect(checkRuleFields({ kind: HoldRuleKind.Fpy, windowUnits: 50, minFpyPct: 92 }, steps, 'OB-BK0503')).toEqual([]);
    expect(checkRuleFields({ kind: HoldRuleKind.Cpk, windowUnits: 30, minCpk: 1.33, stepKey: 'vout-no-load', quantity: 'voutV' }, steps, 'OB-BK0503')).toEqual([]);
    expect(checkRuleFields({ kind: HoldRuleKind.RunRule, windowUnits: 25, stepKey: 'vout-no-load', quantity: 'voutV' }, steps, 'OB-BK0503')).toEqual([]);
    expect(checkRuleFields({ kind: HoldRuleKind.ConsecutiveFailures, failuresInRow: 3 }, null, 'OB-BK0503')).toEqual([]);
  });

  it('names missing and foreign fields', () => {
    const p = checkRuleFields({ kind: HoldRuleKind.Fpy, windowUnits: 50, minCpk: 1 }, steps, 'OB-BK0503');
    expect(fields(p).sort()).toEqual(['minCpk', 'minFpyPct']);
    expect(p.find((x) => x.field === 'minCpk')!.problems[0]).toContain('does not apply to a first-pass yield rule');
  });

  it('refuses out-of-range numbers with the allowed range', () => {
    expect(checkRuleFields({ kind: HoldRuleKind.Fpy, windowUnits: 5, minFpyPct: 0 }, steps, 'P')).toMatchObject([
      { field: 'windowUnits', problems: [expect.stringContaining('from 10 to 1000')] },
      { field: 'minFpyPct', problems: [expect.stringContaining('more than 0 and at most 100')] },
    ]);
    expect(fields(checkRuleFields({ kind: HoldRuleKind.Fpy, windowUnits: 10, minFpyPct: 100.5 }, steps, 'P'))).toEqual(['minFpyPct']);
    expect(fields(checkRuleFields({ kind: HoldRuleKind.ConsecutiveFailures, failuresInRow: 1 }, steps, 'P'))).toEqual(['failuresInRow']);
    expect(fields(checkRuleFields({ kind: HoldRuleKind.RunRule, windowUnits: 12, ruleSet: 'nelson', stepKey: 'vout-no-load', quantity: 'voutV' }, steps, 'P'))).toEqual(['windowUnits']);
  });

  it('requires the quantity to be in the released plan, with limits for Cpk', () => {
    expect(checkRuleFields({ kind: HoldRuleKind.Cpk, windowUnits: 30, minCpk: 1.33, stepKey: 'ripple', quantity: 'x' }, steps, 'P')[0].problems[0]).toContain(
      'step "ripple" is not in the released plan of P; its steps are vout-no-load, info',
    );
    expect(checkRuleFields({ kind: HoldRuleKind.Cpk, windowUnits: 30, minCpk: 1.33, stepKey: 'vout-no-load', quantity: 'ioutA' }, steps, 'P')[0]).toMatchObject({ field: 'quantity' });
    expect(checkRuleFields({ kind: HoldRuleKind.Cpk, windowUnits: 30, minCpk: 1.33, stepKey: 'info', quantity: 'tempC' }, steps, 'P')[0].problems[0]).toContain('has no limits');
    expect(checkRuleFields({ kind: HoldRuleKind.RunRule, windowUnits: 30, stepKey: 'info', quantity: 'tempC' }, null, 'P')[0].problems[0]).toContain('no released test plan');
  });
});
