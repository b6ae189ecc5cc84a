/**
 * Textbook relations of the buck converter power stage, as plain functions on SI numbers.
 * Sources are listed in docs/fixture-protocol.md and beside the checks in buck-relations.spec.ts.
 */

/** Ideal continuous-conduction duty cycle D = V_out / V_in (volt-second balance on the inductor). */
export function idealDuty(vinV: number, voutV: number): number {
  return voutV / vinV;
}

/**
 * Peak-to-peak inductor ripple current ΔI_L = (V_in − V_out)·D / (L·f), in amperes.
 * @param vinV input voltage (V)
 * @param voutV output voltage (V)
 * @param duty duty cycle (0..1)
 * @param inductanceH inductance (H)
 * @param switchingHz switching frequency (Hz)
 */
export function inductorRippleApp(
  vinV: number,
  voutV: number,
  duty: number,
  inductanceH: number,
  switchingHz: number,
): number {
  return ((vinV - voutV) * duty) / (inductanceH * switchingHz);
}

/** Dimensionless inductance K = 2L / (R·T_s) = 2·L·f / R (R in Ω, L in H, f in Hz). */
export function dimensionlessK(inductanceH: number, loadOhm: number, switchingHz: number): number {
  return (2 * inductanceH * switchingHz) / loadOhm;
}

/** Mode boundary of the buck: K_crit(D) = 1 − D; the converter runs in DCM when K < K_crit. */
export function kCrit(duty: number): number {
  return 1 - duty;
}

/** Critical load resistance R_crit = 2·L·f / (1 − D), in ohms; heavier loads (smaller R) stay in CCM. */
export function criticalLoadOhm(inductanceH: number, switchingHz: number, duty: number): number {
  return (2 * inductanceH * switchingHz) / (1 - duty);
}

/** Critical load current I_crit = V_out / R_crit (equal to ΔI_L / 2 in the ideal converter), in amperes. */
export function criticalLoadCurrentA(voutV: number, inductanceH: number, switchingHz: number, duty: number): number {
  return voutV / criticalLoadOhm(inductanceH, switchingHz, duty);
}

/** Smallest inductance that keeps CCM at load resistance R: L_crit = (1 − D)·R / (2·f), in henries. */
export function criticalInductanceH(duty: number, loadOhm: number, switchingHz: number): number {
  return ((1 - duty) * loadOhm) / (2 * switchingHz);
}

/** DCM conversion ratio M = V_out/V_in = 2 / (1 + √(1 + 4K/D²)); equals D at K = K_crit. */
export function dcmConversionRatio(duty: number, k: number): number {
  return 2 / (1 + Math.sqrt(1 + (4 * k) / (duty * duty)));
}

/** Duty a DCM buck needs for conversion ratio M at dimensionless inductance K: D = M·√(K / (1 − M)). */
export function dcmDutyForRatio(ratio: number, k: number): number {
  return ratio * Math.sqrt(k / (1 - ratio));
}

/** LC corner frequency f_c = 1 / (2π·√(L·C)), in hertz. */
export function lcCornerHz(inductanceH: number, capacitanceF: number): number {
  return 1 / (2 * Math.PI * Math.sqrt(inductanceH * capacitanceF));
}

/** Capacitive part of the CCM output ripple ΔV_C = ΔI_L / (8·f·C), in volts peak-to-peak. */
export function capacitiveRippleVpp(rippleApp: number, switchingHz: number, capacitanceF: number): number {
  return rippleApp / (8 * switchingHz * capacitanceF);
}

/** ESR part of the output ripple ΔI_L·ESR, in volts peak-to-peak. */
export function esrRippleVpp(rippleApp: number, esrOhm: number): number {
  return rippleApp * esrOhm;
}

/**
 * CCM output ripple estimate ΔV ≈ ΔI_L·ESR + ΔI_L / (8·f·C), in volts peak-to-peak. Adding the two terms
 * is the usual conservative estimate: their peaks do not coincide, so the true waveform is a little lower.
 */
export function outputRippleVpp(
  rippleApp: number,
  switchingHz: number,
  capacitanceF: number,
  esrOhm: number,
): number {
  return esrRippleVpp(rippleApp, esrOhm) + capacitiveRippleVpp(rippleApp, switchingHz, capacitanceF);
}

/**
 * Capacitive ripple in DCM, in volts peak-to-peak. The inductor current is a triangle of height I_pk lasting
 * (D + D2)·T_s; the part above the load current I_o charges the capacitor by ΔQ = T1·(I_pk − I_o)² / (2·I_pk).
 * At the mode boundary (I_pk = 2·I_o, T1 = T_s) this equals ΔI_L / (8·f·C).
 * @param peakA inductor peak current (A)
 * @param loadA load current (A)
 * @param conductionS time the inductor current is non-zero in one period, (D + D2)·T_s (s)
 * @param capacitanceF output capacitance (F)
 */
export function dcmCapacitiveRippleVpp(peakA: number, loadA: number, conductionS: number, capacitanceF: number): number {
  if (peakA <= 0 || peakA <= loadA) return 0;
  return (conductionS * (peakA - loadA) ** 2) / (2 * peakA * capacitanceF);
}

/**
 * Switching (voltage–current overlap) loss P = ½·V_in·I·(t_r + t_f)·f, written as k·V_in·I·f with
 * k = ½·(t_r + t_f) in seconds. Returns watts.
 */
export function switchingLossW(switchingLossS: number, vinV: number, currentA: number, switchingHz: number): number {
  return switchingLossS * vinV * currentA * switchingHz;
}
