import { stringify } from 'yaml';
import type { PlanStep } from './plan-definition';
import type { PlanHeader } from './plan-file';
import { PLAN_FORMAT } from './plan-schema';

/**
 * Writes a plan version as a plan file (docs/test-plan-format.md). Limits come out in their normalised form
 * (low/high, name, unit, uncertainty and rule written out), so reading the file back gives the same steps and
 * the same checksum as the version it came from.
 */
export function planFileText(header: PlanHeader, steps: PlanStep[]): string {
  const orderedSteps = steps.map((s) => ({
    key: s.key,
    name: s.name,
    kind: s.kind,
    params: { ...s.params },
    limits: s.limits.map((l) => {
      const out: Record<string, unknown> = { key: l.key, name: l.name, unit: l.unit };
      if (l.low !== undefined) out.low = l.low;
      if (l.high !== undefined) out.high = l.high;
      out.uncertainty = l.uncertainty ?? 0;
      out.rule = l.rule;
      return out;
    }),
  }));
  const doc = {
    format: PLAN_FORMAT,
    header: {
      planCode: header.planCode,
      planName: header.planName,
      partNumber: header.partNumber,
      revision: header.revision,
      reason: header.reason,
      author: header.author,
      stopAtFirstFailure: header.stopAtFirstFailure,
      maxAttempts: header.maxAttempts,
    },
    steps: orderedSteps,
  };
  const intro =
    `# Test plan ${header.planCode}, exported by Railwright.\n` +
    '# Format: docs/test-plan-format.md; schema: test-plans/plan.schema.json.\n' +
    "# Limits are inclusive. Uncertainties are expanded (k = 2) in the limit's unit.\n";
  return intro + stringify(doc, { lineWidth: 0 });
}
