import { describe, expect, it } from 'vitest';
import { PRODUCTS } from '../products';
import { applyDefect } from '../defects';
import { lossBreakdown, lossyCcmDuty, solveOperatingPoint } from './operating-point';
import { nominalUnit, workedExampleUnit } from '../test-support/test-units';

const on = (vinV: number, loadA: number) => ({ sourceOn: true, vinV, loadA });

describe('efficiency emerges from the loss model', () => {
  it('P_out/P_in from the terminal V and I equals 1 − losses/P_in, for every product and load', () => {
    // definition η = P_out/P_in = (V_out·I_out)/(V_in·I_in), loss = P_in − P_out (textbook definition, docs/reference.md)
    for (const product of Object.values(PRODUCTS)) {
      const unit = nominalUnit(product);
      for (const vinV of [product.vinMinV, product.vinNomV, product.vinMaxV]) {
        for (const fraction of [0.05, 0.25, 0.5, 1]) {
          const op = solveOperatingPoint(unit, on(vinV, fraction * product.ioutRatedA));
          const pinW = op.vinV * op.iinA;
          const poutW = op.voutV * op.ioutA;
          expect(op.efficiencyPct).toBeCloseTo((100 * poutW) / pinW, 9);
          expect(pinW - poutW).toBeCloseTo(op.losses.totalW, 9);
          expect(op.efficiencyPct).toBeCloseTo(100 * (1 - op.losses.totalW / pinW), 9);
        }
      }
    }
  });

  it('reproduces the first efficiency example on the model’s own figures', () => {
    // self-constructed example, by hand: 12 V, 0.95 A in, 5 V, 2 A out → η = 10/11.4 = 0.877 192 982 456, loss 1.4 W.
    // Give a lossless unit a quiescent draw that makes exactly that input current and compare.
    const unit = workedExampleUnit(
      { quiescentA: 0, currentLimitA: 9, maxDuty: 0.95 },
      { setPointV: 5, ratings: { partNumber: 'X', name: 'x', vinMinV: 10, vinNomV: 12, vinMaxV: 14, voutV: 5, ioutRatedA: 3 } },
    );
    const lossless = solveOperatingPoint({ ...unit, design: { ...unit.design, uvloV: 8 } }, on(12, 2));
    expect(lossless.iinA).toBeCloseTo(10 / 12, 12);
    const withLoss = solveOperatingPoint({ ...unit, design: { ...unit.design, uvloV: 8, quiescentA: 1.4 / 12 } }, on(12, 2));
    expect(withLoss.iinA).toBeCloseTo(0.95, 12);
    expect(withLoss.efficiencyPct! / 100).toBeCloseTo(0.877192982456, 11);
    expect(withLoss.losses.totalW).toBeCloseTo(1.4, 12);
  });

  it('reproduces the second efficiency example (12.00 V, 2.237 A in; 5.02 V, 5.00 A out)', () => {
    // self-constructed example, by hand: P_in = 26.844 W, P_out = 25.100 W, η = 0.935 032 036 954, loss 1.744 W
    const ratings = { partNumber: 'X', name: 'x', vinMinV: 10, vinNomV: 12, vinMaxV: 14, voutV: 5, ioutRatedA: 5 };
    const unit = workedExampleUnit({ uvloV: 8, quiescentA: 1.744 / 12 }, { setPointV: 5.02, ratings });
    const op = solveOperatingPoint(unit, on(12, 5));
    expect(op.mode).toBe('ccm');
    expect(op.voutV).toBeCloseTo(5.02, 12);
    expect(op.iinA).toBeCloseTo(2.237, 12);
    expect(op.efficiencyPct! / 100).toBeCloseTo(0.935032036954, 11);
    expect(op.vinV * op.iinA - op.voutV * op.ioutA).toBeCloseTo(1.744, 12);
  });

  it('gives plausible full-load efficiencies for the demo products (85–97 %)', () => {
    // plausibility band for small non-isolated modules (common practice, no source)
    for (const product of Object.values(PRODUCTS)) {
      const op = solveOperatingPoint(nominalUnit(product), on(product.vinNomV, product.ioutRatedA));
      expect(op.efficiencyPct).toBeGreaterThan(85);
      expect(op.efficiencyPct).toBeLessThan(97);
    }
  });
});

describe('duty cycle with losses', () => {
  it('reduces to D = V_out/V_in without drops', () => {
    // ideal CCM duty D = V_out/V_in (Semtech "Power Supplies 101" tutorial); self-constructed example 3.3/24 = 0.1375
    const unit = workedExampleUnit();
    expect(lossyCcmDuty(unit.design, 24, 3.3, 2)).toBeCloseTo(0.1375, 12);
    expect(solveOperatingPoint(unit, on(24, 2)).duty).toBeCloseTo(0.1375, 12);
  });

  it('balances power with the averaged input current i_g = D·i of the buck switch network', () => {
    // averaged model of the buck: the input draws D times the inductor current (Fundamentals of Power
    // Electronics, ch. 3 equivalent-circuit models; recalled from memory). With no quiescent or switching
    // loss, V_in·D·I must equal P_out plus the conduction losses computed separately.
    for (const product of Object.values(PRODUCTS)) {
      const d = { ...product.design, quiescentA: 0, switchingLossS: 0 };
      const unit = nominalUnit(product, { design: d });
      const loadA = product.ioutRatedA;
      const op = solveOperatingPoint(unit, on(product.vinNomV, loadA));
      expect(op.mode).toBe('ccm');
      expect(op.iinA).toBeCloseTo(op.duty * loadA, 10);
      const conduction = lossBreakdown(d, product.vinNomV, loadA, op.duty);
      expect(product.vinNomV * op.duty * loadA).toBeCloseTo(op.voutV * loadA + conduction.totalW, 10);
    }
  });
});

describe('continuous and discontinuous conduction', () => {
  const unit = workedExampleUnit();

  it('puts the boundary at the worked example’s I_crit = ΔI_L/2 = 0.258 75 A', () => {
    // self-constructed example (buck-relations.spec.ts), by hand: ΔI_L = 0.5175 A, I_crit = 0.258 75 A
    const heavy = solveOperatingPoint(unit, on(24, 1));
    expect(heavy.mode).toBe('ccm');
    expect(heavy.inductorRippleApp).toBeCloseTo(0.5175, 10);
    expect(heavy.criticalLoadA).toBeCloseTo(0.25875, 10);
    expect(solveOperatingPoint(unit, on(24, 0.26)).mode).toBe('ccm');
    expect(solveOperatingPoint(unit, on(24, 0.257)).mode).toBe('dcm');
    // ripple estimate ΔI_L·ESR + ΔI_L/(8fC) = 5.175 + 2.5875 mV in CCM (by hand)
    expect(heavy.outputRippleVpp).toBeCloseTo(7.7625e-3, 10);
  });

  it('uses the DCM duty of the worked example at R = 50 Ω', () => {
    // D = M·√(K/(1 − M)) by hand on the self-constructed example: D = 0.069 444 for 3.3 V at 50 Ω (I = 0.066 A)
    const op = solveOperatingPoint(unit, on(24, 3.3 / 50));
    expect(op.mode).toBe('dcm');
    expect(op.duty).toBeCloseTo(0.069444, 6);
    // charge balance: the triangle I_pk·(D + D2)/2 carries the load current
    const shape = op.inductorCurrent;
    if (shape.kind !== 'dcm') throw new Error('expected a DCM shape');
    expect((shape.peakA * (shape.duty + shape.freewheelDuty)) / 2).toBeCloseTo(3.3 / 50, 12);
  });

  it('is continuous across the boundary (duty and ripple)', () => {
    // M(K_crit) = D (continuity check, see buck-relations.spec.ts) means both sides meet at I_crit
    const below = solveOperatingPoint(unit, on(24, 0.25875 - 1e-9));
    const above = solveOperatingPoint(unit, on(24, 0.25875 + 1e-9));
    expect(below.duty).toBeCloseTo(above.duty, 6);
    expect(below.outputRippleVpp).toBeCloseTo(above.outputRippleVpp, 8);
  });

  it('lets the output rise at light load in DCM and droop with R_out in CCM', () => {
    for (const product of Object.values(PRODUCTS)) {
      const u = nominalUnit(product);
      const d = product.design;
      const noLoad = solveOperatingPoint(u, on(product.vinNomV, 0));
      const half = solveOperatingPoint(u, on(product.vinNomV, product.ioutRatedA / 2));
      const full = solveOperatingPoint(u, on(product.vinNomV, product.ioutRatedA));
      expect(noLoad.mode).toBe('dcm');
      expect(noLoad.voutV).toBeCloseTo(product.voutV * (1 + d.dcmRisePct / 100), 9);
      // LR5 (docs/reference.md): in CCM the load regulation is an output resistance ΔV/ΔI
      expect((half.voutV - full.voutV) / (product.ioutRatedA / 2)).toBeCloseTo(d.outputResistanceOhm, 9);
    }
  });
});

describe('static regulation', () => {
  it('droops like the load-regulation example (V_NL 5.050 V, V_FL 4.990 V at 3 A)', () => {
    // self-constructed example, by hand: LR5 = 0.060 V / 3.0 A = 20.0 mΩ; LR2 = 0.060/5.000 = 1.2 %.
    // A lossless stage with R_out = 20 mΩ, no light-load rise and a 5.050 V set point must read exactly those.
    const ratings = { partNumber: 'X', name: 'x', vinMinV: 10, vinNomV: 12, vinMaxV: 14, voutV: 5, ioutRatedA: 3 };
    const unit = workedExampleUnit({ uvloV: 8, outputResistanceOhm: 0.02 }, { setPointV: 5.05, ratings });
    const noLoad = solveOperatingPoint(unit, on(12, 0));
    const fullLoad = solveOperatingPoint(unit, on(12, 3));
    expect(noLoad.voutV).toBeCloseTo(5.05, 12);
    expect(fullLoad.voutV).toBeCloseTo(4.99, 12);
    expect((noLoad.voutV - fullLoad.voutV) / 3).toBeCloseTo(0.02, 12);
    expect(((noLoad.voutV - fullLoad.voutV) / 5) * 100).toBeCloseTo(1.2, 10);
  });

  it('gives the line regulation of the line-regulation example (0.100 % over 2.4 V, 0.041 666 7 %/V)', () => {
    // definitions LN3 = (V_max − V_min)/V_ref × 100 (codingace.net line-regulation page) and LN2 = LN3/ΔV_in in %/V
    // (Wikipedia "Line regulation"); self-constructed example by hand: LN3 = 0.100 000 %, LN2 = 0.041 666 7 %/V
    // over ΔV_in = 2.4 V. A stage whose line sensitivity is 0.1/2.4 %/V must reproduce both.
    const unit = workedExampleUnit({ lineRegulationPctPerV: 0.1 / 2.4 });
    const vouts = [22.8, 24, 25.2].map((vinV) => solveOperatingPoint(unit, on(vinV, 2)).voutV);
    const ln3Pct = ((Math.max(...vouts) - Math.min(...vouts)) / vouts[1]) * 100;
    expect(ln3Pct).toBeCloseTo(0.1, 10);
    expect(ln3Pct / 2.4).toBeCloseTo(0.0416667, 7);
    // and a good catalogue unit stays well inside the demo plans' 0.5 % LN3 limit over its whole input range
    for (const product of Object.values(PRODUCTS)) {
      const u = nominalUnit(product);
      const v = [product.vinMinV, product.vinNomV, product.vinMaxV].map((vinV) => solveOperatingPoint(u, on(vinV, product.ioutRatedA)).voutV);
      expect(((Math.max(...v) - Math.min(...v)) / v[1]) * 100).toBeLessThan(0.5);
    }
  });
});

describe('line behaviour, protection and the source', () => {
  const product = PRODUCTS['OB-BK0503'];

  it('never outputs with the source off', () => {
    const op = solveOperatingPoint(nominalUnit(product), { sourceOn: false, vinV: 12, loadA: 1 });
    expect(op.mode).toBe('off');
    expect(op.voutV).toBe(0);
    expect(op.iinA).toBe(0);
  });

  it('stays off below UVLO and above OVLO', () => {
    expect(solveOperatingPoint(nominalUnit(product), on(5, 0)).voutV).toBe(0);
    expect(solveOperatingPoint(nominalUnit(product), on(25, 0)).voutV).toBe(0);
  });

  it('follows the input in dropout (when the UVLO lets it run that low)', () => {
    // lossless worked-example stage with the lock-out moved down: at 3.4 V the loop would need D = 0.97
    const unit = workedExampleUnit({ uvloV: 2 });
    const op = solveOperatingPoint(unit, on(3.4, 1));
    expect(op.mode).toBe('dropout');
    expect(op.duty).toBeCloseTo(0.95, 12);
    expect(op.voutV).toBeCloseTo(0.95 * 3.4, 12);
  });

  it('folds back above the current limit and recovers when the load drops', () => {
    const unit = nominalUnit(product);
    const over = solveOperatingPoint(unit, on(12, 6));
    expect(over.mode).toBe('foldback');
    expect(over.voutV).toBeLessThan(0.5);
    expect(solveOperatingPoint(unit, on(12, 1)).voutV).toBeGreaterThan(4.9);
    const unprotected = solveOperatingPoint(applyDefect(unit, 'no_protection'), on(12, 6));
    expect(unprotected.mode).not.toBe('foldback');
    expect(unprotected.voutV).toBeGreaterThan(4);
  });
});

describe('defects seen through the operating point', () => {
  it('weak_switch costs 5–8 efficiency points at rated load and runs hot', () => {
    for (const p of Object.values(PRODUCTS)) {
      const good = solveOperatingPoint(nominalUnit(p), on(p.vinNomV, p.ioutRatedA));
      const weak = solveOperatingPoint(applyDefect(nominalUnit(p), 'weak_switch'), on(p.vinNomV, p.ioutRatedA));
      const drop = good.efficiencyPct! - weak.efficiencyPct!;
      expect(drop).toBeGreaterThan(5);
      expect(drop).toBeLessThan(8);
      expect(good.caseTempC).toBeLessThan(70);
      expect(weak.caseTempC).toBeGreaterThan(70);
    }
  });

  it('aged_output_cap at least triples the ripple; open_output reads nothing but still draws idle current', () => {
    for (const p of Object.values(PRODUCTS)) {
      const good = solveOperatingPoint(nominalUnit(p), on(p.vinNomV, p.ioutRatedA));
      const aged = solveOperatingPoint(applyDefect(nominalUnit(p), 'aged_output_cap'), on(p.vinNomV, p.ioutRatedA));
      expect(aged.outputRippleVpp / good.outputRippleVpp).toBeGreaterThan(3);
      const open = solveOperatingPoint(applyDefect(nominalUnit(p), 'open_output'), on(p.vinNomV, p.ioutRatedA));
      const idle = solveOperatingPoint(nominalUnit(p), on(p.vinNomV, 0));
      expect(open.voutV).toBe(0);
      expect(open.ioutA).toBe(0);
      expect(open.iinA).toBeCloseTo(idle.iinA, 12);
    }
  });
});
