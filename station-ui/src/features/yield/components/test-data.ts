import type { CapabilityView } from '../api/get-capability';
import type { ControlChartView } from '../api/get-control-chart';
import type { ParetoView } from '../api/get-failure-pareto';
import type { ParetoUnitsView } from '../api/get-pareto-units';
import type { YieldFiguresView, YieldGroup } from '../api/get-yield-figures';

const wilson = (x: number, n: number, lower: number, upper: number) => ({ x, n, estimate: n ? x / n : null, lower, upper, confidence: 0.95, method: 'Wilson score' as const });

export const group = (key: string, label: string, x: number, n: number, fx: number): YieldGroup => ({
  key,
  label,
  unitsTested: n,
  firstPass: wilson(x, n, 0.2, 0.9),
  final: wilson(fx, n, 0.3, 0.95),
});

export const figures: YieldFiguresView = {
  by: 'lot',
  overall: { key: 'all', label: 'All', unitsTested: 200, firstPass: wilson(184, 200, 0.872, 0.951), final: wilson(196, 200, 0.95, 0.992) },
  rty: { value: 0.9, normalizedYield: 0.98, steps: [{ stepKey: 'ripple', stepName: 'Output ripple', entered: 200, passedFirstTime: 190, firstPass: wilson(190, 200, 0.91, 0.97) }], note: 'No interval for RTY itself.' },
  breakdown: [group('2', 'LB-2645-01', 90, 100, 98), group('1', 'LB-2644-01', 94, 100, 98)],
  trend: [group('2026-10-05', '2026-10-05', 90, 100, 98)],
  definitions: { firstPass: '', final: '', rty: '', interval: '95 % Wilson score interval' },
};

export const pareto: ParetoView = {
  by: 'step',
  failedRuns: 12,
  bars: [
    { key: 'ripple', label: 'Output ripple', count: 8, percent: 66.7, cumulativeCount: 8, cumulativePercent: 66.7 },
    { key: 'vout-no-load', label: 'Output voltage at no load', count: 4, percent: 33.3, cumulativeCount: 12, cumulativePercent: 100 },
  ],
};

export const paretoUnits: ParetoUnitsView = {
  key: 'ripple',
  label: 'Output ripple',
  total: 1,
  limit: 500,
  units: [
    { serial: 'K5A-2644-00017', runId: 321, attempt: 1, startedAt: '2026-10-05T08:00:00Z', stepName: 'Output ripple', quantity: 'rippleMvPp', quantityName: 'Ripple peak-to-peak', value: 41.2, unit: 'mV', lowLimit: null, highLimit: 30, guardedLow: null, guardedHigh: null, verdict: 'fail' },
  ],
};

export const capabilityView: CapabilityView = {
  step: 'vout-no-load',
  quantity: 'voutV',
  name: 'Output voltage, no load',
  stepName: 'Output voltage at no load',
  unit: 'V',
  n: 50,
  limits: { lowLimit: 4.875, highLimit: 5.125, guardedLow: 4.885, guardedHigh: 5.115 },
  limitSets: 1,
  histogram: { edges: [4.87, 4.95, 5.03, 5.13], counts: [5, 40, 5], binWidth: 0.08, rule: 'freedman-diaconis' },
  capability: {
    n: 50,
    mean: 5.001,
    sigmaWithin: 0.02,
    sigmaOverall: 0.021,
    cp: { value: 2.08, lower: 1.67, upper: 2.49, confidence: 0.95, method: 'chi-square' },
    cpk: { value: 2.07, lower: 1.63, upper: 2.5, confidence: 0.95, method: 'Bissell normal approximation' },
    pp: { value: 1.98, lower: 1.59, upper: 2.37, confidence: 0.95, method: 'chi-square' },
    ppk: { value: 1.97, lower: 1.55, upper: 2.39, confidence: 0.95, method: 'Bissell normal approximation' },
    cpu: 2.07,
    cpl: 2.09,
    ppu: 1.97,
    ppl: 1.99,
    ppmWithin: { below: 0.0001, above: 0.0002, total: 0.0003 },
    ppmOverall: { below: 0.001, above: 0.002, total: 0.003 },
  },
  normalityPValue: 0.41,
  problem: null,
};

export const controlChart: ControlChartView = {
  step: 'vout-no-load',
  quantity: 'voutV',
  name: 'Output voltage, no load',
  unit: 'V',
  kind: 'individuals-moving-range',
  subgroupSize: 1,
  rules: 'western-electric',
  n: 3,
  location: { centre: 5, upper: 5.06, lower: 4.94, points: [{ index: 0, value: 5, label: 'K5A-1', runIds: [1] }, { index: 1, value: 5.01, label: 'K5A-2', runIds: [2] }, { index: 2, value: 5.2, label: 'K5A-3', runIds: [3] }] },
  spread: { centre: 0.02, upper: 0.065, lower: 0, points: [{ index: 1, value: 0.01, label: 'K5A-1 → K5A-2', runIds: [1, 2] }], signals: [] },
  violations: [{ rule: 'WE1', index: 2, indices: [2], message: 'point 3 is more than 3 σ above the centre line' }],
  problem: null,
};
