import type { BuckDesign, ProductModel, UnitModel } from '../physics/model-types';

/**
 * Test helpers: a lossless unit shaped like the self-constructed buck example (24 V → 3.3 V, 22 µH,
 * 250 kHz, 100 µF, 10 mΩ), and a way to model a catalogue product at its exact design values.
 * Not exported from the package.
 */
export const WORKED_EXAMPLE_DESIGN: BuckDesign = {
  switchingHz: 250e3,
  inductanceH: 22e-6,
  inductorDcrOhm: 0,
  capacitanceF: 100e-6,
  esrOhm: 0.01,
  ronHighOhm: 0,
  rectifier: { kind: 'synchronous', ronLowOhm: 0 },
  quiescentA: 0,
  switchingLossS: 0,
  loopNaturalHz: 20e3,
  loopDamping: 0.5,
  setPointTolerancePct: 1.5,
  outputResistanceOhm: 0,
  lineRegulationPctPerV: 0,
  dcmRisePct: 0,
  currentLimitA: 9,
  foldbackVoutFraction: 0.06,
  foldbackCurrentFraction: 0.3,
  maxDuty: 0.95,
  uvloV: 10,
  ovloV: 40,
  thermalResistanceCPerW: 20,
};

export function workedExampleUnit(overrides: Partial<BuckDesign> = {}, unit: Partial<UnitModel> = {}): UnitModel {
  return {
    serial: 'WORKED-1',
    partNumber: 'WORKED',
    lotCode: 'LOT',
    ratings: { partNumber: 'WORKED', name: 'worked example', vinMinV: 18, vinNomV: 24, vinMaxV: 36, voutV: 3.3, ioutRatedA: 5 },
    design: { ...WORKED_EXAMPLE_DESIGN, ...overrides },
    setPointV: 3.3,
    outputOpen: false,
    noProtection: false,
    ...unit,
  };
}

/** A product modelled at its design values (no per-unit variation). */
export function nominalUnit(product: ProductModel, unit: Partial<UnitModel> = {}): UnitModel {
  return {
    serial: 'NOMINAL',
    partNumber: product.partNumber,
    lotCode: 'LOT',
    ratings: product,
    design: product.design,
    setPointV: product.voutV,
    outputOpen: false,
    noProtection: false,
    ...unit,
  };
}
