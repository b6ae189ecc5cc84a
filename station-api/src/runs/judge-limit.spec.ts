import { describe, expect, it } from 'vitest';
import type { PlanStep } from '../plans/plan-definition';
import { MeasurementVerdict } from './measurement.entity';
import { judgeLimit, uncertaintyFor } from './run-engine.service';

const step: PlanStep = { key: 'vout-no-load', name: 'Output voltage at no load', kind: 'vout_no_load', params: {}, limits: [] };
const t = new Date('2026-11-20T08:00:00Z');
const limit = { key: 'voutV', name: 'Output voltage', unit: 'V', low: 4.9, high: 5.1, rule: 'guarded' as const };

describe('judgeLimit', () => {
  // self-constructed example: V_out 5.000 ± 0.100 V, U = 10 mV (k = 2), guard band w = U
  // (ILAC-G8:09/2019 binary statement with guard band) → acceptance limits 4.910 / 5.090 V
  it.each([
    [5.08, MeasurementVerdict.Pass],
    [5.09, MeasurementVerdict.Pass], // on the acceptance limit: inclusive
    [5.095, MeasurementVerdict.GuardFail], // inside tolerance, outside the guard band
    [5.1, MeasurementVerdict.GuardFail], // on the tolerance limit
    [5.105, MeasurementVerdict.Fail],
  ])('judges %s V as %s with the fixture uncertainty', (value, verdict) => {
    const row = judgeLimit(1, step, limit, [{ base: 'voutV', value, raw: { voutV: value } }], { voltageUncertaintyV: 0.01 }, t, t);
    expect(row.verdict).toBe(verdict);
    expect(row.uncertainty).toBe(0.01);
    expect(row.guardedLow).toBeCloseTo(4.91, 12);
    expect(row.guardedHigh).toBeCloseTo(5.09, 12);
    expect(row).toMatchObject({ lowLimit: 4.9, highLimit: 5.1, quantity: 'voutV', unit: 'V', rule: 'guarded', raw: { voutV: value } });
  });

  it('fails a quantity without a value and keeps the reason, still showing the guarded limits', () => {
    const row = judgeLimit(1, step, limit, [{ base: 'voutV', value: null, raw: {}, problem: 'no output' }], { voltageUncertaintyV: 0.01 }, t, t);
    expect(row.verdict).toBe(MeasurementVerdict.Fail);
    expect(row.value).toBeUndefined();
    expect(row.raw.problem).toBe('no output');
    expect(row.guardedLow).toBeCloseTo(4.91, 12);
  });
});

describe('uncertaintyFor', () => {
  it("prefers the limit's own value, else the fixture's voltage uncertainty for V and mV limits, else 0", () => {
    const fixture = { voltageUncertaintyV: 0.005 };
    expect(uncertaintyFor({ ...limit, uncertainty: 0.02 }, fixture)).toBe(0.02);
    expect(uncertaintyFor(limit, fixture)).toBe(0.005);
    expect(uncertaintyFor({ ...limit, key: 'rippleMvPp', unit: 'mV' }, fixture)).toBe(5);
    expect(uncertaintyFor({ ...limit, key: 'efficiencyPct@1.5', unit: '%' }, fixture)).toBe(0);
  });
});
