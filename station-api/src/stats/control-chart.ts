import { requireFiniteArray } from '../measure/guards';
import { chartConstants, MAX_SUBGROUP_SIZE, MIN_SUBGROUP_SIZE } from './chart-constants';
import { evaluateRunRules, type RuleSet, type RuleViolation } from './run-rules';

/**
 * Shewhart control charts for a measured quantity over consecutive units:
 * - individuals and moving range (I-MR), for one value per unit;
 * - X̄ and R, for subgroups of n = 2..10 consecutive units.
 *
 * Formulas as in the NIST/SEMATECH e-Handbook §6.3.2 (Shewhart X̄/R and individuals charts) and Montgomery,
 * Introduction to Statistical Quality Control, ch. 6; constants from `chart-constants.ts`.
 * Limits are "3-sigma" limits: centre ± 3·σ̂ of the plotted statistic, σ̂ estimated from the ranges (short-term
 * variation), never from the overall standard deviation, so a drifting process does not widen its own limits.
 * All values keep the unit of the input data.
 */

export interface ChartLimits {
  centre: number;
  upper: number;
  /** lower control limit; 0 for a range chart whose D3 is 0 */
  lower: number;
}

export interface RangeChartSignal {
  index: number;
  message: string;
}

export interface LocationChart extends ChartLimits {
  /** plotted values: the individual values, or the subgroup means */
  points: number[];
  /** σ̂ of one plotted point: a third of the distance from centre to limit (≈ σ̂ for individuals, σ̂/√n for means) */
  sigmaOfPoint: number;
  violations: RuleViolation[];
}

export interface RangeChart extends ChartLimits {
  /** moving ranges (first point has none, so index i here belongs to point i + 1) or subgroup ranges */
  points: number[];
  /** points beyond the range chart's limits */
  signals: RangeChartSignal[];
}

export interface IndividualsChart {
  kind: 'individuals-moving-range';
  individuals: LocationChart;
  movingRange: RangeChart;
  /** σ̂ = MR̄/d2 with d2 = 1.128 (n = 2) */
  sigmaWithin: number;
}

export interface XbarRChart {
  kind: 'xbar-r';
  subgroupSize: number;
  xbar: LocationChart;
  range: RangeChart;
  /** σ̂ = R̄/d2 */
  sigmaWithin: number;
}

const mean = (xs: readonly number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;

function rangeSignals(points: readonly number[], limits: ChartLimits, label: (i: number) => string): RangeChartSignal[] {
  const out: RangeChartSignal[] = [];
  points.forEach((r, i) => {
    // a range chart whose D3 is 0 has no lower limit to fall below
    if (r > limits.upper) out.push({ index: i, message: `${label(i)} is above the upper control limit of the range chart` });
    else if (limits.lower > 0 && r < limits.lower) {
      out.push({ index: i, message: `${label(i)} is below the lower control limit of the range chart` });
    }
  });
  return out;
}

/**
 * Individuals and moving-range chart.
 * Individuals: centre x̄, limits x̄ ± E2·MR̄ (E2 = 3/d2, d2 = 1.128). Moving range: centre MR̄, upper D4·MR̄
 * (D4 = 3.267), lower 0.
 * @param values one measured value per unit, in production order; at least 2
 * @param ruleSet run rules evaluated on the individuals chart (default Western Electric)
 */
export function individualsChart(values: readonly number[], ruleSet: RuleSet = 'western-electric'): IndividualsChart {
  requireFiniteArray('values', values, 2);
  const k = chartConstants(2);
  const mr = values.slice(1).map((v, i) => Math.abs(v - values[i]));
  const mrBar = mean(mr);
  const centre = mean(values);
  const sigmaWithin = mrBar / k.d2;
  const indLimits = { centre, upper: centre + k.E2 * mrBar, lower: centre - k.E2 * mrBar };
  const mrLimits = { centre: mrBar, upper: k.D4 * mrBar, lower: k.D3 * mrBar };
  return {
    kind: 'individuals-moving-range',
    sigmaWithin,
    individuals: {
      ...indLimits,
      points: [...values],
      sigmaOfPoint: sigmaWithin,
      violations: evaluateRunRules(values, centre, sigmaWithin, ruleSet),
    },
    movingRange: {
      ...mrLimits,
      points: mr,
      // moving range i spans points i and i + 1 (0-based), i.e. it ends at point number i + 2
      signals: rangeSignals(mr, mrLimits, (i) => `the moving range between points ${i + 1} and ${i + 2}`),
    },
  };
}

/**
 * X̄ and R chart over subgroups of equal size n (2..10).
 * X̄: centre X̿, limits X̿ ± A2·R̄. R: centre R̄, limits D3·R̄ and D4·R̄.
 * @param subgroups consecutive subgroups, each with n values; at least 2 subgroups
 * @param ruleSet run rules evaluated on the X̄ chart (default Western Electric)
 */
export function xbarRChart(subgroups: readonly (readonly number[])[], ruleSet: RuleSet = 'western-electric'): XbarRChart {
  if (!Array.isArray(subgroups) || subgroups.length < 2) throw new RangeError('an X̄–R chart needs at least 2 subgroups');
  const n = subgroups[0]?.length;
  if (!(n >= MIN_SUBGROUP_SIZE && n <= MAX_SUBGROUP_SIZE)) {
    throw new RangeError(`subgroup size must be from ${MIN_SUBGROUP_SIZE} to ${MAX_SUBGROUP_SIZE} values, got ${String(n)}`);
  }
  subgroups.forEach((g, i) => {
    requireFiniteArray(`subgroups[${i}]`, g, 1);
    if (g.length !== n) {
      throw new RangeError(`subgroup ${i + 1} has ${g.length} values but the first has ${n}; all subgroups need the same size`);
    }
  });
  const k = chartConstants(n);
  const means = subgroups.map(mean);
  const ranges = subgroups.map((g) => Math.max(...g) - Math.min(...g));
  const grand = mean(means);
  const rBar = mean(ranges);
  const sigmaWithin = rBar / k.d2;
  // σ of a plotted mean taken as A2·R̄/3 rather than σ̂/√n: the two differ only by the rounding of the printed
  // A2, and this way the run-rule zones end exactly on the drawn limits (a point beyond UCL is beyond 3σ).
  const sigmaOfPoint = (k.A2 * rBar) / 3;
  const xLimits = { centre: grand, upper: grand + k.A2 * rBar, lower: grand - k.A2 * rBar };
  const rLimits = { centre: rBar, upper: k.D4 * rBar, lower: k.D3 * rBar };
  return {
    kind: 'xbar-r',
    subgroupSize: n,
    sigmaWithin,
    xbar: {
      ...xLimits,
      points: means,
      sigmaOfPoint,
      violations: evaluateRunRules(means, grand, sigmaOfPoint, ruleSet),
    },
    range: {
      ...rLimits,
      points: ranges,
      signals: rangeSignals(ranges, rLimits, (i) => `the range of subgroup ${i + 1}`),
    },
  };
}
