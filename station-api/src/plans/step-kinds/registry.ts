import { STEP_KINDS, type StepKind } from '../plan-definition';
import { efficiency } from './efficiency';
import { inputCurrentNoLoad } from './input-current-no-load';
import { lineRegulation } from './line-regulation';
import { loadRegulation } from './load-regulation';
import { loadStep } from './load-step';
import { protection } from './protection';
import { ripple } from './ripple';
import type { ParamName, QuantityDef, StepKindDef } from './types';
import { voutAtLoad } from './vout-at-load';
import { voutNoLoad } from './vout-no-load';

/**
 * The one registry of step kinds. Adding a kind: write `<kind>.ts`, add it to STEP_KINDS (plan-definition.ts)
 * and here, then run `npm run gen:plan-schema -w station-api` to regenerate the schema and the docs table.
 */
export const STEP_KIND_DEFS: Readonly<Record<StepKind, StepKindDef>> = {
  input_current_no_load: inputCurrentNoLoad,
  vout_no_load: voutNoLoad,
  vout_at_load: voutAtLoad,
  load_regulation: loadRegulation,
  line_regulation: lineRegulation,
  efficiency: efficiency,
  ripple: ripple,
  load_step: loadStep,
  protection: protection,
};

/** Every kind in the order of STEP_KINDS. */
export const ALL_STEP_KINDS: readonly StepKindDef[] = STEP_KINDS.map((k) => STEP_KIND_DEFS[k]);

/** The definition of a kind, or undefined for a name that is not one. */
export function stepKindDef(kind: string): StepKindDef | undefined {
  return Object.prototype.hasOwnProperty.call(STEP_KIND_DEFS, kind) ? STEP_KIND_DEFS[kind as StepKind] : undefined;
}

/** The quantity a kind produces under a base name. */
export function quantityDef(kind: StepKind, base: string): QuantityDef | undefined {
  return STEP_KIND_DEFS[kind].quantities.find((q) => q.base === base);
}

/** Parameters a kind reads, in docs order. */
export function kindParams(def: StepKindDef): ParamName[] {
  return Object.keys(def.params) as ParamName[];
}
