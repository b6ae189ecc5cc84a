import type { PlanStep } from '../plan-definition';
import { pathString } from '../plan-positions';
import { runSchema, schemaValidator } from '../plan-schema-check';
import { checkSteps, type RawStep } from '../plan-steps-check';

/**
 * Problems with a stored step that would make it impossible to run, in plain words; empty when fine. The same
 * schema and cross-field checks as a plan file or the plans API (without the product's ratings), so a step the
 * loader accepts is never refused here and the other way round.
 */
export function stepProblems(step: PlanStep): string[] {
  const where = `step "${String(step?.name)}" (${String(step?.key)})`;
  let raw = runSchema(schemaValidator('step'), step, []);
  if (raw.length === 0) raw = checkSteps([step as RawStep], undefined, []).issues.map((i) => ({ ...i, segs: i.segs.slice(1) }));
  return raw.map((i) => `${where}: ${pathString(i.segs)}: ${i.message}`);
}
