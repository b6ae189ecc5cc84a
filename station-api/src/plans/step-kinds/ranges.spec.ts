import { describe, expect, it } from 'vitest';
import { emptyZoneProblem, implausibility, quantityDef, runStep } from './index';
import { simulatedUnit } from './sim-fixture.spec-helper';

/*
 * Physical ranges (issue 8, defect 8): a reading outside its range is implausible and never passes; a limit whose
 * acceptance zone leaves no physically possible value is refused at load.
 */
const product = { partNumber: 'OB-BK0503', vinMinV: 9, vinNomV: 12, vinMaxV: 18, voutNomV: 5, ioutRatedA: 3 };
const eff = quantityDef('efficiency', 'efficiencyPct')!;

describe('implausible readings', () => {
  it('refuses an efficiency of 125 % (conservation of energy: P_out cannot exceed P_in)', () => {
    // a low-reading input shunt: 12 V × 0.5 A = 6 W in, 5 V × 1.5 A = 7.5 W out → 125 %
    const msg = implausibility(eff, 'efficiencyPct@1.5', 125, product, { loadsA: [1.5] });
    expect(msg).toMatch(/^efficiencyPct@1.5 reads 125 %, outside its physical range 0 % < η < 100 %/);
    expect(msg).toMatch(/conservation of energy/);
  });

  it('refuses exactly 100 % and 0 %, and lets 99.9 % through (losses keep P_out below P_in)', () => {
    expect(implausibility(eff, 'efficiencyPct@1.5', 100, product, {})).toBeDefined();
    expect(implausibility(eff, 'efficiencyPct@1.5', 0, product, {})).toBeDefined();
    expect(implausibility(eff, 'efficiencyPct@1.5', 99.9, product, {})).toBeUndefined();
  });

  it('refuses an output above the input (buck conversion ratio M(D) = D ≤ 1, Erickson & Maksimović ch. 2)', () => {
    const vout = quantityDef('vout_at_load', 'voutV')!;
    expect(implausibility(vout, 'voutV@1.5', 12.5, product, { vinV: 12 })).toMatch(/voutV@1.5 reads 12.5 V, outside its physical range/);
    expect(implausibility(vout, 'voutV@1.5', 11.9, product, { vinV: 12 })).toBeUndefined();
    // an absent output reads about 0 V: a fail of the limit, not an implausible reading
    expect(implausibility(vout, 'voutV@1.5', -0.0002, product, { vinV: 12 })).toBeUndefined();
  });

  it('marks the step result implausible when the fixture reports it (low-reading input shunt on the simulator)', async () => {
    const ctx = await simulatedUnit('OB-BK0503', 'SIM-2648-00003', 'good');
    // the input-current meter reads a quarter of the truth, as a shunt with the wrong value would
    const measure = ctx.scpi.measure.bind(ctx.scpi);
    ctx.scpi.measure = async (what) => (what === 'CURR:IN' ? (await measure(what)) * 0.75 : measure(what));
    const [q] = await runStep({ key: 'eff', name: 'Efficiency', kind: 'efficiency', params: { loadsA: [3] }, limits: [] }, ctx);
    expect(q.value).toBeGreaterThan(100);
    expect(q.implausible).toMatch(/^efficiencyPct@3 reads 1\d\d\.\d+ %, outside its physical range/);
  });

  it('refuses load-step metrics on an open output instead of computing them around noise', async () => {
    // before: about half of open-output units passed undershoot, overshoot and recovery
    const ctx = await simulatedUnit('OB-BK0503', 'SIM-2648-00004', 'open_output');
    const qs = await runStep(
      { key: 'ls', name: 'Load step', kind: 'load_step', params: { fromA: 0.75, toA: 2.25, samples: 2000, sampleRateHz: 2e6, recoveryBandPct: 1 }, limits: [] },
      ctx,
    );
    expect(qs.map((q) => q.base)).toEqual(['undershootMv', 'overshootMv', 'recoveryUs']);
    for (const q of qs) {
      expect(q.value).toBeNull();
      // a defect of the unit, so a value-less fail with the reason (judged), not an implausible reading (not judged)
      expect(q.implausible).toBeUndefined();
      expect(q.problem).toMatch(/the output before the load step reads -?0\.\d+ V, below 50 % of the nominal 5 V/);
    }
  });
});

describe('acceptance zones against the physical range (ILAC-G8:09/2019 guard band w = U)', () => {
  const ripple = quantityDef('ripple', 'rippleMvPp')!;

  it('refuses ripple ≤ 30 mV with U = 31 mV under the guarded rule (acceptance limit −1 mV; ripple ≥ 0)', () => {
    expect(emptyZoneProblem(ripple, { high: 30, uncertainty: 31, rule: 'guarded' }, product, {})).toMatch(/acceptance zone after the guard band U = 31 mV is −∞ … -1 mV/);
    expect(emptyZoneProblem(ripple, { high: 30, uncertainty: 1, rule: 'guarded' }, product, {})).toBeUndefined();
    // the simple rule has no guard band (ILAC-G8 §4.2.1), so 0 … 30 mV stays
    expect(emptyZoneProblem(ripple, { high: 30, uncertainty: 31, rule: 'simple' }, product, {})).toBeUndefined();
  });

  it('refuses efficiency ≥ 99.8 % with U = 0.5 % (acceptance from 100.3 %; η < 100 % by conservation of energy)', () => {
    expect(emptyZoneProblem(eff, { low: 99.8, uncertainty: 0.5, rule: 'guarded' }, product, {})).toMatch(/100.3 … \+∞ %/);
    expect(emptyZoneProblem(eff, { low: 101, rule: 'simple' }, product, {})).toBeDefined();
    expect(emptyZoneProblem(eff, { low: 93, uncertainty: 0.4, rule: 'guarded' }, product, {})).toBeUndefined();
  });

  it('uses bounds that need the product only when it is known', () => {
    const vout = quantityDef('vout_no_load', 'voutV')!;
    expect(emptyZoneProblem(vout, { low: 13, rule: 'simple' }, product, { vinV: 12 })).toMatch(/V_out ≤ V_in/);
    expect(emptyZoneProblem(vout, { low: 13, rule: 'simple' }, undefined, { vinV: 12 })).toBeUndefined();
  });
});
