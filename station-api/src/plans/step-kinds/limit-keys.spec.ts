import { describe, expect, it } from 'vitest';
import type { PlanStep } from '../plan-definition';
import { validatePlanSteps } from '../plan-file';
import { parseLimitKey, quantityFor, stepProblems } from './index';

/*
 * One rule for limit keys in the schema, the plan checks and the engine (issue 7): before, the engine read
 * `voutV@` as load 0 A while the plan checker read NaN, and `efficiencyPct@1.5a` passed one and not the other.
 * Rule: the load is a decimal number with an optional trailing `A` or `a`; anything else names no load.
 */
const product = { partNumber: 'OB-BK0503', vinMinV: 9, vinNomV: 12, vinMaxV: 18, voutNomV: 5, ioutRatedA: 3 };
const effStep = (key: string): PlanStep => ({
  key: 'eff',
  name: 'Efficiency',
  kind: 'efficiency',
  params: { loadsA: [1.5] },
  limits: [{ key, name: 'Efficiency', unit: '%', low: 85, uncertainty: 0, rule: 'simple' }],
});
const voutStep = (key: string): PlanStep => ({
  key: 'vout',
  name: 'Output voltage',
  kind: 'vout_at_load',
  params: { loadsA: [0, 1.5] },
  limits: [
    { key, name: 'Output at 0 A', unit: 'V', low: 4.9, high: 5.1, uncertainty: 0, rule: 'simple' },
    { key: 'voutV@1.5', name: 'Output at 1.5 A', unit: 'V', low: 4.9, high: 5.1, uncertainty: 0, rule: 'simple' },
  ],
});

describe('limit keys, one rule everywhere', () => {
  it('reads a decimal load with an optional A or a', () => {
    expect(parseLimitKey('voutV@1.5')).toEqual({ base: 'voutV', atA: 1.5 });
    expect(parseLimitKey('efficiencyPct@1.50A')).toEqual({ base: 'efficiencyPct', atA: 1.5 });
    expect(parseLimitKey('efficiencyPct@1.5a')).toEqual({ base: 'efficiencyPct', atA: 1.5 });
    expect(parseLimitKey('voutV@.5')).toEqual({ base: 'voutV', atA: 0.5 });
    expect(parseLimitKey('voutV')).toEqual({ base: 'voutV' });
  });

  it('reads `voutV@` as no load at all (NaN), not as 0 A, in the engine too', () => {
    expect(parseLimitKey('voutV@').atA).toBeNaN();
    for (const bad of ['voutV@', 'voutV@A', 'voutV@1e1', 'voutV@1.5.0', 'voutV@-1']) expect(parseLimitKey(bad).atA, bad).toBeNaN();
    // the engine used to match `voutV@` to the 0 A reading
    expect(quantityFor('voutV@', [{ base: 'voutV', atA: 0, value: 5, raw: {} }])).toBeUndefined();
  });

  it('refuses `voutV@` in the plans API and in a stored step, with a message', () => {
    expect(validatePlanSteps([voutStep('voutV@')], product).issues).toContainEqual({
      path: 'steps[0].limits[0].key',
      message: expect.stringMatching(/a quantity such as voutV or efficiencyPct@1.5/),
    });
    expect(stepProblems(voutStep('voutV@')).join('\n')).toMatch(/limits\[0\]\.key: .*efficiencyPct@1.5/);
  });

  it('accepts `efficiencyPct@1.5a` in the plans API, in a stored step and when judging', () => {
    expect(validatePlanSteps([effStep('efficiencyPct@1.5a')], product).issues).toEqual([]);
    expect(stepProblems(effStep('efficiencyPct@1.5a'))).toEqual([]);
    expect(quantityFor('efficiencyPct@1.5a', [{ base: 'efficiencyPct', atA: 1.5, value: 90, raw: {} }])?.value).toBe(90);
  });
});
