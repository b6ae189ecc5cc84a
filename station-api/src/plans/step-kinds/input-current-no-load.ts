import { DEFAULT_SETTLE_MS, setLoad, setSource, settled } from './fixture-ops';
import type { StepKindDef } from './types';

export const inputCurrentNoLoad: StepKindDef = {
  kind: 'input_current_no_load',
  summary: 'Input current with the load off',
  params: { vinV: 'optional', settleMs: 'optional' },
  quantities: [
    {
      base: 'iinNoLoadMa',
      unit: 'mA',
      name: 'Input current, no load',
      range: {
        min: -1,
        text: 'I_in ≥ −1 mA',
        law: 'a module at no load draws current from its source and cannot return any at steady state (no energy source inside); −1 mA allows for meter offset',
      },
    },
  ],
  sequence: 'load off; source to vinV and on; settle; measure the input current',
  async run(step, ctx) {
    const vinV = step.params.vinV ?? ctx.product.vinNomV;
    await setLoad(ctx, undefined);
    await setSource(ctx, vinV);
    await settled(ctx, step.params.settleMs ?? DEFAULT_SETTLE_MS);
    const iinA = await ctx.scpi.measure('CURR:IN');
    return [{ base: 'iinNoLoadMa', value: iinA * 1000, raw: { vinV, iinA } }];
  },
};
