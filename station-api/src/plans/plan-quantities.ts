import type { StepKind, StepParams } from './plan-definition';

/**
 * What each step kind measures and which parameters it reads (docs/architecture.md, "Step kinds and the
 * quantities they judge"). Shared by the plan-file loader and the plans API so both refuse the same plans.
 */

export interface QuantityInfo {
  /** Quantity name as it appears in a limit key, before any `@<load>` */
  base: string;
  unit: string;
  /** Default display name; `{load}` is replaced by the load of a per-load quantity */
  name: string;
  /** One quantity per entry of `loadsA`, keyed `<base>@<load>` */
  perLoad?: boolean;
  /** A yes/no result stored as 1 (yes) or 0 (no) */
  flag?: boolean;
}

export const KIND_QUANTITY_INFO: Record<StepKind, QuantityInfo[]> = {
  input_current_no_load: [{ base: 'iinNoLoadMa', unit: 'mA', name: 'Input current, no load' }],
  vout_no_load: [{ base: 'voutV', unit: 'V', name: 'Output voltage, no load' }],
  vout_at_load: [{ base: 'voutV', unit: 'V', name: 'Output voltage at {load} A', perLoad: true }],
  load_regulation: [{ base: 'loadRegPct', unit: '%', name: 'Load regulation' }],
  line_regulation: [{ base: 'lineRegPct', unit: '%', name: 'Line regulation' }],
  efficiency: [{ base: 'efficiencyPct', unit: '%', name: 'Efficiency at {load} A', perLoad: true }],
  ripple: [{ base: 'rippleMvPp', unit: 'mV', name: 'Output ripple and noise, peak-to-peak' }],
  load_step: [
    { base: 'undershootMv', unit: 'mV', name: 'Load-step undershoot' },
    { base: 'overshootMv', unit: 'mV', name: 'Load-step overshoot' },
    { base: 'recoveryUs', unit: 'µs', name: 'Load-step recovery time' },
  ],
  protection: [
    { base: 'foldback', unit: 'flag', name: 'Output folds back on overload', flag: true },
    { base: 'recovered', unit: 'flag', name: 'Output recovers after overload', flag: true },
  ],
};

/** Parameters each kind reads; anything else in `params` is refused as a likely typo. */
export const KIND_PARAMS: Record<StepKind, (keyof StepParams)[]> = {
  input_current_no_load: ['vinV', 'settleMs'],
  vout_no_load: ['vinV', 'settleMs'],
  vout_at_load: ['vinV', 'loadsA', 'settleMs'],
  load_regulation: ['vinV', 'loadA', 'regulationDefinition', 'settleMs'],
  line_regulation: ['loadA', 'vinsV', 'settleMs'],
  efficiency: ['vinV', 'loadsA', 'settleMs'],
  ripple: ['vinV', 'loadA', 'samples', 'sampleRateHz', 'bandwidthHz', 'settleMs'],
  load_step: ['vinV', 'fromA', 'toA', 'samples', 'sampleRateHz', 'recoveryBandPct', 'settleMs'],
  protection: ['vinV', 'overloadA', 'settleMs'],
};

/**
 * Splits a limit key into quantity and load: `voutV@1.5` → voutV, 1.5. A trailing `A` on the load is accepted
 * (`efficiencyPct@1.5A`), as the run engine accepts it.
 */
export function splitLimitKey(key: string): { base: string; atA?: number } {
  const at = key.indexOf('@');
  if (at < 0) return { base: key };
  const atA = Number(key.slice(at + 1).replace(/A$/, ''));
  return { base: key.slice(0, at), atA: key.length > at + 1 && Number.isFinite(atA) ? atA : Number.NaN };
}

/** Loads compare numerically, so `@1.5`, `@1.50` and `@1.5A` name the same load. */
export function sameLoad(a: number, b: number): boolean {
  return Math.abs(a - b) < 1e-9;
}
