import { linearRegression, max, min } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import {
  lineDeviationPct,
  lineRegulationPct,
  lineRegulationPctPerV,
  lineSensitivityPct,
  loadRegulationPct,
  loadRegulationRefPct,
  outputResistanceMohm,
} from './regulation';

const close = (actual: number, expected: number, rel = 1e-9) =>
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(Math.abs(expected) * rel);

// self-constructed example: V_NL 5.050 V at 0 A, V_FL 4.990 V at 3.0 A, V_nom 5.000 V, V(50 %) 5.020 V
const ex = { vNoLoadV: 5.05, vFullLoadV: 4.99, vNomV: 5.0 };

describe('loadRegulationPct', () => {
  it('LR1 divides by the full-load voltage', () => {
    // LR1 as defined by Microchip Developer Help "Load regulation" (÷ V_FL); by hand 0.060/4.990 = 1.202 404 810 %
    close(loadRegulationPct({ ...ex, definition: 'full_load' }), 1.20240481, 1e-9);
  });

  it('LR2 divides by the nominal voltage', () => {
    // LR2, IEC 61204 as summarised by tnlab.org (÷ V_nom); by hand 0.060/5.000 = 1.200 000 000 %
    close(loadRegulationPct({ ...ex, definition: 'nominal' }), 1.2, 1e-12);
  });

  it('pitfall: neither definition divides by the no-load voltage', () => {
    // self-constructed example: dividing by V_NL gives 0.060/5.050 = 1.188 118 812 %, a third, different figure
    const nl = ((ex.vNoLoadV - ex.vFullLoadV) / ex.vNoLoadV) * 100;
    close(nl, 1.188118812, 1e-9);
    expect(loadRegulationPct({ ...ex, definition: 'full_load' })).not.toBeCloseTo(nl, 3);
    expect(loadRegulationPct({ ...ex, definition: 'nominal' })).not.toBeCloseTo(nl, 3);
  });

  it('follows its declared definition where the Microchip wiki does not', () => {
    // Microchip Developer Help "Load regulation" states LR1 (÷ V_FL) but works 5.000 → 4.950 V as 0.05/5 = 1 %.
    // The stated formula gives 0.05/4.95 = 1.010101 %; only the nominal definition gives 1.000000 %.
    const wiki = { vNoLoadV: 5.0, vFullLoadV: 4.95, vNomV: 5.0 };
    close(loadRegulationPct({ ...wiki, definition: 'full_load' }), 1.0101010101, 1e-9);
    close(loadRegulationPct({ ...wiki, definition: 'nominal' }), 1.0, 1e-12);
  });

  it('keeps the sign when the output rises with load', () => {
    expect(loadRegulationPct({ vNoLoadV: 4.99, vFullLoadV: 5.01, vNomV: 5, definition: 'nominal' })).toBeLessThan(0);
  });

  it('refuses an unknown definition and a zero denominator', () => {
    expect(() => loadRegulationPct({ ...ex, definition: 'no_load' as never })).toThrow(/unknown load-regulation definition/);
    expect(() => loadRegulationPct({ ...ex, vFullLoadV: 0, definition: 'full_load' })).toThrow(/vFullLoadV must be greater than 0/);
  });
});

describe('loadRegulationRefPct (LR4)', () => {
  it('takes the largest deviation from the reference-load voltage', () => {
    // LR4 (common practice, no source) on the self-constructed example: max(0.030, 0.030)/5.020 = 0.597 609 562 %
    close(loadRegulationRefPct([5.05, 5.02, 4.99], 5.02), 0.597609562, 1e-9);
  });

  it('agrees with an independent max/min from simple-statistics on an asymmetric sweep', () => {
    // npm reference library simple-statistics (max, min); IEC 61204 clause 2: the maximum change either way
    const readings = [5.031, 5.02, 5.004, 4.987];
    const ref = 5.02;
    const expected = (Math.max(max(readings) - ref, ref - min(readings)) / ref) * 100;
    close(loadRegulationRefPct(readings, ref), expected, 1e-12);
    close(expected, (0.033 / 5.02) * 100, 1e-9);
  });
});

describe('outputResistanceMohm (LR5)', () => {
  it('is ΔV/ΔI of the worked example', () => {
    // LR5, load regulation as output resistance (probsee.com summary of Wikipedia "Load regulation");
    // self-constructed example by hand: 0.060 V / 3.0 A = 20.0 mΩ
    close(outputResistanceMohm(5.05, 0, 4.99, 3.0), 20.0, 1e-9);
  });

  it('equals minus the slope of a least-squares line through the two points', () => {
    // npm reference library simple-statistics linearRegression
    const { m } = linearRegression([
      [0.5, 3.3021],
      [4.5, 3.2957],
    ]);
    close(outputResistanceMohm(3.3021, 0.5, 3.2957, 4.5), -m * 1000, 1e-9);
    close(outputResistanceMohm(3.3021, 0.5, 3.2957, 4.5), 1.6, 1e-9);
  });

  it('refuses two equal currents', () => {
    expect(() => outputResistanceMohm(5, 1, 4.9, 1)).toThrow(/two different load currents/);
  });
});

// self-constructed example: V_in 10.8 / 12.0 / 13.2 V, V_o 4.998 / 5.000 / 5.003 V
const vins = [10.8, 12.0, 13.2];
const vouts = [4.998, 5.0, 5.003];

describe('lineRegulationPct (LN3)', () => {
  it('is (max − min)/ref over the line range', () => {
    // LN3 as defined on the codingace.net line-regulation page; by hand 0.005/5.000 = 0.100 000 %
    close(lineRegulationPct(vouts, 5.0), 0.1, 1e-9);
  });

  it('reproduces the Nisshinbo FAQ 071 datasheet figure', () => {
    // Nisshinbo Micro Devices FAQ 071: 1.8 V LDO, 0.10 %/V over 1.2 V → 0.12 % = 2.16 mV
    close(lineRegulationPct([1.8, 1.8 + 0.00216], 1.8), 0.12, 1e-9);
  });

  it('pitfall: LN1 (ΔVo/ΔVi) is a different quantity from LN3', () => {
    // LN1 of Wikipedia "Line regulation" (ΔVo/ΔVi); by hand 0.005/2.4 × 100 = 0.208 333 %, not 0.1 %
    close(lineSensitivityPct(vouts, vins), 0.2083333333, 1e-9);
    expect(lineSensitivityPct(vouts, vins)).not.toBeCloseTo(lineRegulationPct(vouts, 5.0), 2);
  });

  it('LN1 of the Nisshinbo FAQ 071 maximum case is 2.16 mV / 1.2 V = 0.18 %', () => {
    // Nisshinbo Micro Devices FAQ 071: 2.16 mV over ΔV_in = 1.2 V; as LN3 it is 0.12 %
    close(lineSensitivityPct([1.8, 1.8 + 0.00216], [3.0, 4.2]), 0.18, 1e-9);
  });
});

describe('lineRegulationPctPerV (LN2)', () => {
  it('divides LN3 by the input span', () => {
    // LN2 of Wikipedia "Line regulation" (%/V); by hand 0.100 000 % / 2.4 V = 0.041 666 7 %/V
    close(lineRegulationPctPerV(vouts, vins, 5.0), 0.041666666667, 1e-9);
  });

  it('gives the Nisshinbo FAQ 071 typical 0.02 %/V from 0.432 mV over 3.0 → 4.2 V', () => {
    // Nisshinbo Micro Devices FAQ 071: typical 0.02 %/V × 1.2 V = 0.024 % → 0.432 mV at 1.8 V
    close(lineRegulationPctPerV([1.8, 1.8 + 0.000432], [3.0, 4.2], 1.8), 0.02, 1e-9);
  });

  it('refuses mismatched lengths and a zero input span', () => {
    expect(() => lineRegulationPctPerV([5, 5.01, 5.02], [12, 13], 5)).toThrow(/one output per input/);
    expect(() => lineRegulationPctPerV([5, 5.01], [12, 12], 5)).toThrow(/span more than 0 V/);
  });
});

describe('lineDeviationPct (LN4)', () => {
  it('is the largest deviation from the nominal-line output', () => {
    // LN4 as defined by the Powermate Technology knowledge base "What is line regulation";
    // by hand max(0.002, 0.003)/5.000 = 0.0600 %
    close(lineDeviationPct(vouts, 5.0), 0.06, 1e-9);
  });

  it('equals LN3 when the nominal-line output sits at one end of the range', () => {
    // Nisshinbo FAQ 071 maximum figure (0.12 % over the line range) with the reference at low line
    close(lineDeviationPct([1.8, 1.8 + 0.00216], 1.8), 0.12, 1e-9);
  });

  it('refuses a bad reading by index', () => {
    expect(() => lineDeviationPct([5, Number.NaN], 5)).toThrow(/voutsV\[1\] must be a finite number/);
  });
});
