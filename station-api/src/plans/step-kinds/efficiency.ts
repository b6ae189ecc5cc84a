import { efficiencyPct } from '../../measure/efficiency';
import { computed, DEFAULT_SETTLE_MS, outputAbsent, setLoad, setSource, settled } from './fixture-ops';
import type { Quantity, StepKindDef } from './types';
import { checkLoadsOnce } from './vout-at-load';

export const efficiency: StepKindDef = {
  kind: 'efficiency',
  summary: 'Conversion efficiency P_out / P_in at each listed load',
  params: { loadsA: 'required', vinV: 'optional', settleMs: 'optional' },
  quantities: [
    {
      base: 'efficiencyPct',
      unit: '%',
      name: 'Efficiency at {load} A',
      perLoad: true,
      range: {
        min: 0,
        minOpen: true,
        max: 100,
        maxOpen: true,
        text: '0 % < η < 100 %',
        law: 'conservation of energy: a module cannot deliver more power than it draws, and its own losses keep P_out below P_in (first law of thermodynamics)',
      },
    },
  ],
  sequence: 'source to vinV and on; for each load: set it, settle, measure V_in, I_in, V_out, I_out (output must be present)',
  check(p, _product, at) {
    checkLoadsOnce(p, at);
    (p.loadsA ?? []).forEach((a, k) => {
      if (a <= 0) at(['loadsA', k], 'efficiency needs a load above 0 A (no output power at 0 A)');
    });
  },
  async run(step, ctx) {
    const p = step.params;
    await setSource(ctx, p.vinV ?? ctx.product.vinNomV);
    const out: Quantity[] = [];
    for (const a of p.loadsA ?? []) {
      await setLoad(ctx, a);
      await settled(ctx, p.settleMs ?? DEFAULT_SETTLE_MS);
      const r = {
        vinV: await ctx.scpi.measure('VOLT:IN'),
        iinA: await ctx.scpi.measure('CURR:IN'),
        voutV: await ctx.scpi.measure('VOLT:OUT'),
        ioutA: await ctx.scpi.measure('CURR:OUT'),
      };
      const q: Quantity = { ...computed('efficiencyPct', { loadA: a, ...r }, () => efficiencyPct(r.vinV, r.iinA, r.voutV, r.ioutA)), atA: a };
      const absent = outputAbsent(r.voutV, ctx.product.voutNomV, 'an efficiency', `the output at ${a} A`);
      out.push(absent ? { ...q, value: null, problem: absent } : q);
    }
    return out;
  },
};
