/**
 * The shape of a test plan's steps, shared by the plan files in test-plans/, the plan versions stored
 * in the database and the run engine. Numbers carry their unit in the field name.
 */
export const STEP_KINDS = [
  'input_current_no_load',
  'vout_no_load',
  'vout_at_load',
  'load_regulation',
  'line_regulation',
  'efficiency',
  'ripple',
  'load_step',
  'protection',
] as const;
export type StepKind = (typeof STEP_KINDS)[number];

/** simple: pass inside the tolerance limits (ILAC-G8 §4.2.1); guarded: limits narrowed by U (w = U). */
export type DecisionRule = 'simple' | 'guarded';

/** One judged quantity of a step. Limits are inclusive. */
export interface LimitSpec {
  /** Quantity key within the step, e.g. `voutV`, `rippleMvPp`, `efficiencyPct@1.0A` */
  key: string;
  name: string;
  unit: string;
  low?: number;
  high?: number;
  /** Expanded measurement uncertainty U (k = 2) in the limit's unit; 0 when not stated */
  uncertainty?: number;
  rule: DecisionRule;
}

export interface StepParams {
  /** Input voltage for the step; defaults to the product's nominal input */
  vinV?: number;
  /** Electronic-load current */
  loadA?: number;
  /** Several loads (vout_at_load, efficiency) */
  loadsA?: number[];
  /** Several input voltages (line_regulation) */
  vinsV?: number[];
  /** Load-regulation definition: vs full-load voltage (LR1), nominal (LR2) or reference-load deviation (LR4) */
  regulationDefinition?: 'full_load' | 'nominal' | 'reference_load';
  /** Wait after setting source/load before measuring */
  settleMs?: number;
  /** Waveform capture: number of samples and sample rate */
  samples?: number;
  sampleRateHz?: number;
  /** Software bandwidth limit applied to the capture before ripple is taken */
  bandwidthHz?: number;
  /** Load step from → to */
  fromA?: number;
  toA?: number;
  /** Recovery band around the nominal output, percent */
  recoveryBandPct?: number;
  /** Overload current for the protection check */
  overloadA?: number;
}

export interface PlanStep {
  key: string;
  name: string;
  kind: StepKind;
  params: StepParams;
  limits: LimitSpec[];
}

/**
 * The product ratings a plan is checked against and its steps run with (docs/architecture.md demo plant
 * table). Volts and amperes.
 */
export interface PlanProduct {
  partNumber: string;
  vinMinV: number;
  vinNomV: number;
  vinMaxV: number;
  voutNomV: number;
  ioutRatedA: number;
}
