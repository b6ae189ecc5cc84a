import { DEFAULT_SETTLE_MS, forgetLoad, setLoad, setSource, settled } from './fixture-ops';
import { FLAG_RANGE } from './ranges';
import type { StepKindDef } from './types';

export const protection: StepKindDef = {
  kind: 'protection',
  summary: 'Overload above the rating: does the output fold back, and recover when the overload is removed?',
  params: { overloadA: 'required', vinV: 'optional', settleMs: 'optional' },
  quantities: [
    { base: 'foldback', unit: 'flag', name: 'Output folds back on overload', flag: true, range: FLAG_RANGE },
    { base: 'recovered', unit: 'flag', name: 'Output recovers after overload', flag: true, range: FLAG_RANGE },
  ],
  sequence: 'source to vinV and on, load off; settle; the fixture applies overloadA, reads the output, removes it and reads again',
  check(p, product, at) {
    if (p.overloadA !== undefined && product && p.overloadA <= product.ioutRatedA) {
      at(['overloadA'], `${p.overloadA} A is not an overload: it must be above the rated ${product.ioutRatedA} A of ${product.partNumber}`);
    }
  },
  async run(step, ctx) {
    const p = step.params;
    const vinV = p.vinV ?? ctx.product.vinNomV;
    await setSource(ctx, vinV);
    await setLoad(ctx, undefined);
    await settled(ctx, p.settleMs ?? DEFAULT_SETTLE_MS);
    const r = await ctx.scpi.protectionTest(p.overloadA!);
    // the fixture released the overload itself; what it left set is not known, so the next step sets again
    forgetLoad(ctx);
    const raw = { vinV, overloadA: p.overloadA, ...r };
    return [
      { base: 'foldback', value: r.folded ? 1 : 0, raw },
      { base: 'recovered', value: r.recovered ? 1 : 0, raw },
    ];
  },
};
