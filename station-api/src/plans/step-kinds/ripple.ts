import { rippleMvPp } from '../../measure/ripple';
import { captureSummary, computed, DEFAULT_SETTLE_MS, outputAbsent, setLoad, setSource, settled } from './fixture-ops';
import { outputSwingRange } from './ranges';
import type { StepKindDef } from './types';

export const ripple: StepKindDef = {
  kind: 'ripple',
  summary: 'Peak-to-peak output ripple and noise, after an optional software bandwidth limit',
  params: { loadA: 'required', samples: 'required', sampleRateHz: 'required', bandwidthHz: 'optional', vinV: 'optional', settleMs: 'optional' },
  quantities: [{ base: 'rippleMvPp', unit: 'mV', name: 'Output ripple and noise, peak-to-peak', range: outputSwingRange('ripple') }],
  sequence: 'source to vinV and on; load at loadA; settle; capture the output (mean must show the output present); filter; peak-to-peak',
  check(p, _product, at) {
    if (p.bandwidthHz !== undefined && p.sampleRateHz !== undefined && p.bandwidthHz >= p.sampleRateHz / 2) {
      at(
        ['bandwidthHz'],
        `${p.bandwidthHz} Hz is not below half the sample rate (${p.sampleRateHz / 2} Hz), so the bandwidth limit would do nothing; raise sampleRateHz or lower bandwidthHz`,
      );
    }
  },
  async run(step, ctx) {
    const p = step.params;
    const vinV = p.vinV ?? ctx.product.vinNomV;
    const loadA = p.loadA ?? ctx.product.ioutRatedA;
    await setSource(ctx, vinV);
    await setLoad(ctx, loadA);
    await settled(ctx, p.settleMs ?? DEFAULT_SETTLE_MS);
    const samplesV = await ctx.scpi.capture({ sampleRateHz: p.sampleRateHz!, points: p.samples! });
    const summary = captureSummary(samplesV, p.sampleRateHz!);
    const raw = { vinV, loadA, ...summary, bandwidthHz: p.bandwidthHz ?? null };
    const absent = outputAbsent(summary.meanV as number, ctx.product.voutNomV, 'a ripple figure', 'the captured output (mean)');
    if (absent) return [{ base: 'rippleMvPp', value: null, raw, problem: absent }];
    return [computed('rippleMvPp', raw, () => rippleMvPp(samplesV, p.sampleRateHz!, p.bandwidthHz))];
  },
};
