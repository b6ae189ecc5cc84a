import { describe, expect, it } from 'vitest';
import type { PlanStep } from './plan-definition';
import { comparePlans } from './plan-compare';

// self-constructed example: a four-step plan and a revision of it with one of each kind of change
const step = (key: string, extra: Partial<PlanStep> = {}): PlanStep => ({
  key,
  name: `Step ${key}`,
  kind: 'vout_no_load',
  params: { settleMs: 50 },
  limits: [{ key: 'voutV', name: 'Output voltage', unit: 'V', low: 4.9, high: 5.1, uncertainty: 0.01, rule: 'guarded' }],
  ...extra,
});
const settings = { stopAtFirstFailure: false, maxAttempts: 3 };

describe('comparePlans', () => {
  it('finds added, removed, reordered steps and each changed value with old and new', () => {
    const a = [step('a'), step('b'), step('c'), step('d')];
    const b = [step('a', { params: { settleMs: 80 } }), step('c'), step('b'), step('e')];
    b[1]!.limits = [{ ...b[1]!.limits[0]!, high: 5.05, rule: 'simple' }];
    const c = comparePlans({ steps: a, ...settings }, { steps: b, ...settings, stopAtFirstFailure: true });
    expect(c.added).toEqual([{ key: 'e', name: 'Step e', kind: 'vout_no_load', position: 4 }]);
    expect(c.removed).toEqual([{ key: 'd', name: 'Step d', kind: 'vout_no_load', position: 4 }]);
    expect(c.reordered).toEqual([
      { key: 'c', name: 'Step c', from: 3, to: 2 },
      { key: 'b', name: 'Step b', from: 2, to: 3 },
    ]);
    expect(c.changed).toEqual([
      { key: 'a', name: 'Step a', kind: 'vout_no_load', changes: [{ field: 'params.settleMs', before: 50, after: 80 }] },
      {
        key: 'c',
        name: 'Step c',
        kind: 'vout_no_load',
        changes: [
          { field: 'limits[voutV].high', before: 5.1, after: 5.05 },
          { field: 'limits[voutV].rule', before: 'guarded', after: 'simple' },
        ],
      },
    ]);
    expect(c.settings).toEqual([{ field: 'stopAtFirstFailure', before: false, after: true }]);
    expect(c.identical).toBe(false);
  });

  it('does not call an insertion a reorder, and sees equal numbers as equal', () => {
    const a = [step('a'), step('b')];
    const b = [step('new'), step('a', { params: { settleMs: 50.0 } }), step('b')];
    const c = comparePlans({ steps: a, ...settings }, { steps: b, ...settings });
    expect(c.reordered).toEqual([]);
    expect(c.changed).toEqual([]);
    expect(c.added.map((x) => x.key)).toEqual(['new']);
    expect(comparePlans({ steps: a, ...settings }, { steps: structuredClone(a), ...settings }).identical).toBe(true);
  });

  it('lists a limit added or dropped within a step', () => {
    const a = [step('a')];
    const b = [step('a', { limits: [] })];
    const c = comparePlans({ steps: a, ...settings }, { steps: b, ...settings });
    expect(c.changed[0]!.changes).toEqual([{ field: 'limits[voutV]', before: a[0]!.limits[0], after: null }]);
  });
});
