import type { StepParams } from '../plan-definition';
import { DEFAULT_SETTLE_MS, setLoad, setSource, settled } from './fixture-ops';
import { OUTPUT_VOLTAGE_RANGE } from './ranges';
import type { ParamIssue, Quantity, StepKindDef } from './types';
import { sameLoad } from './limit-keys';

/** A load listed twice would measure the same quantity twice under one key. */
export function checkLoadsOnce(p: StepParams, at: ParamIssue): void {
  (p.loadsA ?? []).forEach((a, k) => {
    const first = p.loadsA!.findIndex((b) => sameLoad(a, b));
    if (first < k) at(['loadsA', k], `load ${a} A is listed twice (see loadsA[${first}])`);
  });
}

export const voutAtLoad: StepKindDef = {
  kind: 'vout_at_load',
  summary: 'Output voltage at each listed load',
  params: { loadsA: 'required', vinV: 'optional', settleMs: 'optional' },
  quantities: [{ base: 'voutV', unit: 'V', name: 'Output voltage at {load} A', perLoad: true, range: OUTPUT_VOLTAGE_RANGE }],
  sequence: 'source to vinV and on; for each load: set it, settle, measure the output voltage',
  check: (p, _product, at) => checkLoadsOnce(p, at),
  async run(step, ctx) {
    const p = step.params;
    const vinV = p.vinV ?? ctx.product.vinNomV;
    await setSource(ctx, vinV);
    const out: Quantity[] = [];
    for (const a of p.loadsA ?? []) {
      await setLoad(ctx, a);
      await settled(ctx, p.settleMs ?? DEFAULT_SETTLE_MS);
      const voutV = await ctx.scpi.measure('VOLT:OUT');
      out.push({ base: 'voutV', atA: a, value: voutV, raw: { vinV, loadA: a, voutV } });
    }
    return out;
  },
};
