import { lineRegulationPct } from '../../measure/regulation';
import { computed, DEFAULT_SETTLE_MS, setLoad, setSource, settled } from './fixture-ops';
import { outputReadingImplausible } from './ranges';
import type { StepKindDef } from './types';

export const lineRegulation: StepKindDef = {
  kind: 'line_regulation',
  summary: 'Spread of the output over an input-voltage sweep at a fixed load',
  params: { loadA: 'required', vinsV: 'required', settleMs: 'optional' },
  quantities: [
    {
      base: 'lineRegPct',
      unit: '%',
      name: 'Line regulation',
      range: {
        min: 0,
        text: 'line regulation ≥ 0 %; each output reading −5 % of V_nom … V_in',
        law: 'a spread (max − min) of readings cannot be negative; each reading is held to the buck output range V_out = D·V_in, 0 ≤ D ≤ 1 (Erickson & Maksimović, ch. 2)',
      },
    },
  ],
  sequence: 'load at loadA; for each input in vinsV (plus nominal, the reference): source to it, settle, measure V_out; source back to nominal',
  check(p, _product, at) {
    if (p.vinsV && new Set(p.vinsV).size < 2) at(['vinsV'], 'needs at least two different input voltages');
  },
  async run(step, ctx) {
    const p = step.params;
    const loadA = p.loadA ?? ctx.product.ioutRatedA;
    const vins = p.vinsV ?? [ctx.product.vinMinV, ctx.product.vinNomV, ctx.product.vinMaxV];
    // the reference is the output at nominal line; measure it even if the plan's sweep leaves it out
    const sweep = vins.some((v) => v === ctx.product.vinNomV) ? vins : [...vins, ctx.product.vinNomV];
    await setLoad(ctx, loadA);
    const voutsV: number[] = [];
    for (const v of sweep) {
      await setSource(ctx, v);
      await settled(ctx, p.settleMs ?? DEFAULT_SETTLE_MS);
      voutsV.push(await ctx.scpi.measure('VOLT:OUT'));
    }
    const vRefV = voutsV[sweep.indexOf(ctx.product.vinNomV)];
    const inPlan = voutsV.filter((_, i) => i < vins.length);
    await setSource(ctx, ctx.product.vinNomV);
    const q = computed('lineRegPct', { loadA, vinsV: vins, voutsV: inPlan, vRefV }, () => lineRegulationPct(inPlan, vRefV));
    const implausible = sweep.map((v, i) => outputReadingImplausible(`lineRegPct reading at ${v} V in`, voutsV[i], v, ctx.product)).find(Boolean);
    return [implausible ? { ...q, implausible } : q];
  },
};
