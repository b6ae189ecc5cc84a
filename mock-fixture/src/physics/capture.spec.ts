import { describe, expect, it } from 'vitest';
import { PRODUCTS } from '../products';
import { applyDefect } from '../defects';
import { captureOutputRecord, stepIndexFor } from './capture';
import { solveOperatingPoint } from './operating-point';
import { RandomStream } from './prng';
import { rippleWaveform } from './ripple-waveform';
import { nominalUnit } from '../test-support/test-units';

const product = PRODUCTS['OB-BK0503'];
const unit = nominalUnit(product);
const base = {
  unit,
  sourceOn: true,
  vinV: 12,
  loadA: 3,
  step: null,
  rateHz: 20e6,
  points: 2000,
  noiseVrms: 0,
};
const pp = (xs: number[]) => Math.max(...xs) - Math.min(...xs);
const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;

describe('output capture', () => {
  it('shows the DC level and the switching ripple when sampled fast', () => {
    const record = captureOutputRecord({ ...base, rng: new RandomStream(1) });
    const op = solveOperatingPoint(unit, { sourceOn: true, vinV: 12, loadA: 3 });
    const ripple = rippleWaveform(op.inductorCurrent, 3, product.design.switchingHz, product.design.capacitanceF, product.design.esrOhm);
    expect(record).toHaveLength(2000);
    // 40 samples per period resolve the waveform: p-p within 3 % of the analytic value
    expect(pp(record)).toBeGreaterThan(0.97 * ripple.vppV);
    expect(pp(record)).toBeLessThanOrEqual(ripple.vppV + 1e-12);
    expect(mean(record)).toBeCloseTo(op.voutV, 3);
  });

  it('aliases like a real digitiser: sampled at exactly f_sw the ripple vanishes', () => {
    const record = captureOutputRecord({ ...base, rateHz: product.design.switchingHz, rng: new RandomStream(2) });
    expect(pp(record)).toBeLessThan(1e-9);
  });

  it('places a load step after sample floor(0.2·n) and settles at the new level', () => {
    const record = captureOutputRecord({ ...base, step: { fromA: 1.5, toA: 3 }, rateHz: 5e6, points: 1000, rng: new RandomStream(3) });
    const k = stepIndexFor(1000);
    expect(k).toBe(200);
    const before = solveOperatingPoint(unit, { sourceOn: true, vinV: 12, loadA: 1.5 }).voutV;
    const after = solveOperatingPoint(unit, { sourceOn: true, vinV: 12, loadA: 3 }).voutV;
    expect(mean(record.slice(0, k + 1))).toBeCloseTo(before, 2);
    expect(mean(record.slice(900))).toBeCloseTo(after, 2);
    // the dip after the step is far larger than the ripple before it
    expect(before - Math.min(...record.slice(k + 1))).toBeGreaterThan(0.08);
  });

  it('makes an aged output capacitor ring harder', () => {
    const aged = applyDefect(unit, 'aged_output_cap');
    const step = { fromA: 1.5, toA: 3 };
    const good = captureOutputRecord({ ...base, step, rateHz: 5e6, points: 1000, rng: new RandomStream(4) });
    const bad = captureOutputRecord({ ...base, unit: aged, step, rateHz: 5e6, points: 1000, rng: new RandomStream(4) });
    const dip = (r: number[]) => mean(r.slice(0, 201)) - Math.min(...r.slice(201));
    expect(dip(bad)).toBeGreaterThan(1.5 * dip(good));
  });

  it('reads only noise with the source off or the output open', () => {
    const off = captureOutputRecord({ ...base, sourceOn: false, noiseVrms: 0.5e-3, rng: new RandomStream(5) });
    expect(Math.abs(mean(off))).toBeLessThan(1e-4);
    expect(Math.max(...off.map(Math.abs))).toBeLessThan(2.5e-3);
    const open = captureOutputRecord({ ...base, unit: applyDefect(unit, 'open_output'), rng: new RandomStream(6) });
    expect(Math.max(...open.map(Math.abs))).toBe(0);
  });
});
