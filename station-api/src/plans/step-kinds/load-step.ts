import { transientMetrics } from '../../measure/transient';
import { captureSummary, DEFAULT_SETTLE_MS, forgetLoad, outputAbsent, setLoad, setSource, settled } from './fixture-ops';
import { outputSwingRange } from './ranges';
import type { Quantity, StepKindDef } from './types';
import { sameLoad } from './limit-keys';

/** Recovery band for load steps when a stored plan gives none: ±2 % of V_nom (common practice, no source) */
const DEFAULT_RECOVERY_BAND_PCT = 2;
/** Share of the record before the load step, per the fixture protocol (docs/fixture-protocol.md: step at 20 %) */
export const STEP_AT_FRACTION = 0.2;
const METRICS = ['undershootMv', 'overshootMv', 'recoveryUs'] as const;

export const loadStep: StepKindDef = {
  kind: 'load_step',
  summary: 'Output response to a load step: undershoot, overshoot and recovery into the band',
  params: {
    fromA: 'required',
    toA: 'required',
    samples: 'required',
    sampleRateHz: 'required',
    recoveryBandPct: 'required',
    vinV: 'optional',
    settleMs: 'optional',
  },
  quantities: [
    { base: 'undershootMv', unit: 'mV', name: 'Load-step undershoot', range: outputSwingRange('undershoot') },
    { base: 'overshootMv', unit: 'mV', name: 'Load-step overshoot', range: outputSwingRange('overshoot') },
    {
      base: 'recoveryUs',
      unit: 'µs',
      name: 'Load-step recovery time',
      range: {
        min: 0,
        max: (c) => ((c.params.samples ?? 0) / (c.params.sampleRateHz ?? 1)) * 1e6,
        text: '0 µs ≤ t ≤ record length',
        law: 'a time measured from the step inside one record cannot be negative or outlast the record',
      },
    },
  ],
  sequence:
    'source to vinV and on; load at fromA; settle; capture while the fixture steps the load to toA at 20 % of the record; ' +
    'the output before the step must be present; metrics around that level',
  check(p, _product, at) {
    if (p.fromA !== undefined && p.toA !== undefined && sameLoad(p.fromA, p.toA)) at(['toA'], `must differ from fromA (${p.fromA} A) for a load step`);
  },
  async run(step, ctx) {
    const p = step.params;
    const vinV = p.vinV ?? ctx.product.vinNomV;
    await setSource(ctx, vinV);
    await setLoad(ctx, p.fromA!);
    await settled(ctx, p.settleMs ?? DEFAULT_SETTLE_MS);
    const samplesV = await ctx.scpi.capture({ sampleRateHz: p.sampleRateHz!, points: p.samples!, step: { fromA: p.fromA!, toA: p.toA! } });
    // the fixture applied the load step itself; the next step sets the load again
    forgetLoad(ctx);
    const stepIndex = Math.floor(samplesV.length * STEP_AT_FRACTION);
    const bandPct = p.recoveryBandPct ?? DEFAULT_RECOVERY_BAND_PCT;
    // The band is ±bandPct of the nominal output wide, centred on this unit's own level before the step:
    // the load step judges the dynamic response, while the output-voltage steps judge the static level, so a
    // unit whose output sits off nominal fails those steps and not this one too.
    let sumV = 0;
    for (let i = 0; i <= stepIndex; i++) sumV += samplesV[i];
    const bandCentreV = sumV / (stepIndex + 1);
    const raw = { vinV, fromA: p.fromA, toA: p.toA, stepIndex, bandPct, bandCentreV, ...captureSummary(samplesV, p.sampleRateHz!) };
    // deviations around an absent output are noise: refuse them before computing anything
    const absent = outputAbsent(bandCentreV, ctx.product.voutNomV, 'undershoot, overshoot and recovery', 'the output before the load step');
    if (absent) return METRICS.map((base) => ({ base, value: null, raw, problem: absent }));
    try {
      const m = transientMetrics({
        samplesV,
        sampleRateHz: p.sampleRateHz!,
        stepIndex,
        vNomV: bandCentreV,
        bandPct: (bandPct * ctx.product.voutNomV) / bandCentreV,
      });
      const all = { ...raw, vBeforeV: m.vBeforeV, vFinalV: m.vFinalV, vMinV: m.vMinV, vMaxV: m.vMaxV, leftBandAtUs: m.leftBandAtUs };
      const recovery: Quantity =
        m.recoveryUs === null
          ? {
              base: 'recoveryUs',
              value: null,
              raw: all,
              problem: `the output did not settle back within ±${bandPct} % of nominal around ${bandCentreV.toFixed(3)} V before the end of the record`,
            }
          : { base: 'recoveryUs', value: m.recoveryUs, raw: all };
      return [{ base: 'undershootMv', value: m.undershootMv, raw: all }, { base: 'overshootMv', value: m.overshootMv, raw: all }, recovery];
    } catch (err) {
      if (!(err instanceof RangeError)) throw err;
      const problem = err.message;
      return METRICS.map((base) => ({ base, value: null, raw, problem }));
    }
  },
};
