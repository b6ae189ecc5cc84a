import type { Quantity, StepContext } from './types';

/**
 * The fixture moves every step kind shares, and the helpers that turn readings into quantities.
 */

/** Points kept of a capture in the stored raw readings, enough to draw the shape */
const TRACE_POINTS = 100;

/**
 * Below this share of the nominal output the module is not delivering an output at all (open output, no contact,
 * dead controller or fold-back, which the demo products hold at 6–8 % of V_nom). A wrong set point (the demo
 * defect is off by 6–10 %) stays far above it. Ripple, transient and efficiency figures taken on an absent output
 * describe meter noise, not the module: they are not computed, and the quantity fails without a value (the unit is
 * judged: an open output is a defect of the unit, not of the fixture).
 * Half of nominal is the team's choice (common practice, no source): well clear of both cases above.
 */
export const OUTPUT_PRESENT_FRACTION = 0.5;

/** A message when the output reading `voutV` says the output is absent, else undefined. */
export function outputAbsent(voutV: number, vNomV: number, what: string, reading: string): string | undefined {
  if (voutV >= OUTPUT_PRESENT_FRACTION * vNomV) return undefined;
  return (
    `${reading} reads ${Number(voutV.toPrecision(4))} V, below ${OUTPUT_PRESENT_FRACTION * 100} % of the nominal ${vNomV} V: ` +
    `the output is not there (open output, no contact or not regulating), so ${what} would describe noise, not the unit`
  );
}

/** A computed quantity; a RangeError from the computation (impossible readings of this unit) becomes a value-less fail. */
export function computed(base: string, raw: Record<string, unknown>, compute: () => number): Quantity {
  try {
    return { base, value: compute(), raw };
  } catch (err) {
    if (!(err instanceof RangeError)) throw err;
    return { base, value: null, raw, problem: err.message };
  }
}

export async function setSource(ctx: StepContext, vinV: number): Promise<void> {
  const f = ctx.fixture;
  if (f.sourceV !== vinV) {
    await ctx.scpi.setSourceV(vinV);
    f.sourceV = vinV;
  }
  if (f.sourceOn !== true) {
    await ctx.scpi.sourceOn();
    f.sourceOn = true;
  }
}

/** Sets the load; `undefined` or 0 switches it off. */
export async function setLoad(ctx: StepContext, loadA: number | undefined): Promise<void> {
  const f = ctx.fixture;
  if (loadA === undefined || loadA === 0) {
    if (f.loadOn !== false) {
      await ctx.scpi.loadOff();
      f.loadOn = false;
    }
    return;
  }
  if (f.loadA !== loadA) {
    await ctx.scpi.setLoadA(loadA);
    f.loadA = loadA;
  }
  if (f.loadOn !== true) {
    await ctx.scpi.loadOn();
    f.loadOn = true;
  }
}

/** Waits for the fixture to report settled, then the plan's own settle time. */
export async function settled(ctx: StepContext, settleMs: number): Promise<void> {
  await ctx.scpi.waitComplete();
  await ctx.settle(settleMs);
}

/** The fixture changed the load itself (load step, overload test): the next step must set it again. */
export function forgetLoad(ctx: StepContext): void {
  ctx.fixture.loadA = undefined;
  ctx.fixture.loadOn = undefined;
}

/** Min, max, mean and a thinned trace of a capture, for the stored raw readings. */
export function captureSummary(samplesV: number[], sampleRateHz: number): Record<string, unknown> {
  let min = Infinity;
  let max = -Infinity;
  let sum = 0;
  for (const v of samplesV) {
    if (v < min) min = v;
    if (v > max) max = v;
    sum += v;
  }
  const every = Math.max(1, Math.ceil(samplesV.length / TRACE_POINTS));
  const traceV: number[] = [];
  for (let i = 0; i < samplesV.length; i += every) traceV.push(Number(samplesV[i].toPrecision(6)));
  return { samples: samplesV.length, sampleRateHz, minV: min, maxV: max, meanV: sum / samplesV.length, traceEvery: every, traceV };
}

/** settle default when a plan gives none; the fixture's *OPC? already waits for its own settling */
export const DEFAULT_SETTLE_MS = 0;
