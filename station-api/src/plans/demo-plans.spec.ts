import { captureOutputRecord, modelUnit, PRODUCTS, protectionTest, RandomStream, solveOperatingPoint, type UnitCondition } from '@railwright/mock-fixture';
import { describe, expect, it } from 'vitest';
import { judge } from '../measure/acceptance';
import { efficiencyPct } from '../measure/efficiency';
import { lineRegulationPct, loadRegulationPct } from '../measure/regulation';
import { rippleMvPp } from '../measure/ripple';
import { transientMetrics } from '../measure/transient';
import type { PlanStep } from './plan-definition';
import { DEFAULT_PLANS_DIR, loadAllPlanFiles } from './plan-file';

/*
 * The demo plans against the simulated modules (mock-fixture physics): good units must pass every limit, and each
 * defect the simulator builds must fail the step meant to catch it. This ties the plan numbers to the simulator;
 * if either side changes its figures, this test says which limit no longer separates good from bad.
 * DC readings are taken without meter noise (its 1σ is below 0.02 % here); the capture carries the fixture's
 * 0.5 mV rms channel noise.
 */
const CAPTURE_NOISE_VRMS = 0.5e-3;
/** The fixture steps the load after this fraction of the record, as the engine assumes (docs/architecture.md). */
const STEP_AT_FRACTION = 0.2;

type Unit = ReturnType<typeof modelUnit>['model'];

function quantities(step: PlanStep, unit: Unit, rng: RandomStream): Map<string, number | null> {
  const r = unit.ratings;
  const p = step.params;
  const vinV = p.vinV ?? r.vinNomV;
  const op = (v: number, a: number) => solveOperatingPoint(unit, { sourceOn: true, vinV: v, loadA: a });
  const out = new Map<string, number | null>();
  switch (step.kind) {
    case 'input_current_no_load':
      out.set('iinNoLoadMa', op(vinV, 0).iinA * 1000);
      break;
    case 'vout_no_load':
      out.set('voutV', op(vinV, 0).voutV);
      break;
    case 'vout_at_load':
      for (const a of p.loadsA!) out.set(`voutV@${a}`, op(vinV, a).voutV);
      break;
    case 'load_regulation':
      out.set('loadRegPct', loadRegulationPct({ vNoLoadV: op(vinV, 0).voutV, vFullLoadV: op(vinV, p.loadA!).voutV, vNomV: r.voutV, definition: 'nominal' }));
      break;
    case 'line_regulation': {
      const vouts = p.vinsV!.map((v) => op(v, p.loadA!).voutV);
      out.set('lineRegPct', lineRegulationPct(vouts, op(r.vinNomV, p.loadA!).voutV));
      break;
    }
    case 'efficiency':
      for (const a of p.loadsA!) {
        const o = op(vinV, a);
        out.set(`efficiencyPct@${a}`, efficiencyPct(o.vinV, o.iinA, o.voutV, o.ioutA));
      }
      break;
    case 'ripple': {
      const rec = captureOutputRecord({ unit, sourceOn: true, vinV, loadA: p.loadA!, step: null, rateHz: p.sampleRateHz!, points: p.samples!, noiseVrms: CAPTURE_NOISE_VRMS, rng });
      out.set('rippleMvPp', rippleMvPp(rec, p.sampleRateHz!, p.bandwidthHz));
      break;
    }
    case 'load_step': {
      const rec = captureOutputRecord({
        unit, sourceOn: true, vinV, loadA: p.fromA!, step: { fromA: p.fromA!, toA: p.toA! },
        rateHz: p.sampleRateHz!, points: p.samples!, noiseVrms: CAPTURE_NOISE_VRMS, rng,
      });
      const m = transientMetrics({ samplesV: rec, sampleRateHz: p.sampleRateHz!, stepIndex: Math.floor(rec.length * STEP_AT_FRACTION), vNomV: r.voutV, bandPct: p.recoveryBandPct! });
      out.set('undershootMv', m.undershootMv).set('overshootMv', m.overshootMv).set('recoveryUs', m.recoveryUs);
      break;
    }
    case 'protection': {
      const t = protectionTest(unit, vinV, 0, p.overloadA!);
      out.set('foldback', t.folded ? 1 : 0).set('recovered', t.recovered ? 1 : 0);
      break;
    }
  }
  return out;
}

/** Limit keys a unit fails (a missing value fails, as in the engine). */
function failures(steps: PlanStep[], unit: Unit, serial: string): string[] {
  const rng = new RandomStream(`capture|${serial}`);
  const failed: string[] = [];
  for (const step of steps) {
    const q = quantities(step, unit, rng);
    for (const limit of step.limits) {
      const value = q.get(limit.key);
      if (value === undefined) throw new Error(`the test does not compute ${limit.key}`);
      if (value === null || judge(value, limit).verdict !== 'pass') failed.push(limit.key);
    }
  }
  return failed;
}

const plans = loadAllPlanFiles(DEFAULT_PLANS_DIR);

/** Which limits each defect must trip (at least one of the listed keys). */
const CAUGHT_BY: Partial<Record<UnitCondition, RegExp>> = {
  wrong_feedback: /^voutV/,
  aged_output_cap: /^rippleMvPp$/,
  weak_switch: /^efficiencyPct@/,
  no_protection: /^foldback$/,
};

describe.each(plans.map((p) => [p.header.partNumber, p] as const))('plan for %s against the simulated module', (partNumber, plan) => {
  const product = PRODUCTS[partNumber];
  const unitsOf = (condition: UnitCondition, n: number) =>
    Array.from({ length: n }, (_, i) => {
      const serial = `SIM-2648-${String(i).padStart(5, '0')}`;
      return { serial, model: modelUnit({ serial, partNumber, lotCode: `LB-2648-0${(i % 4) + 1}` }, product, condition).model };
    });

  it('passes every good unit on every limit', () => {
    for (const u of unitsOf('good', 60)) expect({ serial: u.serial, failed: failures(plan.steps, u.model, u.serial) }).toEqual({ serial: u.serial, failed: [] });
  });

  it.each(Object.entries(CAUGHT_BY))('fails every unit with %s', (condition, keys) => {
    for (const u of unitsOf(condition as UnitCondition, 12)) {
      const failed = failures(plan.steps, u.model, u.serial);
      expect(failed.some((k) => keys!.test(k)), `${u.serial} (${condition}) failed only ${failed.join(', ') || 'nothing'}`).toBe(true);
    }
  });
});
