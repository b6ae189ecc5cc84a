import { requireFinite } from './guards';

function powers(vinV: number, iinA: number, voutV: number, ioutA: number): { pinW: number; poutW: number } {
  requireFinite('vinV', vinV);
  requireFinite('iinA', iinA);
  requireFinite('voutV', voutV);
  requireFinite('ioutA', ioutA);
  const pinW = vinV * iinA;
  // A module cannot deliver power it does not draw; a non-positive input power means a wiring or meter fault
  if (pinW <= 0) {
    throw new RangeError(
      `input power is ${pinW} W (vinV ${vinV} V × iinA ${iinA} A); efficiency needs a positive input power — check the input source and current reading`,
    );
  }
  return { pinW, poutW: voutV * ioutA };
}

/**
 * Conversion efficiency η = P_out / P_in × 100, from DC readings at the module terminals.
 * @param vinV input voltage (V)
 * @param iinA input current (A)
 * @param voutV output voltage (V)
 * @param ioutA output current (A)
 * @returns efficiency in percent
 * @throws RangeError when an argument is not finite or the input power is ≤ 0 W
 */
export function efficiencyPct(vinV: number, iinA: number, voutV: number, ioutA: number): number {
  const { pinW, poutW } = powers(vinV, iinA, voutV, ioutA);
  return (poutW / pinW) * 100;
}

/**
 * Power dissipated in the module, P_in − P_out.
 * @param vinV input voltage (V)
 * @param iinA input current (A)
 * @param voutV output voltage (V)
 * @param ioutA output current (A)
 * @returns loss in watts
 * @throws RangeError when an argument is not finite or the input power is ≤ 0 W
 */
export function lossW(vinV: number, iinA: number, voutV: number, ioutA: number): number {
  const { pinW, poutW } = powers(vinV, iinA, voutV, ioutA);
  return pinW - poutW;
}
