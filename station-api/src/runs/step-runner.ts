import type { ScpiClient } from '../fixtures/transport/scpi-client';
import { efficiencyPct } from '../measure/efficiency';
import { lineRegulationPct, loadRegulationPct, loadRegulationRefPct } from '../measure/regulation';
import { rippleMvPp } from '../measure/ripple';
import { transientMetrics } from '../measure/transient';
import type { PlanProduct, PlanStep, StepKind } from '../plans/plan-definition';

/** What a step needs to know about the product under test: the ratings its plan was checked against. */
export type ProductRatings = PlanProduct;

/** Everything a step sequence may touch. */
export interface StepContext {
  scpi: ScpiClient;
  product: ProductRatings;
  /** Waits `ms` after the fixture reported settled (`*OPC?`); skipped on an instant simulated fixture. */
  settle(ms: number): Promise<void>;
  /** What the engine last set on the fixture, so repeated sets are skipped */
  fixture: { sourceV?: number; sourceOn?: boolean; loadA?: number; loadOn?: boolean };
}

/**
 * One quantity a step produced. `atA` / `atV` tell which load or line a swept quantity belongs to.
 * `value` is null when the unit's readings admit no value (e.g. an output that never recovers, or no
 * input power to compute an efficiency from); such a quantity fails.
 */
export interface Quantity {
  base: string;
  atA?: number;
  value: number | null;
  raw: Record<string, unknown>;
  /** Why there is no value, in plain words */
  problem?: string;
}

/** Quantities each step kind produces (docs/architecture.md "Step kinds"); `@` marks a per-load quantity. */
export const KIND_QUANTITIES: Record<StepKind, string[]> = {
  input_current_no_load: ['iinNoLoadMa'],
  vout_no_load: ['voutV'],
  vout_at_load: ['voutV@'],
  load_regulation: ['loadRegPct'],
  line_regulation: ['lineRegPct'],
  efficiency: ['efficiencyPct@'],
  ripple: ['rippleMvPp'],
  load_step: ['undershootMv', 'overshootMv', 'recoveryUs'],
  protection: ['foldback', 'recovered'],
};

/** Splits a limit key into its quantity and load: `voutV@1.5` and `efficiencyPct@1.5A` → voutV, 1.5. */
export function parseLimitKey(key: string): { base: string; atA?: number } {
  const at = key.indexOf('@');
  if (at < 0) return { base: key };
  const load = Number(key.slice(at + 1).replace(/A$/i, ''));
  return { base: key.slice(0, at), atA: Number.isFinite(load) ? load : Number.NaN };
}

/** Finds the quantity a limit judges; loads compare numerically so `@1.5`, `@1.50` and `@1.5A` agree. */
export function quantityFor(key: string, quantities: Quantity[]): Quantity | undefined {
  const { base, atA } = parseLimitKey(key);
  return quantities.find((q) => q.base === base && (atA === undefined ? q.atA === undefined : q.atA !== undefined && Math.abs(q.atA - atA) < 1e-9));
}

/** Problems with a step's parameters that would make it impossible to run, in plain words. Empty when fine. */
export function stepProblems(step: PlanStep): string[] {
  const p = step.params ?? {};
  const problems: string[] = [];
  const need = (ok: boolean, text: string) => {
    if (!ok) problems.push(`step "${step.name}" (${step.key}): ${text}`);
  };
  const positive = (x: unknown) => typeof x === 'number' && Number.isFinite(x) && x > 0;
  const nonNegative = (x: unknown) => typeof x === 'number' && Number.isFinite(x) && x >= 0;
  if (!(step.kind in KIND_QUANTITIES)) {
    need(false, `unknown kind "${step.kind}"`);
    return problems;
  }
  if (p.vinV !== undefined) need(positive(p.vinV), 'vinV must be a positive number of volts');
  if (p.loadA !== undefined) need(nonNegative(p.loadA), 'loadA must be 0 A or more');
  if (step.kind === 'vout_at_load' || step.kind === 'efficiency') {
    need(Array.isArray(p.loadsA) && p.loadsA.length > 0 && p.loadsA.every(nonNegative), 'loadsA must list at least one load in amperes');
  }
  if (step.kind === 'line_regulation' && p.vinsV !== undefined) {
    need(Array.isArray(p.vinsV) && p.vinsV.length >= 2 && p.vinsV.every(positive), 'vinsV must list at least two input voltages');
  }
  if (step.kind === 'ripple' || step.kind === 'load_step') {
    need(Number.isInteger(p.samples) && (p.samples as number) >= 10, 'samples must be a whole number of at least 10');
    need(positive(p.sampleRateHz), 'sampleRateHz must be a positive number');
    if (p.bandwidthHz !== undefined) need(positive(p.bandwidthHz), 'bandwidthHz must be a positive number');
  }
  if (step.kind === 'load_step') {
    need(nonNegative(p.fromA) && nonNegative(p.toA), 'fromA and toA must be loads in amperes');
  }
  if (step.kind === 'protection') need(positive(p.overloadA), 'overloadA must be a positive current in amperes');
  const kindQuantities = KIND_QUANTITIES[step.kind];
  for (const limit of step.limits ?? []) {
    const { base, atA } = parseLimitKey(limit.key);
    const swept = kindQuantities.includes(`${base}@`);
    need(kindQuantities.includes(base) || swept, `limit "${limit.key}" is not a quantity of a ${step.kind} step (${kindQuantities.join(', ')})`);
    if (swept) {
      need(atA !== undefined && Number.isFinite(atA), `limit "${limit.key}" must name its load, e.g. ${base}@1.5`);
      const loads = step.params.loadsA ?? [];
      need(atA === undefined || loads.some((l) => Math.abs(l - atA) < 1e-9), `limit "${limit.key}" names a load not in loadsA`);
    }
  }
  return problems;
}

// settle default when a plan gives none; the fixture's *OPC? already waits for its own settling
const DEFAULT_SETTLE_MS = 0;
/** Recovery band for load steps when the plan gives none: ±2 % of V_nom (common practice, no source) */
const DEFAULT_RECOVERY_BAND_PCT = 2;
/** Share of the record before the load step, per the fixture protocol (step at 20 % of the record) */
const STEP_AT_FRACTION = 0.2;
/** Points kept of a capture in the stored raw readings, enough to draw the shape */
const TRACE_POINTS = 100;

/** Runs one plan step on the fixture and returns its quantities. Fixture failures propagate as FixtureFault. */
export async function runStep(step: PlanStep, ctx: StepContext): Promise<Quantity[]> {
  const p = step.params ?? {};
  const settleMs = p.settleMs ?? DEFAULT_SETTLE_MS;
  const vinV = p.vinV ?? ctx.product.vinNomV;
  const loadA = p.loadA ?? ctx.product.ioutRatedA;
  const { scpi } = ctx;

  switch (step.kind) {
    case 'input_current_no_load': {
      await setLoad(ctx, undefined);
      await setSource(ctx, vinV);
      await settled(ctx, settleMs);
      const iinA = await scpi.measure('CURR:IN');
      return [{ base: 'iinNoLoadMa', value: iinA * 1000, raw: { vinV, iinA } }];
    }
    case 'vout_no_load': {
      await setLoad(ctx, undefined);
      await setSource(ctx, vinV);
      await settled(ctx, settleMs);
      const voutV = await scpi.measure('VOLT:OUT');
      return [{ base: 'voutV', value: voutV, raw: { vinV, loadA: 0, voutV } }];
    }
    case 'vout_at_load': {
      await setSource(ctx, vinV);
      const out: Quantity[] = [];
      for (const a of p.loadsA ?? []) {
        await setLoad(ctx, a);
        await settled(ctx, settleMs);
        const voutV = await scpi.measure('VOLT:OUT');
        out.push({ base: 'voutV', atA: a, value: voutV, raw: { vinV, loadA: a, voutV } });
      }
      return out;
    }
    case 'load_regulation': {
      await setSource(ctx, vinV);
      const definition = p.regulationDefinition ?? 'nominal';
      const readings: Record<string, number> = {};
      await setLoad(ctx, undefined);
      await settled(ctx, settleMs);
      readings.vNoLoadV = await scpi.measure('VOLT:OUT');
      // LR4 compares against the output at a reference load; half of full load is the usual choice
      // (common practice, no source)
      const refA = loadA / 2;
      if (definition === 'reference_load') {
        await setLoad(ctx, refA);
        await settled(ctx, settleMs);
        readings.vRefLoadV = await scpi.measure('VOLT:OUT');
      }
      await setLoad(ctx, loadA);
      await settled(ctx, settleMs);
      readings.vFullLoadV = await scpi.measure('VOLT:OUT');
      const raw = { vinV, fullLoadA: loadA, definition, ...readings, ...(definition === 'reference_load' ? { refLoadA: refA } : {}) };
      return [
        computed('loadRegPct', raw, () =>
          definition === 'reference_load'
            ? loadRegulationRefPct([readings.vNoLoadV, readings.vRefLoadV, readings.vFullLoadV], readings.vRefLoadV)
            : loadRegulationPct({ vNoLoadV: readings.vNoLoadV, vFullLoadV: readings.vFullLoadV, vNomV: ctx.product.voutNomV, definition }),
        ),
      ];
    }
    case 'line_regulation': {
      const vins = p.vinsV ?? [ctx.product.vinMinV, ctx.product.vinNomV, ctx.product.vinMaxV];
      // the reference is the output at nominal line; measure it even if the plan's sweep leaves it out
      const sweep = vins.some((v) => v === ctx.product.vinNomV) ? vins : [...vins, ctx.product.vinNomV];
      await setLoad(ctx, loadA);
      const voutsV: number[] = [];
      for (const v of sweep) {
        await setSource(ctx, v);
        await settled(ctx, settleMs);
        voutsV.push(await scpi.measure('VOLT:OUT'));
      }
      const vRefV = voutsV[sweep.indexOf(ctx.product.vinNomV)];
      const inPlan = voutsV.filter((_, i) => i < vins.length);
      await setSource(ctx, ctx.product.vinNomV);
      return [computed('lineRegPct', { loadA, vinsV: vins, voutsV: inPlan, vRefV }, () => lineRegulationPct(inPlan, vRefV))];
    }
    case 'efficiency': {
      await setSource(ctx, vinV);
      const out: Quantity[] = [];
      for (const a of p.loadsA ?? []) {
        await setLoad(ctx, a);
        await settled(ctx, settleMs);
        const r = {
          vinV: await scpi.measure('VOLT:IN'),
          iinA: await scpi.measure('CURR:IN'),
          voutV: await scpi.measure('VOLT:OUT'),
          ioutA: await scpi.measure('CURR:OUT'),
        };
        out.push({ ...computed('efficiencyPct', { loadA: a, ...r }, () => efficiencyPct(r.vinV, r.iinA, r.voutV, r.ioutA)), atA: a });
      }
      return out;
    }
    case 'ripple': {
      await setSource(ctx, vinV);
      await setLoad(ctx, loadA);
      await settled(ctx, settleMs);
      const samplesV = await scpi.capture({ sampleRateHz: p.sampleRateHz!, points: p.samples! });
      const raw = { vinV, loadA, ...captureSummary(samplesV, p.sampleRateHz!), bandwidthHz: p.bandwidthHz ?? null };
      return [computed('rippleMvPp', raw, () => rippleMvPp(samplesV, p.sampleRateHz!, p.bandwidthHz))];
    }
    case 'load_step': {
      await setSource(ctx, vinV);
      await setLoad(ctx, p.fromA!);
      await settled(ctx, settleMs);
      const samplesV = await scpi.capture({ sampleRateHz: p.sampleRateHz!, points: p.samples!, step: { fromA: p.fromA!, toA: p.toA! } });
      // the fixture applied the load step itself; the next step sets the load again
      ctx.fixture.loadA = undefined;
      ctx.fixture.loadOn = undefined;
      const stepIndex = Math.floor(samplesV.length * STEP_AT_FRACTION);
      const bandPct = p.recoveryBandPct ?? DEFAULT_RECOVERY_BAND_PCT;
      // The band is ±bandPct of the nominal output wide, centred on this unit's own level before the step:
      // the load step judges the dynamic response, while the output-voltage steps judge the static level, so a
      // unit whose output sits off nominal fails those steps and not this one too.
      let sumV = 0;
      for (let i = 0; i <= stepIndex; i++) sumV += samplesV[i];
      const bandCentreV = sumV / (stepIndex + 1);
      const raw = { vinV, fromA: p.fromA, toA: p.toA, stepIndex, bandPct, bandCentreV, ...captureSummary(samplesV, p.sampleRateHz!) };
      try {
        const m = transientMetrics({
          samplesV,
          sampleRateHz: p.sampleRateHz!,
          stepIndex,
          vNomV: bandCentreV,
          bandPct: (bandPct * ctx.product.voutNomV) / bandCentreV,
        });
        const metrics = { vBeforeV: m.vBeforeV, vFinalV: m.vFinalV, vMinV: m.vMinV, vMaxV: m.vMaxV, leftBandAtUs: m.leftBandAtUs };
        return [
          { base: 'undershootMv', value: m.undershootMv, raw: { ...raw, ...metrics } },
          { base: 'overshootMv', value: m.overshootMv, raw: { ...raw, ...metrics } },
          m.recoveryUs === null
            ? {
                base: 'recoveryUs',
                value: null,
                raw: { ...raw, ...metrics },
                problem: `the output did not settle back within ±${bandPct} % of nominal around ${bandCentreV.toFixed(3)} V before the end of the record`,
              }
            : { base: 'recoveryUs', value: m.recoveryUs, raw: { ...raw, ...metrics } },
        ];
      } catch (err) {
        const problem = (err as Error).message;
        return ['undershootMv', 'overshootMv', 'recoveryUs'].map((base) => ({ base, value: null, raw, problem }));
      }
    }
    case 'protection': {
      await setSource(ctx, vinV);
      await setLoad(ctx, undefined);
      await settled(ctx, settleMs);
      const r = await scpi.protectionTest(p.overloadA!);
      // the fixture released the overload itself; what it left set is not known, so the next step sets again
      ctx.fixture.loadA = undefined;
      ctx.fixture.loadOn = undefined;
      const raw = { vinV, overloadA: p.overloadA, ...r };
      return [
        { base: 'foldback', value: r.folded ? 1 : 0, raw },
        { base: 'recovered', value: r.recovered ? 1 : 0, raw },
      ];
    }
    default: {
      const never: never = step.kind;
      throw new Error(`Unknown step kind ${String(never)}`);
    }
  }
}

/** A computed quantity; a RangeError from the computation (impossible readings of this unit) becomes a value-less fail. */
function computed(base: string, raw: Record<string, unknown>, compute: () => number): Quantity {
  try {
    return { base, value: compute(), raw };
  } catch (err) {
    if (!(err instanceof RangeError)) throw err;
    return { base, value: null, raw, problem: err.message };
  }
}

async function setSource(ctx: StepContext, vinV: number): Promise<void> {
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

/** Sets the load; `undefined` switches it off. */
async function setLoad(ctx: StepContext, loadA: number | undefined): Promise<void> {
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

async function settled(ctx: StepContext, settleMs: number): Promise<void> {
  await ctx.scpi.waitComplete();
  await ctx.settle(settleMs);
}

function captureSummary(samplesV: number[], sampleRateHz: number): Record<string, unknown> {
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
