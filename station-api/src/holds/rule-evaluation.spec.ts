import { describe, expect, it } from 'vitest';
import { judgeConsecutiveFailures, judgeCpk, judgeFpy, judgeRunRules, plainNumber } from './rule-evaluation';

const P = 'pass' as const;
const F = 'fail' as const;
const vout = { name: 'Output voltage at no load', unit: 'V' };

describe('FPY rule', () => {
  it('trips below the threshold over the last N units only (self-constructed example)', () => {
    // self-constructed example: 10 units, the first 2 failed, the last 10 of 12 hold 2 failures → 8/10 = 80 %
    const verdicts = [F, F, P, P, P, P, F, P, P, P, F, P];
    const f = judgeFpy(verdicts, 10, 92);
    expect(f?.reason).toBe('First-pass yield of the last 10 units 80.0 % (below 92 %)');
    expect(f?.figures).toMatchObject({ units: 10, passedFirstTime: 8, fpyPct: 80 });
  });

  it('does not trip at exactly the threshold (below means strictly below; self-constructed example)', () => {
    // 9 of 10 = 90 %, threshold 90 %
    expect(judgeFpy([P, P, P, P, F, P, P, P, P, P], 10, 90)).toBeNull();
    expect(judgeFpy([P, P, P, P, F, P, P, P, P, P], 10, 90.5)).not.toBeNull();
  });

  it('waits until the window is full', () => {
    expect(judgeFpy([F, F, F], 5, 99)).toBeNull();
  });
});

describe('Cpk rule', () => {
  it('trips with Cpk from the moving-range σ (self-constructed example)', () => {
    // self-constructed example: 2, 3, 2, 3, 2, 3 in limits 0 … 6. Mean 2.5; every moving range is 1, so
    // σ̂ = MR̄/d2 = 1/1.128 (d2 for n = 2: Montgomery, Introduction to SQC, Appendix Table VI) = 0.88652;
    // Cpk = min(6 − 2.5, 2.5 − 0) / (3σ̂) = 2.5 / 2.65957 = 0.9400
    const f = judgeCpk([5, 2, 3, 2, 3, 2, 3], { lsl: 0, usl: 6 }, 6, 1.33, vout);
    expect(f).not.toBeNull();
    expect(f!.figures.cpk as number).toBeCloseTo(0.94, 4);
    expect(f!.reason).toBe('Cpk of Output voltage at no load over the last 6 tests 0.94 (below 1.33)');
  });

  it('does not trip when Cpk is at or above the threshold, or the window is not full (self-constructed example)', () => {
    // same data, Cpk 0.94 ≥ 0.9
    expect(judgeCpk([2, 3, 2, 3, 2, 3], { lsl: 0, usl: 6 }, 6, 0.9, vout)).toBeNull();
    expect(judgeCpk([2, 3, 2], { lsl: 0, usl: 6 }, 6, 1.33, vout)).toBeNull();
  });

  it('handles a one-sided limit (self-constructed example)', () => {
    // upper limit only: Cpk = (6 − 2.5) / 2.65957 = 1.3160
    const f = judgeCpk([2, 3, 2, 3, 2, 3], { usl: 6 }, 6, 1.33, vout);
    expect(f!.figures.cpk as number).toBeCloseTo(1.316, 3);
  });

  it('does not judge values that do not vary (no σ, no Cpk)', () => {
    expect(judgeCpk([3, 3, 3, 3], { lsl: 0, usl: 6 }, 4, 1.33, vout)).toBeNull();
  });
});

describe('run-rule rule', () => {
  it('trips on a point beyond 3 σ and reports the latest violation (self-constructed example)', () => {
    // self-constructed example: nine values of 10 then 30. Centre 12; MR̄ = 20/9, σ̂ = MR̄/1.128 = 1.970;
    // 30 lies (30 − 12)/1.970 = 9.1 σ above the centre (WE1, at the last point); the earlier points, 1.02 σ below
    // the centre, meet WE3 and WE4 before it, so WE1 is the latest finding
    const values = [10, 10, 10, 10, 10, 10, 10, 10, 10, 30];
    const f = judgeRunRules(values, 10, 'western-electric', vout);
    expect(f!.figures).toMatchObject({ rule: 'WE1' });
    expect(f!.reason).toBe('Control-chart signal on Output voltage at no load over the last 10 tests: WE1, point 10 is more than 3 σ above the centre line');
  });

  it('stays quiet on a stable series (self-constructed example)', () => {
    // alternating 10, 11: every point 0.56 σ from the centre, on alternating sides → no Western Electric rule met
    expect(judgeRunRules([10, 11, 10, 11, 10, 11, 10, 11, 10, 11], 10, 'western-electric', vout)).toBeNull();
  });

  it('waits until the window is full', () => {
    expect(judgeRunRules([10, 30], 10, 'western-electric', vout)).toBeNull();
  });
});

describe('consecutive-failure rule', () => {
  it('trips when the last K tests at the station failed (self-constructed example)', () => {
    expect(judgeConsecutiveFailures([P, F, F, F], 3, 'EOL-1')?.reason).toBe('3 failed tests in a row at station EOL-1');
    expect(judgeConsecutiveFailures([F, F, P, F, F], 3, 'EOL-1')).toBeNull();
    expect(judgeConsecutiveFailures([F, F], 3, 'EOL-1')).toBeNull();
  });
});

describe('plainNumber', () => {
  it('drops trailing zeros', () => {
    expect(plainNumber(92)).toBe('92');
    expect(plainNumber(1.3)).toBe('1.3');
    expect(plainNumber(99.55)).toBe('99.55');
  });
});
