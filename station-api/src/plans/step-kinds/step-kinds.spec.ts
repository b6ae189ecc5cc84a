import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { judge } from '../../measure/acceptance';
import { DEFAULT_PLANS_DIR, parsePlanText, validatePlanSteps } from '../plan-file';
import { STEP_KINDS } from '../plan-definition';
import { ALL_STEP_KINDS, parseLimitKey, quantityDef, quantityFor, runStep, STEP_KIND_DEFS, stepProblems } from './index';
import { ratingsOf, simulatedUnit } from './sim-fixture.spec-helper';

/*
 * One test per step kind: parse (the demo plan's step of that kind), check (the stored-step check accepts it and a
 * broken copy is refused by the plan checks), run (on the mock-fixture simulator, a good OB-BK0503 unit) and judge
 * (every limit of the step passes by the ILAC-G8 rule it names, measure/acceptance.ts).
 */
const product = ratingsOf('OB-BK0503');
const text = readFileSync(join(DEFAULT_PLANS_DIR, 'OB-BK0503.plan.yaml'), 'utf8');
const plan = parsePlanText(text, 'OB-BK0503.plan.yaml', { product }).plan!;

describe('the registry', () => {
  it('has one definition per step kind, keyed by its own name, with units and a physical range for every quantity', () => {
    expect(Object.keys(STEP_KIND_DEFS).sort()).toEqual([...STEP_KINDS].sort());
    for (const def of ALL_STEP_KINDS) {
      expect(STEP_KIND_DEFS[def.kind]).toBe(def);
      for (const q of def.quantities) {
        expect(q.unit, `${def.kind} ${q.base}`).not.toBe('');
        expect(q.range.text.length, `${def.kind} ${q.base}`).toBeGreaterThan(0);
        expect(q.range.law.length, `${def.kind} ${q.base}`).toBeGreaterThan(10);
      }
    }
  });
});

describe.each(ALL_STEP_KINDS.map((d) => [d.kind, d] as const))('step kind %s', (kind, def) => {
  it('parses, checks, runs on the simulator and judges a good unit as pass', async () => {
    // parse
    const step = plan.steps.find((s) => s.kind === kind)!;
    expect(step, `the demo plan has a ${kind} step`).toBeDefined();
    for (const limit of step.limits) expect(quantityDef(kind, parseLimitKey(limit.key).base), limit.key).toBeDefined();

    // check: the stored step passes; a copy missing a required parameter, or with one the kind does not read, is refused
    expect(stepProblems(step)).toEqual([]);
    const required = Object.entries(def.params).find(([, need]) => need === 'required')?.[0];
    const broken = JSON.parse(JSON.stringify(step));
    if (required) delete broken.params[required];
    else broken.params.overloadA = 9;
    const issues = validatePlanSteps([broken], product).issues;
    expect(issues).toContainEqual(
      required
        ? { path: `steps[0].params.${required}`, message: `is required for a step of kind ${kind}` }
        : { path: 'steps[0].params.overloadA', message: expect.stringMatching(`is not used by a step of kind ${kind}`) },
    );

    // run
    const ctx = await simulatedUnit('OB-BK0503', 'SIM-2648-00007', 'good');
    const quantities = await runStep(step, ctx);
    expect(quantities.map((q) => q.base).every((b) => def.quantities.some((d) => d.base === b))).toBe(true);

    // judge
    for (const limit of step.limits) {
      const q = quantityFor(limit.key, quantities);
      expect(q?.implausible, limit.key).toBeUndefined();
      expect(q?.value, limit.key).not.toBeNull();
      expect(judge(q!.value!, limit).verdict, `${limit.key} = ${q!.value}`).toBe('pass');
    }
  });
});
