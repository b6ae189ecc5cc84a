import { canonicalJson } from './plan-checksum';
import type { LimitSpec, PlanStep } from './plan-definition';

/**
 * Differences between two versions of a plan, step by step. Steps are matched by their key (the identity a step
 * keeps across revisions); limits within a step by their limit key. Values compare by their canonical JSON, so
 * `[1.5, 3]` and `[1.5, 3.0]` are the same and key order never matters.
 */

export interface ValueChange {
  /** Field path inside the step, e.g. `params.settleMs`, `limits[voutV@1.5].high`, `name` */
  field: string;
  before: unknown;
  after: unknown;
}

export interface StepChange {
  key: string;
  name: string;
  kind: string;
  changes: ValueChange[];
}

export interface PlanComparison {
  added: { key: string; name: string; kind: string; position: number }[];
  removed: { key: string; name: string; kind: string; position: number }[];
  /** Steps present in both whose order among the common steps moved (positions are 1-based) */
  reordered: { key: string; name: string; from: number; to: number }[];
  changed: StepChange[];
  /** Plan-level settings (stop at first failure, attempts) old → new */
  settings: ValueChange[];
  identical: boolean;
}

const same = (a: unknown, b: unknown) => canonicalJson(a) === canonicalJson(b);

function limitFields(before: LimitSpec | undefined, after: LimitSpec | undefined, key: string): ValueChange[] {
  if (!before) return [{ field: `limits[${key}]`, before: null, after }];
  if (!after) return [{ field: `limits[${key}]`, before, after: null }];
  const fields = ['name', 'unit', 'low', 'high', 'uncertainty', 'rule'] as const;
  return fields.filter((f) => !same(before[f], after[f])).map((f) => ({ field: `limits[${key}].${f}`, before: before[f] ?? null, after: after[f] ?? null }));
}

function stepChanges(a: PlanStep, b: PlanStep): ValueChange[] {
  const out: ValueChange[] = [];
  if (a.name !== b.name) out.push({ field: 'name', before: a.name, after: b.name });
  if (a.kind !== b.kind) out.push({ field: 'kind', before: a.kind, after: b.kind });
  const paramNames = [...new Set([...Object.keys(a.params), ...Object.keys(b.params)])].sort();
  for (const p of paramNames) {
    const before = (a.params as Record<string, unknown>)[p];
    const after = (b.params as Record<string, unknown>)[p];
    if (!same(before, after)) out.push({ field: `params.${p}`, before: before ?? null, after: after ?? null });
  }
  const keys = [...new Set([...a.limits.map((l) => l.key), ...b.limits.map((l) => l.key)])];
  for (const k of keys) {
    out.push(...limitFields(a.limits.find((l) => l.key === k), b.limits.find((l) => l.key === k), k));
  }
  return out;
}

/**
 * Compares version `a` (older, "before") with version `b` ("after").
 * @returns steps added, removed, reordered and changed, each change with its old and new value
 */
export function comparePlans(
  a: { steps: PlanStep[]; stopAtFirstFailure: boolean; maxAttempts: number },
  b: { steps: PlanStep[]; stopAtFirstFailure: boolean; maxAttempts: number },
): PlanComparison {
  const aKeys = a.steps.map((s) => s.key);
  const bKeys = b.steps.map((s) => s.key);
  const added = b.steps.flatMap((s, i) => (aKeys.includes(s.key) ? [] : [{ key: s.key, name: s.name, kind: s.kind, position: i + 1 }]));
  const removed = a.steps.flatMap((s, i) => (bKeys.includes(s.key) ? [] : [{ key: s.key, name: s.name, kind: s.kind, position: i + 1 }]));
  // order among the steps both versions share, so an insertion alone does not count as a reorder
  const commonA = aKeys.filter((k) => bKeys.includes(k));
  const commonB = bKeys.filter((k) => aKeys.includes(k));
  const reordered = commonB.flatMap((k, i) => {
    const from = commonA.indexOf(k);
    if (from === i) return [];
    return [{ key: k, name: b.steps.find((s) => s.key === k)!.name, from: aKeys.indexOf(k) + 1, to: bKeys.indexOf(k) + 1 }];
  });
  const changed: StepChange[] = [];
  for (const k of commonB) {
    const sa = a.steps.find((s) => s.key === k)!;
    const sb = b.steps.find((s) => s.key === k)!;
    const changes = stepChanges(sa, sb);
    if (changes.length > 0) changed.push({ key: k, name: sb.name, kind: sb.kind, changes });
  }
  const settings: ValueChange[] = [];
  if (a.stopAtFirstFailure !== b.stopAtFirstFailure) settings.push({ field: 'stopAtFirstFailure', before: a.stopAtFirstFailure, after: b.stopAtFirstFailure });
  if (a.maxAttempts !== b.maxAttempts) settings.push({ field: 'maxAttempts', before: a.maxAttempts, after: b.maxAttempts });
  const identical = added.length + removed.length + reordered.length + changed.length + settings.length === 0;
  return { added, removed, reordered, changed, settings, identical };
}
