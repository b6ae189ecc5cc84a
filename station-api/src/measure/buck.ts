import { requireFinite, requirePositive } from './guards';

/**
 * Ideal buck-converter design relations (Erickson & Maksimović, Fundamentals of Power Electronics, ch. 5,
 * as summarised in check-values §2). Used to size the simulated module and to sanity-check plan limits;
 * lossless components, steady state.
 */

/**
 * Ideal continuous-conduction duty cycle D = V_out / V_in (inductor volt-second balance).
 * @param vinV input voltage (V)
 * @param voutV output voltage (V)
 * @returns duty cycle, 0…1
 * @throws RangeError unless 0 ≤ V_out ≤ V_in and V_in > 0 (a buck only steps down)
 */
export function idealDuty(vinV: number, voutV: number): number {
  requirePositive('vinV', vinV);
  requireFinite('voutV', voutV);
  if (voutV < 0 || voutV > vinV) {
    throw new RangeError(`a buck converter needs 0 ≤ voutV ≤ vinV; got voutV ${voutV} V with vinV ${vinV} V`);
  }
  return voutV / vinV;
}

/**
 * Inductor current ripple ΔI_L = (V_in − V_out)·D / (L·f) in continuous conduction.
 * @param vinV input voltage (V)
 * @param voutV output voltage (V)
 * @param lH inductance (H)
 * @param fHz switching frequency (Hz)
 * @returns peak-to-peak inductor ripple (A)
 */
export function inductorRippleApp(vinV: number, voutV: number, lH: number, fHz: number): number {
  const d = idealDuty(vinV, voutV);
  requirePositive('lH', lH);
  requirePositive('fHz', fHz);
  return ((vinV - voutV) * d) / (lH * fHz);
}

/**
 * Dimensionless inductance K = 2L / (R·T_s) = 2·L·f / R.
 * @param lH inductance (H)
 * @param rOhm load resistance (Ω)
 * @param fHz switching frequency (Hz)
 */
export function kFactor(lH: number, rOhm: number, fHz: number): number {
  requirePositive('lH', lH);
  requirePositive('rOhm', rOhm);
  requirePositive('fHz', fHz);
  return (2 * lH * fHz) / rOhm;
}

/**
 * Mode boundary of the buck, K_crit(D) = 1 − D.
 * @param d duty cycle, 0…1
 */
export function kCrit(d: number): number {
  requireFinite('d', d);
  if (d < 0 || d > 1) throw new RangeError(`duty cycle must be between 0 and 1, got ${d}`);
  return 1 - d;
}

/**
 * True when the converter runs in discontinuous conduction, K < K_crit(D). Exactly on the boundary counts as
 * continuous (the inductor current just touches zero).
 * @param k dimensionless inductance from {@link kFactor}
 * @param d duty cycle
 */
export function isDcm(k: number, d: number): boolean {
  requirePositive('k', k);
  return k < kCrit(d);
}

/**
 * Load current at the CCM/DCM boundary, I_crit = ΔI_L / 2 = V_out / R_crit with R_crit = 2·L·f / (1 − D).
 * @param vinV input voltage (V)
 * @param voutV output voltage (V)
 * @param lH inductance (H)
 * @param fHz switching frequency (Hz)
 * @returns critical load current (A); below it the converter enters DCM
 */
export function criticalLoadA(vinV: number, voutV: number, lH: number, fHz: number): number {
  return inductorRippleApp(vinV, voutV, lH, fHz) / 2;
}

/**
 * Conversion ratio in discontinuous conduction, M = V/V_in = 2 / (1 + √(1 + 4K/D²)) (Erickson & Maksimović ch. 5,
 * recalled from memory in check-values; it meets the CCM ratio M = D exactly at K = K_crit).
 * @param k dimensionless inductance
 * @param d duty cycle, 0 < d < 1
 * @returns M, dimensionless
 * @throws RangeError when K > K_crit(D): the converter is then in CCM and M = D
 */
export function dcmConversionRatio(k: number, d: number): number {
  requirePositive('k', k);
  requirePositive('d', d);
  const kc = kCrit(d);
  // relative slack so a K computed exactly at the boundary is still accepted despite rounding
  if (k > kc * (1 + 1e-12)) {
    throw new RangeError(`K = ${k} is above K_crit = ${kc} for D = ${d}: the converter is in CCM, where M = D`);
  }
  return 2 / (1 + Math.sqrt(1 + (4 * k) / (d * d)));
}

/**
 * Corner (resonant) frequency of the output LC filter, f_c = 1 / (2π√(LC)).
 * @param lH inductance (H)
 * @param cF capacitance (F)
 * @returns corner frequency (Hz)
 */
export function lcCornerHz(lH: number, cF: number): number {
  requirePositive('lH', lH);
  requirePositive('cF', cF);
  return 1 / (2 * Math.PI * Math.sqrt(lH * cF));
}

/**
 * Output ripple from the capacitance alone, ΔV_C = ΔI_L / (8·f·C).
 * @param dIA peak-to-peak inductor ripple (A)
 * @param fHz switching frequency (Hz)
 * @param cF output capacitance (F)
 * @returns peak-to-peak ripple (V)
 */
export function capRippleV(dIA: number, fHz: number, cF: number): number {
  requireFinite('dIA', dIA);
  if (dIA < 0) throw new RangeError(`dIA must be 0 or more, got ${dIA}`);
  requirePositive('fHz', fHz);
  requirePositive('cF', cF);
  return dIA / (8 * fHz * cF);
}

/**
 * Output ripple from the capacitor's equivalent series resistance, ΔV_ESR = ΔI_L · ESR.
 * @param dIA peak-to-peak inductor ripple (A)
 * @param esrOhm equivalent series resistance (Ω)
 * @returns peak-to-peak ripple (V)
 */
export function esrRippleV(dIA: number, esrOhm: number): number {
  requireFinite('dIA', dIA);
  requireFinite('esrOhm', esrOhm);
  if (dIA < 0 || esrOhm < 0) throw new RangeError(`dIA and esrOhm must be 0 or more, got ${dIA} A and ${esrOhm} Ω`);
  return dIA * esrOhm;
}
