import cdf from '@stdlib/stats-base-dists-normal-cdf';
import { describe, expect, it } from 'vitest';
import { evaluateRunRules, type RuleId, type RuleViolation } from './run-rules';

// Series are in σ units around a centre of 0 (self-constructed examples built from the rule wording of the
// Western Electric Statistical Quality Control Handbook, 1956, and Nelson, J. Quality Technology 16(4), 1984).
const we = (xs: number[]) => evaluateRunRules(xs, 0, 1, 'western-electric');
const nelson = (xs: number[]) => evaluateRunRules(xs, 0, 1, 'nelson');
const at = (vs: RuleViolation[], rule: RuleId) => vs.filter((v) => v.rule === rule).map((v) => v.index);

describe('Western Electric rules', () => {
  it('WE1: beyond 3σ, strictly', () => {
    const v = we([0, 0.5, 3.2, -0.1, -3.01, 3.0]);
    expect(at(v, 'WE1')).toEqual([2, 4]);
    expect(v.find((x) => x.index === 2)?.message).toBe('point 3 is more than 3 σ above the centre line');
    expect(v.find((x) => x.index === 4)?.message).toBe('point 5 is more than 3 σ below the centre line');
  });

  it('WE2: 2 of 3 beyond 2σ on the same side', () => {
    expect(at(we([0, 2.1, 0.3, 2.5]), 'WE2')).toEqual([3]);
    const first = we([2.1, 2.2, 0, 0]);
    expect(at(first, 'WE2')).toEqual([1 + 1]);
    expect(first.find((x) => x.rule === 'WE2')?.indices).toEqual([0, 1]);
    expect(at(we([2.1, -2.1, 0.5, 0]), 'WE2')).toEqual([]);
    expect(at(we([2.0, 2.0, 0]), 'WE2')).toEqual([]); // on the 2σ line is not beyond it
    expect(we([0, 2.1, 0.3, 2.5]).find((x) => x.rule === 'WE2')?.message).toBe(
      '2 of the 3 points 2–4 are more than 2 σ above the centre line',
    );
  });

  it('WE3: 4 of 5 beyond 1σ on the same side', () => {
    const v = we([1.1, 1.2, 0, 1.3, 1.5]);
    expect(at(v, 'WE3')).toEqual([4]);
    expect(v.find((x) => x.rule === 'WE3')?.indices).toEqual([0, 1, 3, 4]);
    expect(at(we([1.1, 1.2, 0, 1.3, 0]), 'WE3')).toEqual([]);
    expect(at(we([-1.1, -1.2, -1.3, 0.2, -1.4]), 'WE3')).toEqual([4]);
  });

  it('WE4: 8 in a row on one side; a point on the centre line breaks the run', () => {
    expect(at(we(Array(8).fill(0.1)), 'WE4')).toEqual([7]);
    // a longer run is one finding that covers the whole run
    const nine = we(Array(9).fill(-0.1)).filter((x) => x.rule === 'WE4');
    expect(nine).toHaveLength(1);
    expect(nine[0]).toMatchObject({ index: 7, indices: [0, 1, 2, 3, 4, 5, 6, 7, 8] });
    expect(nine[0].message).toBe('points 1–9 (9 in a row) all lie below the centre line');
    expect(at(we([0.1, 0.1, 0.1, 0, 0.1, 0.1, 0.1, 0.1, 0.1]), 'WE4')).toEqual([]);
    expect(we(Array(8).fill(0.1)).find((x) => x.rule === 'WE4')?.message).toBe(
      'points 1–8 (8 in a row) all lie above the centre line',
    );
  });
});

describe('Nelson rules', () => {
  it('N1 and N2: beyond 3σ; 9 in a row on one side', () => {
    expect(at(nelson([4, 0, -4]), 'N1')).toEqual([0, 2]);
    expect(at(nelson(Array(9).fill(0.2)), 'N2')).toEqual([8]);
    expect(at(nelson(Array(8).fill(0.2)), 'N2')).toEqual([]);
  });

  it('N3: 6 points steadily rising or falling; a repeat breaks the trend', () => {
    expect(at(nelson([0, 0.1, 0.2, 0.3, 0.4, 0.5]), 'N3')).toEqual([5]);
    expect(at(nelson([0, 0.1, 0.2, 0.3, 0.4]), 'N3')).toEqual([]);
    expect(at(nelson([0, 0.1, 0.2, 0.2, 0.3, 0.4, 0.5]), 'N3')).toEqual([]);
    const down = nelson([0.5, 0.4, 0.3, 0.2, 0.1, 0]);
    expect(down.find((x) => x.rule === 'N3')?.message).toBe('points 1–6 (6 in a row) fall steadily');
  });

  it('N4: 14 points alternating up and down', () => {
    const zigzag = Array.from({ length: 14 }, (_, i) => (i % 2 ? 0.3 : -0.3));
    expect(at(nelson(zigzag), 'N4')).toEqual([13]);
    expect(at(nelson(zigzag.slice(0, 13)), 'N4')).toEqual([]);
    expect(nelson(zigzag).find((x) => x.rule === 'N4')?.message).toBe('points 1–14 (14 in a row) alternate up and down');
  });

  it('N5 and N6 are the 2-of-3 and 4-of-5 zone rules', () => {
    expect(at(nelson([0, 2.1, 0.3, 2.5]), 'N5')).toEqual([3]);
    expect(at(nelson([1.1, 1.2, 0, 1.3, 1.5]), 'N6')).toEqual([4]);
  });

  it('N7: 15 in a row within 1σ', () => {
    const hugging = Array.from({ length: 15 }, (_, i) => [0.1, 0.2, -0.1, -0.2][i % 4]);
    const v = nelson(hugging);
    expect(at(v, 'N7')).toEqual([14]);
    expect(v.find((x) => x.rule === 'N7')?.message).toContain('all lie within 1 σ of the centre line');
    expect(at(nelson(hugging.slice(0, 14)), 'N7')).toEqual([]);
  });

  it('N8: 8 in a row beyond 1σ, on both sides', () => {
    const mixture = [1.5, 1.6, -1.5, -1.6, 1.7, 1.2, -1.2, -1.3];
    expect(at(nelson(mixture), 'N8')).toEqual([7]);
    expect(at(nelson(Array(8).fill(1.5)), 'N8')).toEqual([]);
  });
});

describe('in-control signal rates agree with the normal model', () => {
  // Monte Carlo: 1,000,000 independent N(0, 1) points (seeded Mulberry32 + Box–Muller). The per-point
  // probability of each signal follows from the rule wording; Φ from @stdlib normal cdf as the reference.
  // A window one point too short or too long, or a non-strict zone test, moves a rate far outside the tolerance.
  let seed = 20261202;
  const uniform = () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  const N = 1_000_000;
  const z = Array.from({ length: N }, () => Math.sqrt(-2 * Math.log(1 - uniform())) * Math.cos(2 * Math.PI * uniform()));
  const weCounts = new Map<string, number>();
  const nCounts = new Map<string, number>();
  // a run finding stands for every point at which its window met the rule: run length − window length + 1
  const windowOf: Partial<Record<RuleId, number>> = { WE4: 8, N2: 9, N3: 6, N4: 14, N7: 15, N8: 8 };
  const tally = (counts: Map<string, number>, v: RuleViolation) => {
    const w = windowOf[v.rule];
    counts.set(v.rule, (counts.get(v.rule) ?? 0) + (w === undefined ? 1 : v.indices.length - w + 1));
  };
  for (const v of evaluateRunRules(z, 0, 1, 'western-electric')) tally(weCounts, v);
  for (const v of evaluateRunRules(z, 0, 1, 'nelson')) tally(nCounts, v);
  const p3 = cdf(-3, 0, 1);
  const p2 = cdf(-2, 0, 1);
  const p1 = cdf(-1, 0, 1);
  const inside1 = 1 - 2 * p1;
  const expected: Array<[Map<string, number>, RuleId, number, number]> = [
    [weCounts, 'WE1', 2 * p3, 0.1],
    [weCounts, 'WE2', 2 * p2 * (1 - (1 - p2) ** 2), 0.1],
    [weCounts, 'WE3', 2 * p1 * (4 * p1 ** 3 * (1 - p1) + p1 ** 4), 0.1],
    [weCounts, 'WE4', 2 * 0.5 ** 8, 0.1],
    [nCounts, 'N2', 2 * 0.5 ** 9, 0.12],
    [nCounts, 'N3', 2 / 720, 0.12],
    [nCounts, 'N7', inside1 ** 15, 0.2],
    [nCounts, 'N8', (2 * p1) ** 8 - 2 * p1 ** 8, 0.25],
  ];
  for (const [counts, rule, perPoint, tol] of expected) {
    it(`${rule}: about ${(perPoint * 1e3).toFixed(3)} signals per 1000 points`, () => {
      const rate = (counts.get(rule) ?? 0) / N;
      expect(Math.abs(rate - perPoint) / perPoint).toBeLessThan(tol);
    });
  }
  it('WE1 alone: average run length about 370 points', () => {
    // 1/(2Φ(−3)) = 370.4, the in-control ARL quoted for 3σ limits (Montgomery ISQC ch. 6)
    expect(N / (weCounts.get('WE1') ?? 1)).toBeGreaterThan(340);
    expect(N / (weCounts.get('WE1') ?? 1)).toBeLessThan(400);
  });
});

describe('input checks', () => {
  it('refuses a negative sigma or an unknown rule set, and evaluates nothing without spread', () => {
    expect(() => evaluateRunRules([1, 2], 0, -1, 'nelson')).toThrow(/0 or more/);
    expect(() => evaluateRunRules([1, 2], 0, 1, 'acme' as never)).toThrow(/unknown rule set/);
    expect(evaluateRunRules([1, 1, 1], 1, 0, 'nelson')).toEqual([]);
    expect(evaluateRunRules([], 0, 1, 'western-electric')).toEqual([]);
  });
});
