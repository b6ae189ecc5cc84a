import { DEFAULT_SETTLE_MS, setLoad, setSource, settled } from './fixture-ops';
import { OUTPUT_VOLTAGE_RANGE } from './ranges';
import type { StepKindDef } from './types';

export const voutNoLoad: StepKindDef = {
  kind: 'vout_no_load',
  summary: 'Output voltage with the load off',
  params: { vinV: 'optional', settleMs: 'optional' },
  quantities: [{ base: 'voutV', unit: 'V', name: 'Output voltage, no load', range: OUTPUT_VOLTAGE_RANGE }],
  sequence: 'load off; source to vinV and on; settle; measure the output voltage',
  async run(step, ctx) {
    const vinV = step.params.vinV ?? ctx.product.vinNomV;
    await setLoad(ctx, undefined);
    await setSource(ctx, vinV);
    await settled(ctx, step.params.settleMs ?? DEFAULT_SETTLE_MS);
    const voutV = await ctx.scpi.measure('VOLT:OUT');
    return [{ base: 'voutV', value: voutV, raw: { vinV, loadA: 0, voutV } }];
  },
};
