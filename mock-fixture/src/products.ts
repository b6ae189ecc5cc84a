import type { BuckDesign, ProductModel, ProductRatings } from './physics/model-types';

/*
 * Design figures for the three demo modules of the invented Orrin Bay plant (docs/architecture.md).
 * They are chosen to be plausible for small modules of these ratings, not taken from any real part:
 * ceramic/polymer output capacitors, a few-µH shielded inductor, switching at 300–500 kHz, tens of mΩ
 * switches. docs/fixture-protocol.md tabulates what a good unit of each reads.
 */

const BK0503: ProductModel = {
  partNumber: 'OB-BK0503',
  name: 'Buck module 12 V to 5 V, 3 A',
  family: 'BK compact',
  vinMinV: 9,
  vinNomV: 12,
  vinMaxV: 18,
  voutV: 5.0,
  ioutRatedA: 3.0,
  serialPattern: '^K5A-\\d{4}-\\d{5}$',
  design: {
    switchingHz: 500e3,
    inductanceH: 10e-6,
    inductorDcrOhm: 0.03,
    capacitanceF: 47e-6,
    esrOhm: 0.02,
    ronHighOhm: 0.06,
    rectifier: { kind: 'synchronous', ronLowOhm: 0.03 },
    quiescentA: 0.008,
    switchingLossS: 10e-9,
    loopNaturalHz: 40e3,
    loopDamping: 0.5,
    setPointTolerancePct: 1.5,
    outputResistanceOhm: 0.006,
    lineRegulationPctPerV: 0.01,
    dcmRisePct: 0.4,
    currentLimitA: 4.5,
    foldbackVoutFraction: 0.06,
    foldbackCurrentFraction: 0.3,
    maxDuty: 0.92,
    uvloV: 7.5,
    ovloV: 20,
    thermalResistanceCPerW: 28,
  },
};

const BK3305: ProductModel = {
  partNumber: 'OB-BK3305',
  name: 'Buck module 24 V to 3.3 V, 5 A',
  family: 'BK compact',
  vinMinV: 18,
  vinNomV: 24,
  vinMaxV: 36,
  voutV: 3.3,
  ioutRatedA: 5.0,
  serialPattern: '^K3E-\\d{4}-\\d{5}$',
  design: {
    switchingHz: 400e3,
    inductanceH: 6.8e-6,
    inductorDcrOhm: 0.012,
    capacitanceF: 150e-6,
    esrOhm: 0.008,
    ronHighOhm: 0.04,
    rectifier: { kind: 'synchronous', ronLowOhm: 0.012 },
    quiescentA: 0.006,
    switchingLossS: 10e-9,
    loopNaturalHz: 40e3,
    loopDamping: 0.55,
    setPointTolerancePct: 1.5,
    outputResistanceOhm: 0.0025,
    lineRegulationPctPerV: 0.008,
    dcmRisePct: 0.4,
    currentLimitA: 7.5,
    foldbackVoutFraction: 0.08,
    foldbackCurrentFraction: 0.3,
    maxDuty: 0.9,
    uvloV: 15,
    ovloV: 40,
    thermalResistanceCPerW: 22,
  },
};

const BK1202: ProductModel = {
  partNumber: 'OB-BK1202',
  name: 'Buck module 24 V to 12 V, 2 A',
  family: 'BK rail',
  vinMinV: 16,
  vinNomV: 24,
  vinMaxV: 32,
  voutV: 12.0,
  ioutRatedA: 2.0,
  serialPattern: '^KC2-\\d{4}-\\d{5}$',
  design: {
    switchingHz: 300e3,
    inductanceH: 33e-6,
    inductorDcrOhm: 0.08,
    capacitanceF: 47e-6,
    esrOhm: 0.025,
    ronHighOhm: 0.12,
    rectifier: { kind: 'diode', forwardDropV: 0.5 },
    quiescentA: 0.005,
    switchingLossS: 20e-9,
    loopNaturalHz: 25e3,
    loopDamping: 0.5,
    setPointTolerancePct: 1.5,
    outputResistanceOhm: 0.01,
    lineRegulationPctPerV: 0.006,
    dcmRisePct: 0.3,
    currentLimitA: 3.0,
    foldbackVoutFraction: 0.05,
    foldbackCurrentFraction: 0.3,
    maxDuty: 0.93,
    uvloV: 14,
    ovloV: 35,
    thermalResistanceCPerW: 20,
  },
};

/** The simulator's built-in catalogue, keyed by part number. */
export const PRODUCTS: Readonly<Record<string, ProductModel>> = Object.freeze({
  [BK0503.partNumber]: BK0503,
  [BK3305.partNumber]: BK3305,
  [BK1202.partNumber]: BK1202,
});

/** Ratings enough to model an unknown part (the demo catalogue columns). */
export type GenericRatings = Pick<ProductRatings, 'partNumber' | 'voutV' | 'ioutRatedA' | 'vinNomV'> &
  Partial<Pick<ProductRatings, 'name' | 'vinMinV' | 'vinMaxV' | 'serialPattern'>>;

/**
 * A plausible design for a part the catalogue does not know, built from its ratings alone. Rules used
 * (common practice, no source): inductor ripple 30 % of rated current at nominal line, 400 kHz,
 * conduction loss about 3 % and switching loss about 1.5 % of rated output power, loop at f_sw/10,
 * output capacitance sized for a 3 % dip on a half-load step, ESR ripple 0.3 % of V_out.
 * @throws RangeError when the ratings cannot describe a step-down converter
 */
export function genericProduct(ratings: GenericRatings): ProductModel {
  const { voutV, ioutRatedA, vinNomV } = ratings;
  const vinMinV = ratings.vinMinV ?? vinNomV * 0.75;
  const vinMaxV = ratings.vinMaxV ?? vinNomV * 1.5;
  for (const [name, value] of Object.entries({ voutV, ioutRatedA, vinNomV, vinMinV, vinMaxV })) {
    if (!Number.isFinite(value) || value <= 0) throw new RangeError(`${name} must be a positive number, got ${value}`);
  }
  if (vinMinV > vinNomV || vinNomV > vinMaxV) {
    throw new RangeError(`input range must satisfy min ≤ nom ≤ max, got ${vinMinV} / ${vinNomV} / ${vinMaxV} V`);
  }
  if (voutV >= vinMinV * 0.95) {
    throw new RangeError(`a buck needs the output (${voutV} V) below the lowest input (${vinMinV} V) with some headroom`);
  }
  const switchingHz = 400e3;
  const duty = voutV / vinNomV;
  const rippleApp = 0.3 * ioutRatedA;
  const inductanceH = (voutV * (1 - duty)) / (rippleApp * switchingHz);
  const loopNaturalHz = switchingHz / 10;
  const capacitanceF = (0.5 * ioutRatedA) / (2 * Math.PI * loopNaturalHz * 0.03 * voutV);
  const conductionOhm = (0.03 * voutV) / ioutRatedA;
  const design: BuckDesign = {
    switchingHz,
    inductanceH,
    inductorDcrOhm: 0.35 * conductionOhm,
    capacitanceF,
    esrOhm: (0.003 * voutV) / rippleApp,
    ronHighOhm: 0.4 * conductionOhm,
    rectifier: { kind: 'synchronous', ronLowOhm: 0.25 * conductionOhm },
    quiescentA: Math.max(0.002, (0.005 * voutV * ioutRatedA) / vinNomV),
    switchingLossS: (0.015 * voutV) / (vinNomV * switchingHz),
    loopNaturalHz,
    loopDamping: 0.5,
    setPointTolerancePct: 2,
    outputResistanceOhm: (0.002 * voutV) / ioutRatedA,
    lineRegulationPctPerV: 0.01,
    dcmRisePct: 0.4,
    currentLimitA: 1.5 * ioutRatedA,
    foldbackVoutFraction: 0.06,
    foldbackCurrentFraction: 0.3,
    maxDuty: 0.92,
    uvloV: vinMinV * 0.85,
    ovloV: vinMaxV * 1.1,
    thermalResistanceCPerW: 25,
  };
  return {
    partNumber: ratings.partNumber,
    name: ratings.name ?? `Generic buck ${vinNomV} V to ${voutV} V, ${ioutRatedA} A`,
    family: 'generic',
    vinMinV,
    vinNomV,
    vinMaxV,
    voutV,
    ioutRatedA,
    serialPattern: ratings.serialPattern,
    design,
  };
}

/** Whether a catalogue entry is a full model or only ratings for {@link genericProduct}. */
export function isProductModel(entry: ProductModel | GenericRatings): entry is ProductModel {
  return (entry as ProductModel).design !== undefined;
}

/**
 * Look a part number up in the extra products first, then the built-in catalogue.
 * @returns the model, or undefined when the part is unknown
 */
export function findProduct(
  partNumber: string,
  extra: Readonly<Record<string, ProductModel | GenericRatings>> = {},
): ProductModel | undefined {
  const entry = extra[partNumber] ?? PRODUCTS[partNumber];
  if (!entry) return undefined;
  return isProductModel(entry) ? entry : genericProduct({ ...entry, partNumber });
}
