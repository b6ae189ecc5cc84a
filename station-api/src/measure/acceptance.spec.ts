import cdf from '@stdlib/stats-base-dists-normal-cdf';
import { describe, expect, it } from 'vitest';
import { guardedLimits, judge, rdsHalfWidth, tur } from './acceptance';

const close = (actual: number | undefined, expected: number, rel = 1e-12) => {
  expect(actual).toBeDefined();
  expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(Math.abs(expected) * rel);
};

// self-constructed example: V_out = 5.000 ± 0.100 V, meter U = 10 mV (k = 2)
const simple = { low: 4.9, high: 5.1, uncertainty: 0.01, rule: 'simple' as const };
const guarded = { ...simple, rule: 'guarded' as const };

describe('judge, simple acceptance (ILAC-G8:09/2019 §4.2.1)', () => {
  it('passes inside and on the tolerance limit, fails beyond it', () => {
    // simple acceptance on the self-constructed example: 5.080 pass, 5.095 pass, 5.100 pass (on TL), 5.105 fail
    expect(judge(5.08, simple).verdict).toBe('pass');
    expect(judge(5.095, simple).verdict).toBe('pass');
    expect(judge(5.1, simple).verdict).toBe('pass');
    expect(judge(5.105, simple).verdict).toBe('fail');
    expect(judge(4.9, simple).verdict).toBe('pass');
    expect(judge(4.8999, simple).verdict).toBe('fail');
  });

  it('returns no guarded limits', () => {
    const j = judge(5.0, simple);
    expect(j.guardedLow).toBeUndefined();
    expect(j.guardedHigh).toBeUndefined();
  });
});

describe('judge, guarded acceptance w = U', () => {
  it('narrows 4.900/5.100 to 4.910/5.090', () => {
    // ILAC-G8:09/2019 guard band w = U: acceptance limits 4.900 + 0.010 / 5.100 − 0.010 = 4.910 V / 5.090 V
    const j = judge(5.0, guarded);
    close(j.guardedLow, 4.91);
    close(j.guardedHigh, 5.09);
  });

  it('gives the binary verdicts of the worked table', () => {
    // self-constructed example: 5.080 pass; 5.090 pass (on AL); 5.095 fail (guard); 5.100 fail (guard); 5.105 fail
    expect(judge(5.08, guarded).verdict).toBe('pass');
    expect(judge(5.09, guarded).verdict).toBe('pass');
    expect(judge(5.095, guarded).verdict).toBe('guard_fail');
    expect(judge(5.1, guarded).verdict).toBe('guard_fail');
    expect(judge(5.105, guarded).verdict).toBe('fail');
    expect(judge(4.905, guarded).verdict).toBe('guard_fail');
  });

  it('keeps the specific false-accept risk at the acceptance limit below 2.5 %', () => {
    // ILAC-G8:09/2019, binary statement with guard band w = U: false accept < 2.5 %.
    // Reading on AL = 5.090 V, u = U/2 = 5 mV: P(true > 5.100) = 1 − Φ(2) = 0.022750 (@stdlib/stats-base-dists-normal-cdf
    // as reference; jStat.normal.cdf gives the same Φ(2) = 0.977249868051821)
    const j = judge(5.09, guarded);
    const u = guarded.uncertainty / 2;
    const risk = 1 - cdf(guarded.high, j.guardedHigh as number, u);
    close(risk, 1 - 0.977249868051821, 1e-9);
    expect(risk).toBeLessThan(0.025);
    expect(judge(5.09, guarded).verdict).toBe('pass');
  });
});

describe('judge, non-binary statement (ILAC-G8:09/2019 §4.2.3)', () => {
  it('gives Pass / Conditional Pass / Conditional Fail / Fail as in the worked table', () => {
    // ILAC-G8:09/2019 §4.2.3 on the self-constructed example: 5.080 Pass, 5.090 Pass, 5.095 Conditional Pass,
    // 5.100 Conditional Pass, 5.105 Conditional Fail (≤ TL + w = 5.110)
    expect(judge(5.08, guarded).statement).toBe('pass');
    expect(judge(5.09, guarded).statement).toBe('pass');
    expect(judge(5.095, guarded).statement).toBe('conditional_pass');
    expect(judge(5.1, guarded).statement).toBe('conditional_pass');
    expect(judge(5.105, guarded).statement).toBe('conditional_fail');
    expect(judge(5.11, guarded).statement).toBe('conditional_fail');
    expect(judge(5.111, guarded).statement).toBe('fail');
    expect(judge(4.885, guarded).statement).toBe('fail');
  });

  it('is given under the simple rule too, and is binary when U = 0', () => {
    expect(judge(5.095, simple).statement).toBe('conditional_pass');
    const noU = { low: 4.9, high: 5.1, rule: 'simple' as const };
    expect(judge(5.1, noU).statement).toBe('pass');
    expect(judge(5.1000001, noU).statement).toBe('fail');
  });
});

describe('one-sided limits', () => {
  it('judges an upper-only ripple limit with a guard band', () => {
    const ripple = { high: 40, uncertainty: 2, rule: 'guarded' as const };
    const j = judge(39, ripple);
    expect(j.verdict).toBe('guard_fail');
    close(j.guardedHigh, 38);
    expect(j.guardedLow).toBeUndefined();
    expect(judge(10, ripple).verdict).toBe('pass');
  });

  it('judges a lower-only efficiency limit', () => {
    expect(judge(88.4, { low: 88, uncertainty: 0.5, rule: 'guarded' }).verdict).toBe('guard_fail');
    expect(judge(87.9, { low: 88, uncertainty: 0.5, rule: 'simple' }).verdict).toBe('fail');
  });
});

describe('guardedLimits', () => {
  it('gives the w = U limits for the three meter uncertainties', () => {
    // w = U by hand: U 0.010 / 0.025 / 0.050 → 4.910/5.090, 4.925/5.075, 4.950/5.050
    for (const [u, lo, hi] of [
      [0.01, 4.91, 5.09],
      [0.025, 4.925, 5.075],
      [0.05, 4.95, 5.05],
    ]) {
      const g = guardedLimits({ low: 4.9, high: 5.1, uncertainty: u, rule: 'guarded' });
      close(g.low, lo);
      close(g.high, hi);
    }
  });

  it('refuses a guard band that closes the acceptance zone, with a message', () => {
    expect(() => guardedLimits({ low: 4.9, high: 5.1, uncertainty: 0.1, rule: 'guarded' })).toThrow(RangeError);
    expect(() => judge(5.0, { low: 4.9, high: 5.1, uncertainty: 0.12, rule: 'guarded' })).toThrow(/closes the acceptance zone/);
  });

  it('refuses inconsistent limits', () => {
    expect(() => judge(5, { low: 5.1, high: 4.9, rule: 'simple' })).toThrow(/low limit 5.1 is above high limit 4.9/);
    expect(() => judge(5, { rule: 'simple' })).toThrow(/needs a low value/);
    expect(() => judge(5, { low: 4.9, uncertainty: -1, rule: 'simple' })).toThrow(/uncertainty must be 0 or more/);
    expect(() => judge(Number.NaN, simple)).toThrow(/value must be a finite number/);
    expect(() => judge(5, { low: 4.9, rule: 'strict' as never })).toThrow(/unknown decision rule/);
  });
});

describe('tur', () => {
  it('is span / 2U (ANSI/NCSL Z540.3 Handbook definition)', () => {
    // by hand: 0.200/(2·0.010) = 10:1; U = 0.025 → 4:1; U = 0.050 → 2:1
    close(tur(4.9, 5.1, 0.01), 10, 1e-12);
    close(tur(4.9, 5.1, 0.025), 4, 1e-12);
    close(tur(4.9, 5.1, 0.05), 2, 1e-12);
  });

  it('equals the JCGM 106 measurement capability index C_m = (T_U − T_L)/(4u) when U = 2u', () => {
    // JCGM 106:2012 C_m (symbol and clause from memory, unverified) equals the Z540.3 TUR with U = 2u;
    // ASME B89.7.3.1-2001 §2 N:1 rule: the specification zone is N times the uncertainty interval (2U wide)
    const u = 0.0125;
    close(tur(4.9, 5.1, 2 * u), (5.1 - 4.9) / (4 * u), 1e-12);
    close(tur(4.9, 5.1, 2 * u), 4, 1e-12);
  });

  it('refuses U ≤ 0 and an empty span', () => {
    expect(() => tur(4.9, 5.1, 0)).toThrow(RangeError);
    expect(() => tur(5.1, 4.9, 0.01)).toThrow(/must be above/);
  });
});

describe('rdsHalfWidth', () => {
  it('is √(T² − U²) (formula from memory, unverified; values by hand)', () => {
    close(rdsHalfWidth(0.1, 0.01), 0.099498743710662, 1e-12);
    close(rdsHalfWidth(0.1, 0.025), 0.096824583655185, 1e-12);
    close(rdsHalfWidth(0.1, 0.05), 0.086602540378444, 1e-12);
  });

  it('refuses U ≥ T', () => {
    expect(() => rdsHalfWidth(0.1, 0.1)).toThrow(/no acceptance zone/);
  });
});
