import { requireFinite, requireFiniteArray, requirePositive } from './guards';

/**
 * Load and line regulation. Published definitions disagree on the denominator and even on the quantity
 * (Microchip Developer Help, IEC 61204, Wikipedia "Line regulation" and others), so every function here is named
 * after one definition and a plan step states which one it wants. The identifiers LR1, LR2, LR4, LR5 and LN2, LN3,
 * LN4 are ours; docs/reference.md lists each definition with its source.
 */

export type LoadRegulationDefinition = 'full_load' | 'nominal';

export interface LoadRegulationInput {
  /** Output voltage at no load (V) */
  vNoLoadV: number;
  /** Output voltage at rated (full) load (V) */
  vFullLoadV: number;
  /** Nominal output voltage of the product (V) */
  vNomV: number;
  /** `full_load`: LR1, divide by V_FL; `nominal`: LR2, divide by V_nom */
  definition: LoadRegulationDefinition;
}

/**
 * Load regulation from the no-load and full-load output voltages.
 *
 * - `full_load` (LR1): (V_NL − V_FL) / V_FL × 100
 * - `nominal` (LR2, IEC 61204 as summarised by tnlab.org): (V_NL − V_FL) / V_nom × 100
 *
 * The sign is kept: positive when the output falls as load is applied (the usual case), negative when it rises.
 * @returns load regulation in percent
 * @throws RangeError on non-finite input, a denominator ≤ 0 V, or an unknown definition
 */
export function loadRegulationPct(input: LoadRegulationInput): number {
  const { vNoLoadV, vFullLoadV, vNomV, definition } = input;
  requireFinite('vNoLoadV', vNoLoadV);
  requireFinite('vFullLoadV', vFullLoadV);
  let denominatorV: number;
  if (definition === 'full_load') {
    requirePositive('vFullLoadV', vFullLoadV);
    denominatorV = vFullLoadV;
  } else if (definition === 'nominal') {
    requirePositive('vNomV', vNomV);
    denominatorV = vNomV;
  } else {
    throw new RangeError(`unknown load-regulation definition "${String(definition)}"; use "full_load" or "nominal"`);
  }
  return ((vNoLoadV - vFullLoadV) / denominatorV) * 100;
}

/**
 * LR4: the largest deviation, either sign, of the outputs over a load sweep from the output at a reference
 * load (often 50 %), in percent of that reference output. IEC 61204 clause 2 asks for the maximum change,
 * not a typical one, which is why the largest magnitude is reported.
 * @param readingsV output voltages over the load sweep (V)
 * @param vRefV output voltage at the reference load (V)
 * @returns largest |V − V_ref| / V_ref × 100, in percent
 */
export function loadRegulationRefPct(readingsV: number[], vRefV: number): number {
  requireFiniteArray('readingsV', readingsV);
  requirePositive('vRefV', vRefV);
  let worstV = 0;
  for (const v of readingsV) worstV = Math.max(worstV, Math.abs(v - vRefV));
  return (worstV / vRefV) * 100;
}

/**
 * LR5: load regulation expressed as a DC output resistance, R = −ΔV/ΔI = (V1 − V2)/(I2 − I1).
 * Positive when the output droops as current rises.
 * @param v1V output voltage at the first load (V)
 * @param i1A first load current (A)
 * @param v2V output voltage at the second load (V)
 * @param i2A second load current (A)
 * @returns output resistance in milliohms
 * @throws RangeError when the two currents are equal
 */
export function outputResistanceMohm(v1V: number, i1A: number, v2V: number, i2A: number): number {
  requireFinite('v1V', v1V);
  requireFinite('i1A', i1A);
  requireFinite('v2V', v2V);
  requireFinite('i2A', i2A);
  if (i2A === i1A) throw new RangeError(`output resistance needs two different load currents, got ${i1A} A twice`);
  return ((v1V - v2V) / (i2A - i1A)) * 1000;
}

/**
 * LN3: output spread over the line range at a fixed load, (V_o,max − V_o,min) / V_o,ref × 100.
 * Not the same quantity as LN1 (ΔV_o/ΔV_i, see {@link lineSensitivityPct}).
 * @param voutsV output voltages, one per input voltage (V)
 * @param vRefV reference output, normally the one at nominal line (V)
 * @returns line regulation in percent
 */
export function lineRegulationPct(voutsV: number[], vRefV: number): number {
  requireFiniteArray('voutsV', voutsV, 2);
  requirePositive('vRefV', vRefV);
  return ((Math.max(...voutsV) - Math.min(...voutsV)) / vRefV) * 100;
}

function spanV(name: string, xs: number[]): number {
  const s = Math.max(...xs) - Math.min(...xs);
  if (s <= 0) throw new RangeError(`${name} must span more than 0 V to give a per-volt figure`);
  return s;
}

/**
 * LN2, datasheet style: ΔV_o / (V_o,ref · ΔV_i) × 100, with ΔV_o the output spread and ΔV_i the input span.
 * @param voutsV output voltages (V)
 * @param vinsV the input voltages they were taken at (V), same length
 * @param vRefV reference output (V)
 * @returns line regulation in percent per volt of input change (%/V)
 */
export function lineRegulationPctPerV(voutsV: number[], vinsV: number[], vRefV: number): number {
  requireFiniteArray('voutsV', voutsV, 2);
  requireFiniteArray('vinsV', vinsV, 2);
  if (vinsV.length !== voutsV.length) {
    throw new RangeError(`voutsV has ${voutsV.length} readings but vinsV has ${vinsV.length}; give one output per input`);
  }
  return lineRegulationPct(voutsV, vRefV) / spanV('vinsV', vinsV);
}

/**
 * LN1: ΔV_o / ΔV_i × 100, a dimensionless ratio of output change to input change (Wikipedia "Line
 * regulation"). Kept separate so nobody mistakes it for LN3; for a 5 V output the two differ by ~2×.
 * @param voutsV output voltages (V)
 * @param vinsV input voltages (V), same length
 * @returns output change per input change, in percent
 */
export function lineSensitivityPct(voutsV: number[], vinsV: number[]): number {
  requireFiniteArray('voutsV', voutsV, 2);
  requireFiniteArray('vinsV', vinsV, 2);
  if (vinsV.length !== voutsV.length) {
    throw new RangeError(`voutsV has ${voutsV.length} readings but vinsV has ${vinsV.length}; give one output per input`);
  }
  return ((Math.max(...voutsV) - Math.min(...voutsV)) / spanV('vinsV', vinsV)) * 100;
}

/**
 * LN4: the largest deviation of the outputs from the output at nominal line, in percent of it
 * (Powermate knowledge base, "What is line regulation").
 * @param voutsV output voltages over the line range (V)
 * @param vNomLineV output at nominal input (V)
 * @returns largest |V − V_nomline| / V_nomline × 100, in percent
 */
export function lineDeviationPct(voutsV: number[], vNomLineV: number): number {
  requireFiniteArray('voutsV', voutsV);
  requirePositive('vNomLineV', vNomLineV);
  let worstV = 0;
  for (const v of voutsV) worstV = Math.max(worstV, Math.abs(v - vNomLineV));
  return (worstV / vNomLineV) * 100;
}
