import { jStat } from 'jstat';
import { describe, expect, it } from 'vitest';
import { rolledThroughputYield, wilsonBounds, wilsonInterval, yieldFigures } from './yield';

describe('wilsonInterval', () => {
  it('reproduces the published figures of the npm package wilson-score-interval (z = 1.96)', () => {
    // README of github.com/msn0/wilson-score-interval: wilson(430, 474) → {left: 0.8776750858242243,
    // right: 0.9301239839930541}; wilson(10, 14) → {left: 0.4535045882751561, right: 0.882788120898909}
    const a = wilsonBounds(430, 474, 1.96);
    expect(a.lower).toBeCloseTo(0.8776750858242243, 14);
    expect(a.upper).toBeCloseTo(0.9301239839930541, 14);
    const b = wilsonBounds(10, 14, 1.96);
    expect(b.lower).toBeCloseTo(0.4535045882751561, 14);
    expect(b.upper).toBeCloseTo(0.882788120898909, 14);
  });

  it("matches Newcombe's score-method examples to the 4 printed decimals", () => {
    // Newcombe, Statistics in Medicine 17:857–872 (1998), Table II, method 3 (Wilson score, no continuity
    // correction): 81/263, 15/148, 0/20, 1/29. The figures are recalled from memory, unverified against the printed
    // table; they agree with SciPy 1.17 binomtest(x, n).proportion_ci(method='wilson'), run by the author.
    const cases: Array<[number, number, number, number]> = [
      [81, 263, 0.2553, 0.3662],
      [15, 148, 0.0624, 0.1605],
      [0, 20, 0, 0.1611],
      [1, 29, 0.0061, 0.1718],
    ];
    for (const [x, n, lo, hi] of cases) {
      const w = wilsonInterval(x, n);
      expect(Math.abs(w.lower - lo)).toBeLessThanOrEqual(0.00005);
      expect(Math.abs(w.upper - hi)).toBeLessThanOrEqual(0.00005);
    }
  });

  it('agrees with SciPy for 95 of 100', () => {
    // SciPy 1.17.1 binomtest(95, 100).proportion_ci(method='wilson') = (0.8882495307680809, 0.978456320845632),
    // computed by the author
    const w = wilsonInterval(95, 100);
    expect(w.lower).toBeCloseTo(0.8882495307680809, 13);
    expect(w.upper).toBeCloseTo(0.978456320845632, 13);
    expect(w.estimate).toBe(0.95);
    expect(w.method).toBe('Wilson score');
  });

  it('returns the bounds where the score test just fails to reject, at any level', () => {
    // Wilson (1927): the bounds are the p solving (p̂ − p)² = z²·p(1 − p)/n; z from jStat.normal.inv as reference
    for (const confidence of [0.8, 0.9, 0.95, 0.99]) {
      const z = jStat.normal.inv(1 - (1 - confidence) / 2, 0, 1);
      for (const [x, n] of [[3, 10], [48, 50], [962, 1000], [1, 2]]) {
        const w = wilsonInterval(x, n, confidence);
        for (const p of [w.lower, w.upper]) {
          expect((x / n - p) ** 2).toBeCloseTo((z * z * p * (1 - p)) / n, 12);
        }
      }
    }
  });

  it('handles n = 0, x = 0 and x = n exactly', () => {
    expect(wilsonInterval(0, 0)).toMatchObject({ estimate: null, lower: 0, upper: 1 });
    const none = wilsonInterval(0, 50);
    expect(none.lower).toBe(0);
    expect(none.estimate).toBe(0);
    const all = wilsonInterval(50, 50);
    expect(all.upper).toBe(1);
    expect(all.lower).toBeGreaterThan(0.9);
    expect(all.lower).toBeLessThan(1);
  });

  it('refuses counts a person could not have meant', () => {
    expect(() => wilsonInterval(5, 4)).toThrow(/cannot exceed/);
    expect(() => wilsonInterval(-1, 4)).toThrow(/whole number/);
    expect(() => wilsonInterval(1.5, 4)).toThrow(/whole number/);
    expect(() => wilsonInterval(NaN, 4)).toThrow(/finite/);
    expect(() => wilsonInterval(1, 4, 95)).toThrow(/confidence/);
  });
});

describe('yieldFigures', () => {
  it('computes FPY and final yield with their intervals', () => {
    // self-constructed example: 1000 tested, 962 pass first time, 992 in the end; intervals cross-checked with
    // SciPy 1.17.1 binomtest(962, 1000).proportion_ci(method='wilson') = (0.9482730796686497, 0.9721909954906974)
    const y = yieldFigures({ unitsTested: 1000, passedFirstAttempt: 962, passedFinally: 992 });
    expect(y.firstPass.estimate).toBe(0.962);
    expect(y.final.estimate).toBe(0.992);
    expect(y.firstPass.lower).toBeCloseTo(0.9482730796686497, 13);
    expect(y.firstPass.upper).toBeCloseTo(0.9721909954906974, 13);
  });

  it('refuses a first-pass count above the final count', () => {
    expect(() => yieldFigures({ unitsTested: 10, passedFirstAttempt: 9, passedFinally: 8 })).toThrow(/cannot exceed/);
  });
});

describe('rolledThroughputYield', () => {
  it('multiplies step yields', () => {
    // self-constructed example: step yields 0.98, 0.95, 0.99 → RTY = 0.92169, normalised yield = RTY^(1/3);
    // step b's interval is the SciPy-checked 95/100 interval above
    const r = rolledThroughputYield([
      { step: 'a', entered: 100, passedFirstTime: 98 },
      { step: 'b', entered: 100, passedFirstTime: 95 },
      { step: 'c', entered: 100, passedFirstTime: 99 },
    ]);
    expect(r.rty).toBeCloseTo(0.92169, 14);
    expect(r.normalizedYield).toBeCloseTo(Math.cbrt(0.92169), 14);
    expect(r.steps[1]).toMatchObject({ step: 'b', estimate: 0.95 });
    expect(r.steps[1].lower).toBeCloseTo(0.8882495307680809, 13);
  });

  it('reproduces a published three-step example: RTY 45 %, normalised yield 77 %', () => {
    // "Yield and Defect Metrics" worksheet (public copy on scribd.com): step 1 100 submitted, 15 scrapped, 5 reworked
    // (80 first time); step 2 85 / 10 / 8 (67); step 3 75 / 20 / 1 (54); printed RTY 45 %, normalised yield 77 %
    // (0.8 × 67/85 × 0.72 = 0.454024; 0.454024^(1/3) = 0.768587)
    const r = rolledThroughputYield([
      { step: '1', entered: 100, passedFirstTime: 80 },
      { step: '2', entered: 85, passedFirstTime: 67 },
      { step: '3', entered: 75, passedFirstTime: 54 },
    ]);
    expect(r.rty).toBeCloseTo(0.8 * (67 / 85) * 0.72, 14);
    expect(Math.round((r.rty as number) * 100)).toBe(45);
    expect(Math.round((r.normalizedYield as number) * 100)).toBe(77);
  });

  it('gives null when a step saw no units, and refuses an empty list', () => {
    expect(rolledThroughputYield([{ step: 'a', entered: 0, passedFirstTime: 0 }]).rty).toBeNull();
    expect(() => rolledThroughputYield([])).toThrow(/at least one step/);
  });
});
