/*
 * What the yield endpoints answer: the one definition, read by the server's yield services and, through the
 * `@contract/*` alias, by the Quality screen. Type-only imports of the pure statistics module.
 */
import type { CapabilityReport, Histogram, IndexEstimate, ParetoRow, PpmOutside, ProportionInterval, RuleSet, RuleViolation } from '../stats';

export type { CapabilityReport, Histogram, IndexEstimate, ParetoRow, PpmOutside, ProportionInterval, RuleSet, RuleViolation };

/** How the yield figures can be broken down. */
export const BREAKDOWN_DIMENSIONS = ['lot', 'product', 'station', 'fixture', 'operator', 'day', 'shift'] as const;
export type BreakdownDimension = (typeof BREAKDOWN_DIMENSIONS)[number];

/** What the failure Pareto counts by. */
export const PARETO_DIMENSIONS = ['step', 'quantity'] as const;
export type ParetoDimension = (typeof PARETO_DIMENSIONS)[number];

/** What the yield endpoints answer. Proportions are 0..1; the screen shows them as percent. */

export interface YieldGroup {
  /** the group's id (lot, station ... id), the day YYYY-MM-DD, or the shift number */
  key: string;
  label: string;
  unitsTested: number;
  firstPass: ProportionInterval;
  final: ProportionInterval;
}

export interface RtyStep {
  stepKey: string;
  stepName: string;
  entered: number;
  passedFirstTime: number;
  firstPass: ProportionInterval;
}

export interface YieldFiguresView {
  by: BreakdownDimension;
  overall: YieldGroup;
  /** rolled throughput yield over the plan steps (first judged runs); null when any step has no units */
  rty: { value: number | null; normalizedYield: number | null; steps: RtyStep[]; note: string };
  breakdown: YieldGroup[];
  /** one entry per day with tested units, oldest first */
  trend: YieldGroup[];
  definitions: { firstPass: string; final: string; rty: string; interval: string };
}

export interface ParetoBar extends ParetoRow {
  label: string;
}

export interface ParetoView {
  by: ParetoDimension;
  /** failing runs in the filter */
  failedRuns: number;
  bars: ParetoBar[];
}

export interface ParetoUnit {
  serial: string;
  runId: number;
  attempt: number;
  startedAt: string;
  stepName: string;
  /** quantity key within the step */
  quantity: string;
  quantityName: string;
  value: number | null;
  unit: string;
  lowLimit: number | null;
  highLimit: number | null;
  guardedLow: number | null;
  guardedHigh: number | null;
  verdict: 'fail' | 'guard_fail';
}

export interface ParetoUnitsView {
  key: string;
  label: string;
  /** the rows listed (newest first), at most `limit` */
  units: ParetoUnit[];
  total: number;
  limit: number;
}

export interface QuantityChoice {
  step: string;
  stepName: string;
  quantity: string;
  name: string;
  unit: string;
}

export interface QuantityLimits {
  lowLimit: number | null;
  highLimit: number | null;
  guardedLow: number | null;
  guardedHigh: number | null;
}

export interface CapabilityView {
  step: string;
  quantity: string;
  name: string;
  stepName: string;
  unit: string;
  n: number;
  /** the latest limits in force; `limitSets` > 1 means the limits changed inside the selection */
  limits: QuantityLimits;
  limitSets: number;
  histogram: Histogram | null;
  /** null when the figures cannot be computed; `problem` says why */
  capability: CapabilityReport | null;
  /** Anderson–Darling p-value (normality), null below 8 values */
  normalityPValue: number | null;
  problem: string | null;
}

export interface ChartPoint {
  /** 0-based position on the chart */
  index: number;
  value: number;
  /** who it is: a serial, or "first … last" serials of a subgroup */
  label: string;
  runIds: number[];
}

export interface ChartPanel {
  centre: number;
  upper: number;
  lower: number;
  points: ChartPoint[];
}

export interface ControlChartView {
  step: string;
  quantity: string;
  name: string;
  unit: string;
  kind: 'individuals-moving-range' | 'xbar-r' | null;
  subgroupSize: number;
  rules: RuleSet;
  /** values used (a trailing incomplete subgroup is left out) */
  n: number;
  location: ChartPanel | null;
  spread: (ChartPanel & { signals: { index: number; message: string }[] }) | null;
  violations: RuleViolation[];
  problem: string | null;
}
