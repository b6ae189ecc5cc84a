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

// check-values §1.2 worked example: V_NL 5.050 V at 0 A, V_FL 4.990 V at 3.0 A, V_nom 5.000 V, V(50 %) 5.020 V
const ex = { vNoLoadV: 5.05, vFullLoadV: 4.99, vNomV: 5.0 };

describe('loadRegulationPct', () => {
  it('LR1 divides by the full-load voltage', () => {
    // check-values §1.2 [X]: LR1 (Microchip developer wiki definition) = 1.202404810 %
    close(loadRegulationPct({ ...ex, definition: 'full_load' }), 1.20240481, 1e-9);
  });

  it('LR2 divides by the nominal voltage', () => {
    // check-values §1.2 [X]: LR2 (IEC 61204 via tnlab.org summary) = 1.200000000 %
    close(loadRegulationPct({ ...ex, definition: 'nominal' }), 1.2, 1e-12);
  });

  it('pitfall: neither definition divides by the no-load voltage', () => {
    // check-values §1.2 / §10 item 6: dividing by V_NL gives 1.188118812 %, a third, different figure
    const nl = ((ex.vNoLoadV - ex.vFullLoadV) / ex.vNoLoadV) * 100;
    close(nl, 1.188118812, 1e-9);
    expect(loadRegulationPct({ ...ex, definition: 'full_load' })).not.toBeCloseTo(nl, 3);
    expect(loadRegulationPct({ ...ex, definition: 'nominal' })).not.toBeCloseTo(nl, 3);
  });

  it('follows its declared definition where the Microchip wiki does not', () => {
    // check-values §1.2 [C]: the wiki states LR1 (÷ V_FL) but works 5.000 → 4.950 V as 0.05/5 = 1 %.
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
    // check-values §1.2 [X]: max(0.030, 0.030)/5.020 = 0.597609562 %
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
    // check-values §1.2 [X]: 0.060 V / 3.0 A = 20.0 mΩ (probsee summary: load regulation as output resistance)
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

// check-values §1.3 worked example: V_in 10.8 / 12.0 / 13.2 V, V_o 4.998 / 5.000 / 5.003 V
const vins = [10.8, 12.0, 13.2];
const vouts = [4.998, 5.0, 5.003];

describe('lineRegulationPct (LN3)', () => {
  it('is (max − min)/ref over the line range', () => {
    // check-values §1.3 [X]: LN3 (codingace.net definition) = 0.005/5.000 = 0.100000 %
    close(lineRegulationPct(vouts, 5.0), 0.1, 1e-9);
  });

  it('reproduces the Nisshinbo FAQ 071 datasheet figure', () => {
    // Nisshinbo Micro Devices FAQ 071 via check-values §1.3: 1.8 V LDO, 0.10 %/V over 1.2 V → 0.12 % = 2.16 mV
    close(lineRegulationPct([1.8, 1.8 + 0.00216], 1.8), 0.12, 1e-9);
  });

  it('pitfall: LN1 (ΔVo/ΔVi) is a different quantity from LN3', () => {
    // check-values §1.3: LN1 = 0.005/2.4 × 100 = 0.208333 % (Wikipedia "Line regulation"), not 0.1 %
    close(lineSensitivityPct(vouts, vins), 0.2083333333, 1e-9);
    expect(lineSensitivityPct(vouts, vins)).not.toBeCloseTo(lineRegulationPct(vouts, 5.0), 2);
  });

  it('LN1 of the Nisshinbo FAQ 071 maximum case is 2.16 mV / 1.2 V = 0.18 %', () => {
    // Nisshinbo Micro Devices FAQ 071 (check-values §1.3): 2.16 mV over ΔV_in = 1.2 V; as LN3 it is 0.12 %
    close(lineSensitivityPct([1.8, 1.8 + 0.00216], [3.0, 4.2]), 0.18, 1e-9);
  });
});

describe('lineRegulationPctPerV (LN2)', () => {
  it('divides LN3 by the input span', () => {
    // check-values §1.3 [X]: 0.100000 % / 2.4 V = 0.0416667 %/V (Wikipedia "Line regulation" LN2)
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
    // check-values §1.3 [X]: LN4 (Powermate knowledge base) = max(0.002, 0.003)/5.000 = 0.0600 %
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
