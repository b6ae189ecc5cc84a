import { guardedLimits } from '../measure/acceptance';
import type { PlanProduct } from './plan-definition';
import { validatePlanSteps } from './plan-file';

/**
 * What the editor shows while a draft is being written: every problem on its own field (the same checks as
 * a plan file, so the server stays the one judge) and, per limit, the acceptance limits that follow from the
 * stated uncertainty under its decision rule (measure/acceptance.ts guardedLimits, ILAC-G8:09/2019 §4.2.2).
 */
export interface LimitPreview {
  stepIndex: number;
  limitIndex: number;
  key: string;
  unit: string;
  low: number | null;
  high: number | null;
  uncertainty: number;
  rule: 'simple' | 'guarded';
  /** Acceptance limits actually applied: low + U / high − U under the guarded rule, the tolerance under the simple one */
  acceptLow: number | null;
  acceptHigh: number | null;
  /** Why no acceptance zone can be computed (the field problems say where) */
  problem: string | null;
}

export interface StepsPreview {
  valid: boolean;
  problems: { field: string; problems: string[] }[];
  limits: LimitPreview[];
}

interface LooseLimit {
  key?: unknown;
  unit?: unknown;
  low?: unknown;
  high?: unknown;
  uncertainty?: unknown;
  rule?: unknown;
}

const num = (x: unknown): number | undefined => (typeof x === 'number' && Number.isFinite(x) ? x : undefined);

/** Checks draft steps and previews the guarded limits of every limit that has readable numbers. */
export function previewSteps(steps: unknown, product: PlanProduct): StepsPreview {
  const { issues } = validatePlanSteps(steps, product);
  const byField = new Map<string, string[]>();
  for (const i of issues) byField.set(i.path, [...(byField.get(i.path) ?? []), i.message]);
  const limits: LimitPreview[] = [];
  if (Array.isArray(steps)) {
    steps.forEach((step: { limits?: unknown }, stepIndex) => {
      const ls = Array.isArray(step?.limits) ? (step.limits as LooseLimit[]) : [];
      ls.forEach((l, limitIndex) => {
        const low = num(l?.low);
        const high = num(l?.high);
        const uncertainty = num(l?.uncertainty) ?? 0;
        const rule = l?.rule === 'guarded' ? 'guarded' : 'simple';
        let acceptLow: number | null = low ?? null;
        let acceptHigh: number | null = high ?? null;
        let problem: string | null = null;
        try {
          if (low === undefined && high === undefined) throw new RangeError('no limit values yet');
          if (rule === 'guarded') {
            const g = guardedLimits({ low, high, uncertainty, rule });
            acceptLow = g.low ?? null;
            acceptHigh = g.high ?? null;
          }
        } catch (err) {
          problem = (err as Error).message;
          acceptLow = null;
          acceptHigh = null;
        }
        limits.push({
          stepIndex,
          limitIndex,
          key: typeof l?.key === 'string' ? l.key : '',
          unit: typeof l?.unit === 'string' ? l.unit : '',
          low: low ?? null,
          high: high ?? null,
          uncertainty,
          rule,
          acceptLow,
          acceptHigh,
          problem,
        });
      });
    });
  }
  return { valid: issues.length === 0, problems: [...byField].map(([field, problems]) => ({ field, problems })), limits };
}
