import { jStat } from 'jstat';
import { max, mean as ssMean, min } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { individualsChart, xbarRChart } from './control-chart';

// Self-constructed example: output voltage (V), 5 subgroups of 5 in production order.
const SUBGROUPS = [
  [5.012, 4.998, 5.005, 5.021, 4.994],
  [5.003, 5.017, 4.989, 5.008, 5.011],
  [5.026, 5.009, 5.015, 4.997, 5.019],
  [4.991, 5.004, 5.013, 5.0, 4.986],
  [5.01, 5.024, 5.002, 5.016, 5.007],
];
const VALUES = SUBGROUPS.flat();

describe('X̄–R chart (NIST/SEMATECH e-Handbook §6.3.2.1; Montgomery ISQC ch. 6)', () => {
  it('centre X̿ ± A2·R̄ and D3·R̄ … D4·R̄ with the tabled constants for n = 5', () => {
    const c = xbarRChart(SUBGROUPS);
    // simple-statistics mean/min/max as reference for X̿ and R̄; A2(5) = 0.577, D4(5) = 2.114 from Montgomery ISQC
    // Appendix VI (same in Table A.22 of the engineering-statistics tables)
    const grand = ssMean(SUBGROUPS.map((g) => ssMean(g)));
    const rBar = ssMean(SUBGROUPS.map((g) => max(g) - min(g)));
    expect(c.xbar.centre).toBeCloseTo(grand, 12);
    expect(c.range.centre).toBeCloseTo(rBar, 12);
    expect(c.xbar.upper).toBeCloseTo(grand + 0.577 * rBar, 12);
    expect(c.xbar.lower).toBeCloseTo(grand - 0.577 * rBar, 12);
    expect(c.range.upper).toBeCloseTo(2.114 * rBar, 12);
    expect(c.range.lower).toBe(0);
    // recorded figures of this example: CL 5.00708, UCL 5.0224282, LCL 4.9917318, R̄ 0.0266, R UCL 0.0562324
    expect(c.xbar.upper).toBeCloseTo(5.0224282, 7);
    expect(c.xbar.lower).toBeCloseTo(4.9917318, 7);
    expect(c.range.upper).toBeCloseTo(0.0562324, 7);
    // σ of a plotted mean is one third of the distance to the limit, and ≈ σ̂/√n = R̄/(d2·√5)
    expect(c.xbar.sigmaOfPoint * 3).toBeCloseTo(c.xbar.upper - c.xbar.centre, 12);
    expect(Math.abs(c.xbar.sigmaOfPoint - rBar / (2.326 * Math.sqrt(5)))).toBeLessThan(1e-5);
    expect(c.subgroupSize).toBe(5);
    expect(c.xbar.violations).toEqual([]);
    expect(c.range.signals).toEqual([]);
  });

  it('flags a subgroup whose range exceeds D4·R̄, and uses D3 > 0 from n = 7', () => {
    const groups = Array.from({ length: 10 }, (_, i) => [0, 1, 2, 3, 4, 5, i === 9 ? 30 : 6].map((v) => v + i * 0.001));
    const c = xbarRChart(groups);
    expect(c.range.lower).toBeCloseTo(0.076 * c.range.centre, 12); // D3(7) = 0.076, Montgomery Appendix VI
    expect(c.range.signals.map((s) => s.index)).toEqual([9]);
    expect(c.range.signals[0].message).toBe('the range of subgroup 10 is above the upper control limit of the range chart');
  });

  it('refuses unequal, too small or too large subgroups', () => {
    expect(() => xbarRChart([[1, 2], [1, 2, 3]])).toThrow(/same size/);
    expect(() => xbarRChart([[1], [2]])).toThrow(/from 2 to 10/);
    expect(() => xbarRChart([[1, 2]])).toThrow(/at least 2 subgroups/);
    expect(() => xbarRChart([Array(11).fill(1), Array(11).fill(2)])).toThrow(/from 2 to 10/);
  });
});

describe('individuals and moving range chart (NIST/SEMATECH e-Handbook §6.3.2.2; Montgomery ISQC ch. 6)', () => {
  it('centre x̄ ± 3·MR̄/1.128 and MR UCL 3.267·MR̄', () => {
    const c = individualsChart(VALUES);
    const mr = VALUES.slice(1).map((v, i) => Math.abs(v - VALUES[i]));
    // jStat.mean and simple-statistics mean as references for x̄ and MR̄
    const xbar = jStat.mean(VALUES);
    const mrBar = ssMean(mr);
    expect(c.individuals.centre).toBeCloseTo(xbar, 12);
    expect(c.movingRange.centre).toBeCloseTo(mrBar, 12);
    expect(c.individuals.upper).toBeCloseTo(xbar + (3 * mrBar) / 1.128, 12);
    expect(c.individuals.lower).toBeCloseTo(xbar - (3 * mrBar) / 1.128, 12);
    expect(c.movingRange.upper).toBeCloseTo(3.267 * mrBar, 12);
    expect(c.movingRange.lower).toBe(0);
    expect(c.sigmaWithin).toBeCloseTo(mrBar / 1.128, 12);
    // recorded figures of this example: MR̄ = 0.015625; with the textbook multiplier 2.66, UCL 5.0486425
    expect(mrBar).toBeCloseTo(0.015625, 12);
    expect(c.individuals.upper).toBeCloseTo(5.0486425, 4);
    expect(c.movingRange.points).toHaveLength(VALUES.length - 1);
  });

  it('marks a shifted point with the rule in words, and a jump in the moving range', () => {
    const values = [10, 10.2, 9.9, 10.1, 9.8, 10, 10.1, 9.9, 10.2, 10, 13, 10.1, 9.9];
    const c = individualsChart(values);
    const we1 = c.individuals.violations.filter((v) => v.rule === 'WE1');
    expect(we1.map((v) => v.index)).toEqual([10]);
    expect(we1[0].message).toBe('point 11 is more than 3 σ above the centre line');
    expect(c.movingRange.signals.map((s) => s.index)).toEqual([9, 10]);
    expect(c.movingRange.signals[0].message).toBe(
      'the moving range between points 10 and 11 is above the upper control limit of the range chart',
    );
  });

  it('evaluates Nelson rules on request', () => {
    const c = individualsChart([1, 2, 3, 4, 5, 6, 5, 4, 3, 4, 5, 4], 'nelson');
    expect(c.individuals.violations.some((v) => v.rule === 'N3' && v.index === 5)).toBe(true);
  });

  it('refuses fewer than 2 values or values that are not numbers', () => {
    expect(() => individualsChart([1])).toThrow(/at least 2/);
    expect(() => individualsChart([1, Number.NaN])).toThrow(/finite/);
  });
});
