import { capability, type SpecLimits } from '../stats/capability';
import { individualsChart } from '../stats/control-chart';
import type { RuleSet } from '../stats/run-rules';

/*
 * The judgement of each hold rule on plain data: no Nest, no database. rule-data.ts fetches the data, the
 * evaluator service acts on a finding. A rule whose window is not yet full is not judged (returns null): a
 * lot is never held on fewer units than the rule names.
 */

export type JudgedVerdict = 'pass' | 'fail';

/** A tripped rule: the words the station shows and the figures behind them. */
export interface RuleFinding {
  reason: string;
  figures: Record<string, unknown>;
}

/** Numbers in reasons: no trailing zeros for thresholds a person typed ("92 %", "1.33"). */
export function plainNumber(x: number, maxDecimals = 2): string {
  return String(Number(x.toFixed(maxDecimals)));
}

/**
 * FPY rule: the first judged verdict of each of the latest units (oldest first); trips when the share that
 * passed the first time over the last `windowUnits` is below `minFpyPct` (strictly).
 */
export function judgeFpy(firstVerdicts: readonly JudgedVerdict[], windowUnits: number, minFpyPct: number): RuleFinding | null {
  if (firstVerdicts.length < windowUnits) return null;
  const window = firstVerdicts.slice(-windowUnits);
  const passed = window.filter((v) => v === 'pass').length;
  const fpyPct = (100 * passed) / windowUnits;
  if (!(fpyPct < minFpyPct)) return null;
  return {
    reason: `First-pass yield of the last ${windowUnits} units ${fpyPct.toFixed(1)} % (below ${plainNumber(minFpyPct)} %)`,
    figures: { units: windowUnits, passedFirstTime: passed, fpyPct, minFpyPct },
  };
}

export interface QuantityLabel {
  /** e.g. "Output voltage at no load" */
  name: string;
  unit: string;
}

/**
 * Cpk rule: the latest values of one quantity (oldest first) and its specification limits; trips when Cpk
 * (within σ from the moving range, stats/capability.ts) over the last `windowUnits` is below `minCpk`.
 * Values that do not vary at all have no Cpk; they do not trip the rule.
 */
export function judgeCpk(values: readonly number[], limits: SpecLimits, windowUnits: number, minCpk: number, label: QuantityLabel): RuleFinding | null {
  if (values.length < windowUnits || (limits.lsl === undefined && limits.usl === undefined)) return null;
  const window = values.slice(-windowUnits);
  if (window.every((v) => v === window[0])) return null;
  const report = capability(window, limits);
  const cpk = report.cpk.value;
  if (!(cpk < minCpk)) return null;
  return {
    reason: `Cpk of ${label.name} over the last ${windowUnits} tests ${cpk.toFixed(2)} (below ${plainNumber(minCpk)})`,
    figures: { tests: windowUnits, cpk, minCpk, mean: report.mean, sigmaWithin: report.sigmaWithin, lsl: limits.lsl ?? null, usl: limits.usl ?? null, unit: label.unit },
  };
}

/**
 * Run-rule rule: the individuals chart (stats/control-chart.ts, limits from the window itself) of the last
 * `windowUnits` values; trips on any violation of the rule set. The most recent violation is reported.
 */
export function judgeRunRules(values: readonly number[], windowUnits: number, ruleSet: RuleSet, label: QuantityLabel): RuleFinding | null {
  if (values.length < windowUnits) return null;
  const window = values.slice(-windowUnits);
  const chart = individualsChart(window, ruleSet);
  const violations = chart.individuals.violations;
  if (violations.length === 0) return null;
  const latest = violations.reduce((a, b) => (b.index >= a.index ? b : a));
  return {
    reason: `Control-chart signal on ${label.name} over the last ${windowUnits} tests: ${latest.rule}, ${latest.message}`,
    figures: {
      tests: windowUnits,
      ruleSet,
      rule: latest.rule,
      message: latest.message,
      violations: violations.length,
      centre: chart.individuals.centre,
      upper: chart.individuals.upper,
      lower: chart.individuals.lower,
      unit: label.unit,
    },
  };
}

/**
 * Consecutive-failure rule: the judged verdicts at one station (oldest first); trips when the last
 * `failuresInRow` are all failures.
 */
export function judgeConsecutiveFailures(verdicts: readonly JudgedVerdict[], failuresInRow: number, stationCode: string): RuleFinding | null {
  if (verdicts.length < failuresInRow) return null;
  if (!verdicts.slice(-failuresInRow).every((v) => v === 'fail')) return null;
  return {
    reason: `${failuresInRow} failed tests in a row at station ${stationCode}`,
    figures: { failuresInRow, stationCode },
  };
}
