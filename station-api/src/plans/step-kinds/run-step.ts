import type { PlanStep } from '../plan-definition';
import { quantityKey } from './limit-keys';
import { implausibility } from './ranges';
import { quantityDef, stepKindDef } from './registry';
import type { Quantity, StepContext } from './types';

/**
 * Runs one plan step on the fixture and returns its quantities, each reading held to its physical range
 * (a reading outside it carries `implausible` and must never pass). Fixture failures propagate as FixtureFault.
 */
export async function runStep(step: PlanStep, ctx: StepContext): Promise<Quantity[]> {
  const def = stepKindDef(step.kind);
  if (!def) throw new Error(`Unknown step kind ${String(step.kind)}`);
  const quantities = await def.run({ ...step, params: step.params ?? {} }, ctx);
  return quantities.map((q) => {
    if (q.value === null || q.implausible) return q;
    const qd = quantityDef(step.kind, q.base);
    const implausible = qd && implausibility(qd, quantityKey(q), q.value, ctx.product, step.params ?? {});
    return implausible ? { ...q, implausible } : q;
  });
}
