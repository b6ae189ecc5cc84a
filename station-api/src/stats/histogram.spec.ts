import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { freedmanDiaconisWidth, histogram, quantile, quantileOfSorted, sortedSample, sturgesBinCount } from './histogram';

// Self-constructed example: 25 output-voltage readings (V).
const VALUES = [
  5.012, 4.998, 5.005, 5.021, 4.994, 5.003, 5.017, 4.989, 5.008, 5.011, 5.026, 5.009, 5.015, 4.997, 5.019, 4.991,
  5.004, 5.013, 5.0, 4.986, 5.01, 5.024, 5.002, 5.016, 5.007,
];

describe('quantile (Hyndman & Fan definition 7)', () => {
  it('agrees with jStat.percentile', () => {
    // jStat.percentile (linear interpolation between order statistics) as reference
    for (const p of [0, 0.1, 0.25, 0.5, 0.75, 0.9, 1]) expect(quantile(VALUES, p)).toBeCloseTo(jStat.percentile(VALUES, p), 12);
  });

  it('gives the quartiles NumPy gives', () => {
    // NumPy 2 np.percentile(VALUES, [25, 75]) = [5.0, 5.015], computed by the author
    expect(quantile(VALUES, 0.25)).toBeCloseTo(5.0, 12);
    expect(quantile(VALUES, 0.75)).toBeCloseTo(5.015, 12);
  });
});

describe('one shared sort (issue 12 speed)', () => {
  // self-constructed example: 10,001 values in production order, not sorted, with ties and a negative zero
  const many = Array.from({ length: 10_001 }, (_, i) => (i === 7 ? -0 : Math.round(1000 * Math.sin(i * 12.9898)) / 100));

  it('quantileOfSorted on sortedSample agrees with jStat.percentile and with quantile', () => {
    // jStat.percentile (linear interpolation between order statistics) as reference
    const s = sortedSample(many);
    for (const p of [0, 0.01, 0.25, 0.5, 0.75, 0.99, 1]) {
      expect(quantileOfSorted(s, p)).toBeCloseTo(jStat.percentile(many, p), 12);
      expect(quantileOfSorted(s, p)).toBe(quantile(many, p));
    }
  });

  it('gives the same histogram with a shared sorted copy as without, and refuses a copy of other values', () => {
    const include = [-12, 12];
    expect(histogram(many, { include, sorted: sortedSample(many) })).toEqual(histogram(many, { include }));
    const h = histogram(many, { include });
    expect(h.counts.reduce((a, b) => a + b, 0)).toBe(many.length);
    expect(() => histogram(many, { sorted: sortedSample(many.slice(1)) })).toThrow(RangeError);
  });
});

describe('bin rules', () => {
  it('Sturges: ⌈log₂ n⌉ + 1', () => {
    // Sturges (1926): 25 values → 6 bins; NumPy histogram_bin_edges(VALUES, 'sturges') also gives 6
    expect(sturgesBinCount(25)).toBe(6);
    expect(sturgesBinCount(1)).toBe(1);
    expect(sturgesBinCount(1024)).toBe(11);
  });

  it('Freedman–Diaconis: 2·IQR·n^(−1/3)', () => {
    // IQR from jStat.percentile (the same quantile definition) as reference; the bins against NumPy:
    // histogram_bin_edges(VALUES, 'fd') has 4 bins over 4.986…5.026 (author-computed)
    const iqr = jStat.percentile(VALUES, 0.75) - jStat.percentile(VALUES, 0.25);
    expect(freedmanDiaconisWidth(VALUES)).toBeCloseTo((2 * iqr) / Math.cbrt(25), 12);
    const h = histogram(VALUES);
    expect(h.rule).toBe('freedman-diaconis');
    expect(h.edges).toHaveLength(5);
    expect(h.edges[0]).toBe(4.986);
    expect(h.edges[4]).toBe(5.026);
    expect(h.counts).toEqual([4, 7, 8, 6]); // NumPy np.histogram with the same edges
  });

  it('Sturges histogram matches NumPy', () => {
    // NumPy np.histogram(VALUES, 'sturges') counts [3, 3, 5, 6, 5, 3], author-computed
    expect(histogram(VALUES, { rule: 'sturges' }).counts).toEqual([3, 3, 5, 6, 5, 3]);
  });
});

describe('histogram range', () => {
  it('widens to include the spec limits, keeping every value counted', () => {
    // NumPy np.histogram(VALUES, np.linspace(4.95, 5.05, 11)) = [0, 0, 0, 2, 4, 8, 8, 3, 0, 0], author-computed
    const h = histogram(VALUES, { include: [4.95, 5.05] });
    expect(h.edges[0]).toBe(4.95);
    expect(h.edges[h.edges.length - 1]).toBe(5.05);
    expect(h.counts).toEqual([0, 0, 0, 2, 4, 8, 8, 3, 0, 0]);
    expect(h.counts.reduce((a, b) => a + b, 0)).toBe(VALUES.length);
  });

  it('caps the number of bins and copes with a single distinct value', () => {
    const h = histogram([...VALUES, 1000], { maxBins: 50 });
    expect(h.counts).toHaveLength(50);
    expect(h.counts.reduce((a, b) => a + b, 0)).toBe(26);
    const one = histogram([3, 3, 3]);
    expect(one.rule).toBe('sturges');
    expect(one.counts.reduce((a, b) => a + b, 0)).toBe(3);
    expect(one.edges[0]).toBe(2.5);
  });

  it('refuses bad input', () => {
    expect(() => histogram([])).toThrow(/at least 1/);
    expect(() => histogram([1, 2], { include: [Number.NaN] })).toThrow(/include\[0\]/);
    expect(() => histogram([1, 2], { rule: 'scott' as never })).toThrow(/unknown bin rule/);
    expect(() => quantile([1, 2], 2)).toThrow(/between 0 and 1/);
  });
});
