import { describe, expect, it } from 'vitest';
import { transientMetrics } from './transient';

const close = (actual: number | null, expected: number, rel = 1e-9) => {
  expect(actual).not.toBeNull();
  expect(Math.abs((actual as number) - expected)).toBeLessThanOrEqual(Math.abs(expected) * rel + 1e-12);
};

// self-constructed example trace: 0.5 A → 2.5 A at t = 0, one sample every 2 µs from −4 µs
const trace = [
  5.01, 5.01, 5.01, 4.95, 4.9, 4.872, 4.88, 4.905, 4.935, 4.958, 4.975, 4.988, 4.996, 5.001, 5.003, 5.002, 5.002, 5.002,
];
const base = { samplesV: trace, sampleRateHz: 500e3, stepIndex: 2, vNomV: 5.0, finalSamples: 3 };

describe('transientMetrics', () => {
  it('finds V_before, V_final, V_min and the undershoot of the worked trace', () => {
    const m = transientMetrics({ ...base, bandPct: 1 });
    // by hand: V_before 5.010 V (mean for t ≤ 0), V_final 5.002 V (last 3), V_min 4.872 V
    close(m.vBeforeV, 5.01);
    close(m.vFinalV, 5.002);
    close(m.vMinV, 4.872);
    // undershoot referenced to V_before = 138 mV (Duke University test notes: peak deviation in mV)
    close(m.undershootMv, 138, 1e-9);
    // the V_final-referenced alternative is 130 mV and is what a caller would get from vFinalV
    close((m.vFinalV - m.vMinV) * 1000, 130, 1e-9);
    expect(m.overshootMv).toBe(0);
    close(m.vMaxV, 5.01);
  });

  it('recovers into ±1 % at 13.3043 µs, having left the band at 2 µs', () => {
    const m = transientMetrics({ ...base, bandPct: 1 });
    // by hand: interpolated 4.950 V crossing 12 + 2·(0.015/0.023) = 13.3043 µs from the step
    // (NI PXIe-4051 help: time from the step until back within the band)
    close(m.recoveryUs, 12 + (2 * 0.015) / 0.023);
    // the trace leaves the band at t = 2 µs; the sample there is exactly on the inclusive bound
    close(m.leftBandAtUs, 2);
    // Duke University "testing" notes: leave band → re-enter and stay = 11.3043 µs
    close(m.recoveryFromExitUs, 11.304347826, 1e-9);
  });

  it('recovers into ±0.5 % at 16 µs, counting the sample on the bound as inside', () => {
    // by hand: 4.975 V at 16 µs is exactly on the bound and counts as inside (our convention: bounds inclusive)
    const m = transientMetrics({ ...base, bandPct: 0.5 });
    close(m.recoveryUs, 16);
  });

  it('reports no recovery when the record ends outside the band', () => {
    const m = transientMetrics({ ...base, samplesV: trace.slice(0, 9), finalSamples: 1, bandPct: 1 });
    expect(m.recoveryUs).toBeNull();
    expect(m.recoveryFromExitUs).toBeNull();
    close(m.leftBandAtUs, 2);
  });

  it('reports zero recovery and no exit when the output stays in the band', () => {
    const m = transientMetrics({ ...base, samplesV: [5.0, 5.0, 5.0, 4.99, 4.98, 4.99, 5.0, 5.0], finalSamples: 2, bandPct: 1 });
    expect(m.recoveryUs).toBe(0);
    expect(m.leftBandAtUs).toBeNull();
    expect(m.recoveryFromExitUs).toBe(0);
    close(m.undershootMv, 20);
  });

  it('measures overshoot on a load release against V_before', () => {
    // the example trace mirrored about 5.010 V: undershoot becomes a 138 mV overshoot (Duke notes, load removed)
    const mirrored = trace.map((v) => 10.02 - v);
    const m = transientMetrics({ ...base, samplesV: mirrored, vNomV: 5.02, bandPct: 1 });
    close(m.overshootMv, 138, 1e-9);
    expect(m.undershootMv).toBe(0);
  });

  it('uses a default V_final window of the last 10 % after the step', () => {
    const samples = [5, 5, ...new Array(20).fill(4.99)];
    const m = transientMetrics({ samplesV: samples, sampleRateHz: 1e6, stepIndex: 1, vNomV: 5, bandPct: 1 });
    close(m.vFinalV, 4.99);
  });

  it('refuses a step index outside the record and a bad sample', () => {
    expect(() => transientMetrics({ ...base, stepIndex: 17, bandPct: 1 })).toThrow(/stepIndex must be a whole number from 0 to 16/);
    expect(() => transientMetrics({ ...base, samplesV: [5, Number.NaN, 5], bandPct: 1 })).toThrow(/samplesV\[1\]/);
    expect(() => transientMetrics({ ...base, finalSamples: 0, bandPct: 1 })).toThrow(/finalSamples/);
  });
});
