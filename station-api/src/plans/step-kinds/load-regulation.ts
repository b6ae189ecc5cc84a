import { loadRegulationPct, loadRegulationRefPct } from '../../measure/regulation';
import { computed, DEFAULT_SETTLE_MS, setLoad, setSource, settled } from './fixture-ops';
import { outputReadingImplausible } from './ranges';
import type { StepKindDef } from './types';

export const loadRegulation: StepKindDef = {
  kind: 'load_regulation',
  summary: 'Change of the output from no load to full load, by the stated definition',
  params: { loadA: 'required', regulationDefinition: 'required', vinV: 'optional', settleMs: 'optional' },
  quantities: [
    {
      base: 'loadRegPct',
      unit: '%',
      name: 'Load regulation',
      range: {
        text: 'any sign; each output reading −5 % of V_nom … V_in',
        law: 'a signed difference of output readings; each reading is held to the buck output range V_out = D·V_in, 0 ≤ D ≤ 1 (Erickson & Maksimović, ch. 2)',
      },
    },
  ],
  sequence: 'source to vinV and on; load off, settle, measure V_NL; (reference_load: load at loadA/2, measure); load at loadA, settle, measure V_FL',
  check(p, _product, at) {
    if (p.loadA !== undefined && p.loadA <= 0) at(['loadA'], 'load regulation needs a full-load current above 0 A');
  },
  async run(step, ctx) {
    const p = step.params;
    const vinV = p.vinV ?? ctx.product.vinNomV;
    const loadA = p.loadA ?? ctx.product.ioutRatedA;
    const settleMs = p.settleMs ?? DEFAULT_SETTLE_MS;
    await setSource(ctx, vinV);
    const definition = p.regulationDefinition ?? 'nominal';
    const readings: Record<string, number> = {};
    await setLoad(ctx, undefined);
    await settled(ctx, settleMs);
    readings.vNoLoadV = await ctx.scpi.measure('VOLT:OUT');
    // LR4 compares against the output at a reference load; half of full load is the usual datasheet choice
    // (common practice, no source)
    const refA = loadA / 2;
    if (definition === 'reference_load') {
      await setLoad(ctx, refA);
      await settled(ctx, settleMs);
      readings.vRefLoadV = await ctx.scpi.measure('VOLT:OUT');
    }
    await setLoad(ctx, loadA);
    await settled(ctx, settleMs);
    readings.vFullLoadV = await ctx.scpi.measure('VOLT:OUT');
    const raw = { vinV, fullLoadA: loadA, definition, ...readings, ...(definition === 'reference_load' ? { refLoadA: refA } : {}) };
    const q = computed('loadRegPct', raw, () =>
      definition === 'reference_load'
        ? loadRegulationRefPct([readings.vNoLoadV, readings.vRefLoadV, readings.vFullLoadV], readings.vRefLoadV)
        : loadRegulationPct({ vNoLoadV: readings.vNoLoadV, vFullLoadV: readings.vFullLoadV, vNomV: ctx.product.voutNomV, definition }),
    );
    const implausible = Object.entries(readings)
      .map(([name, v]) => outputReadingImplausible(`loadRegPct reading ${name}`, v, vinV, ctx.product))
      .find(Boolean);
    return [implausible ? { ...q, implausible } : q];
  },
};
