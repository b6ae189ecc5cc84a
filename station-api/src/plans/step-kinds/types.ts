import type { ScpiClient } from '../../fixtures/transport/scpi-client';
import type { PlanProduct, PlanStep, StepKind, StepParams } from '../plan-definition';

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
 * One quantity a step produced. `atA` tells which load a per-load quantity belongs to.
 * `value` is null when the unit's readings admit no value (e.g. an output that never recovers, an absent output
 * under a ripple or load-step capture, or no input power to compute an efficiency from); such a quantity fails.
 * `implausible` is set when a reading lies outside the quantity's physical range (a fixture or wiring fault, not
 * a property of the unit): the message names the reading; the run ends in error and the unit is not judged.
 */
export interface Quantity {
  base: string;
  atA?: number;
  value: number | null;
  raw: Record<string, unknown>;
  /** Why there is no value, in plain words */
  problem?: string;
  /** Why the reading cannot be physically true, naming the reading */
  implausible?: string;
}

/** Where a physical bound comes from: the product's ratings and the step's own settings. */
export interface RangeContext {
  product: ProductRatings;
  params: StepParams;
}
export type Bound = number | ((c: RangeContext) => number);

/** The values a quantity can physically take. Bounds are inclusive unless marked open. */
export interface PhysicalRange {
  min?: Bound;
  minOpen?: boolean;
  max?: Bound;
  maxOpen?: boolean;
  /** The range in words, for messages and docs, e.g. "0 % < η < 100 %" */
  text: string;
  /** The physical law or source behind it */
  law: string;
}

export interface QuantityDef {
  /** Quantity name as it appears in a limit key, before any `@<load>` */
  base: string;
  unit: string;
  /** Default display name; `{load}` is replaced by the load of a per-load quantity */
  name: string;
  /** One quantity per entry of `loadsA`, keyed `<base>@<load>` */
  perLoad?: boolean;
  /** A yes/no result stored as 1 (yes) or 0 (no) */
  flag?: boolean;
  range: PhysicalRange;
}

export type ParamName = keyof StepParams;
/** Reports one problem at a field path below `params` (e.g. `['loadsA', 1]`). */
export type ParamIssue = (segs: (string | number)[], message: string) => void;

/** One step kind: everything the plan checks, the engine, the schema and the docs know about it. */
export interface StepKindDef {
  kind: StepKind;
  /** What the step does, one line, for the docs */
  summary: string;
  /** Parameters it reads, in docs order; anything else in `params` is refused as a likely typo */
  params: Partial<Record<ParamName, 'required' | 'optional'>>;
  quantities: QuantityDef[];
  /** The fixture sequence in words, for the docs */
  sequence: string;
  /** Checks across this kind's parameters (the catalogue checks each parameter alone); product when known */
  check?(params: StepParams, product: ProductRatings | undefined, at: ParamIssue): void;
  /** Drives the fixture and computes the quantities (physical ranges are applied afterwards by runStep) */
  run(step: PlanStep, ctx: StepContext): Promise<Quantity[]>;
}
