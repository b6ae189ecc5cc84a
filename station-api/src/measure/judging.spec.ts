import { describe, expect, it } from 'vitest';
import type { PlanStep } from '../plans/plan-definition';
import { judgeLimit, uncertaintyFor } from './judging';

const step: PlanStep = { key: 'vout-no-load', name: 'Output voltage at no load', kind: 'vout_no_load', params: {}, limits: [] };
const t = new Date('2026-11-20T08:00:00Z');
const limit = { key: 'voutV', name: 'Output voltage', unit: 'V', low: 4.9, high: 5.1, rule: 'guarded' as const };

describe('judgeLimit', () => {
  // ILAC-G8:09/2019 §4.2.2 binary statement with guard band w = U, self-constructed example:
  // V_out 5.000 ± 0.100 V, U = 10 mV (k = 2) → acceptance limits 4.910 / 5.090 V.
  // The decision column is the §4.2.3 non-binary statement for the same value.
  it.each([
    [5.08, 'pass', 'pass'],
    [5.09, 'pass', 'pass'], // on the acceptance limit: inclusive in both statements
    [5.095, 'guard_fail', 'conditional_pass'], // inside tolerance, outside the guard band
    [5.1, 'guard_fail', 'conditional_pass'], // on the tolerance limit
    [5.105, 'fail', 'conditional_fail'],
    [5.12, 'fail', 'fail'],
  ])('judges %s V as %s (statement %s) with the fixture uncertainty', (value, verdict, decision) => {
    const row = judgeLimit(1, step, limit, { value, raw: { voutV: value } }, { voltageUncertaintyV: 0.01 }, t, t);
    expect(row.verdict).toBe(verdict);
    expect(row.decision).toBe(decision);
    expect(row.uncertainty).toBe(0.01);
    expect(row.guardedLow).toBeCloseTo(4.91, 12);
    expect(row.guardedHigh).toBeCloseTo(5.09, 12);
    expect(row).toMatchObject({ lowLimit: 4.9, highLimit: 5.1, quantity: 'voutV', unit: 'V', rule: 'guarded', raw: { voutV: value } });
  });

  it('fails a quantity without a value and keeps the reason, still showing the guarded limits', () => {
    const row = judgeLimit(1, step, limit, { value: null, raw: {}, problem: 'no output' }, { voltageUncertaintyV: 0.01 }, t, t);
    expect(row.verdict).toBe('fail');
    expect(row.decision).toBeNull();
    expect(row.value).toBeUndefined();
    expect(row.raw.problem).toBe('no output');
    expect(row.guardedLow).toBeCloseTo(4.91, 12);
  });

  it('fails when the step produced no such quantity', () => {
    const row = judgeLimit(1, step, limit, undefined, { voltageUncertaintyV: 0.01 }, t, t);
    expect(row).toMatchObject({ verdict: 'fail', decision: null, raw: { problem: 'step produced no voutV' } });
  });

  it('never passes an implausible reading, even one inside the limits, and names it', () => {
    // conservation of energy: an efficiency above 100 % cannot be a real reading
    const eff = { key: 'efficiencyPct@1.5A', name: 'Efficiency', unit: '%', low: 85, rule: 'simple' as const };
    const msg = 'Efficiency 125.0 % at 1.5 A is above 100 %: check the input current shunt';
    const row = judgeLimit(3, step, eff, { value: 125, raw: { pinW: 8, poutW: 10 }, implausible: msg }, { voltageUncertaintyV: 0.01 }, t, t);
    expect(row).toMatchObject({ verdict: 'fail', decision: null, value: 125, implausible: msg, raw: { pinW: 8, poutW: 10, problem: msg } });
  });
});

describe('uncertaintyFor', () => {
  it("prefers the limit's own value, else the fixture's voltage uncertainty for V and mV limits, else 0", () => {
    // common practice, no source: the fixture's voltage uncertainty stands in where a plan states none
    const fixture = { voltageUncertaintyV: 0.005 };
    expect(uncertaintyFor({ ...limit, uncertainty: 0.02 }, fixture)).toBe(0.02);
    expect(uncertaintyFor(limit, fixture)).toBe(0.005);
    expect(uncertaintyFor({ ...limit, key: 'rippleMvPp', unit: 'mV' }, fixture)).toBe(5);
    expect(uncertaintyFor({ ...limit, key: 'efficiencyPct@1.5', unit: '%' }, fixture)).toBe(0);
  });
});

describe('uncertaintyFor with a calibration (docs/calibration.md)', () => {
  const vout = { key: 'voutV@1.5', name: 'Output voltage at 1.5 A', unit: 'V', low: 4.9, high: 5.1, uncertainty: 0.01, rule: 'guarded' as const };

  it("uses the certificate's U for the limit's quantity in place of the plan's planning value", () => {
    // self-constructed example: the certificate states 0.02 V for voutV; every load's voutV limit takes it
    const source = { voltageUncertaintyV: 0.005, calibrated: { voutV: 0.02 } };
    expect(uncertaintyFor(vout, source)).toBe(0.02);
    expect(uncertaintyFor({ ...vout, key: 'voutV' }, source)).toBe(0.02);
    // a quantity the certificate does not state keeps the plan's value, then the fixture's voltage U
    expect(uncertaintyFor({ ...vout, key: 'rippleMvPp', unit: 'mV', uncertainty: 1 }, source)).toBe(1);
    expect(uncertaintyFor({ ...vout, key: 'rippleMvPp', unit: 'mV', uncertainty: undefined }, source)).toBe(5);
    expect(uncertaintyFor(vout, { voltageUncertaintyV: 0.005, calibrated: {} })).toBe(0.01);
  });

  it('moves the guarded acceptance limits by the calibrated U', () => {
    // ILAC-G8:09/2019 §4.2.2 (binary statement with guard band, w = U): AL = TL − U above, TL + U below;
    // JCGM 106:2012 §8 guarded acceptance (clause number from memory, unverified): 4.9 + 0.02 = 4.92 V, 5.1 − 0.02 = 5.08 V
    const t = new Date('2026-12-02T08:00:00Z');
    const row = judgeLimit(2, { key: 'vout-load', name: 'Output voltage' }, vout, { value: 5.09, raw: {} }, { voltageUncertaintyV: 0.005, calibrated: { voutV: 0.02 } }, t, t);
    expect(row.uncertainty).toBe(0.02);
    expect(row.guardedLow).toBeCloseTo(4.92, 12);
    expect(row.guardedHigh).toBeCloseTo(5.08, 12);
    // 5.09 V is within tolerance but in the guard band: guard_fail, conditional pass (§4.2.3)
    expect(row).toMatchObject({ verdict: 'guard_fail', decision: 'conditional_pass' });
  });
});
