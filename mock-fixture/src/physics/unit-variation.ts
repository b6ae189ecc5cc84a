import type { BuckDesign, ProductModel, UnitModel } from './model-types';
import { RandomStream } from './prng';

/** Which unit is clamped: its serial, part number and lot code. */
export interface UnitIdentity {
  serial: string;
  partNumber: string;
  lotCode: string;
}

/*
 * Spread of each design figure from unit to unit, as one standard deviation relative to the design value.
 * Rough figures for passive and semiconductor tolerances (common practice, no source). Draws are clipped
 * at ±4σ.
 */
const RELATIVE_SPREAD = {
  switchingHz: 0.02,
  inductanceH: 0.05,
  inductorDcrOhm: 0.05,
  capacitanceF: 0.06,
  esrOhm: 0.1,
  ronHighOhm: 0.06,
  ronLowOhm: 0.06,
  quiescentA: 0.08,
  switchingLossS: 0.08,
  loopNaturalHz: 0.05,
  loopDamping: 0.05,
  outputResistanceOhm: 0.1,
  currentLimitA: 0.03,
  thermalResistanceCPerW: 0.05,
} as const;

/** Standard deviation of a diode's forward drop from part to part, V (common practice, no source). */
const DIODE_DROP_SPREAD_V = 0.01;

/**
 * The modelled unit before any defect: the product design varied deterministically from the serial, plus a
 * small shared offset per lot (so lots differ a little, as real lots do).
 * Set-point error: σ = tolerance/4 per unit and σ = tolerance/12 per lot, so a good population sits
 * around Cpk ≈ 1.3 against the design tolerance.
 */
export function varyUnit(product: ProductModel, identity: UnitIdentity): UnitModel {
  const rng = new RandomStream(`unit|${identity.partNumber}|${identity.serial}`);
  const lotRng = new RandomStream(`lot|${identity.partNumber}|${identity.lotCode}`);
  const d = product.design;
  const vary = (value: number, spread: number): number => value * (1 + spread * rng.normal());
  const s = RELATIVE_SPREAD;
  const design: BuckDesign = {
    ...d,
    switchingHz: vary(d.switchingHz, s.switchingHz),
    inductanceH: vary(d.inductanceH, s.inductanceH),
    inductorDcrOhm: vary(d.inductorDcrOhm, s.inductorDcrOhm),
    capacitanceF: vary(d.capacitanceF, s.capacitanceF),
    esrOhm: vary(d.esrOhm, s.esrOhm),
    ronHighOhm: vary(d.ronHighOhm, s.ronHighOhm),
    rectifier:
      d.rectifier.kind === 'diode'
        ? { kind: 'diode', forwardDropV: d.rectifier.forwardDropV + DIODE_DROP_SPREAD_V * rng.normal() }
        : { kind: 'synchronous', ronLowOhm: vary(d.rectifier.ronLowOhm, s.ronLowOhm) },
    quiescentA: vary(d.quiescentA, s.quiescentA),
    switchingLossS: vary(d.switchingLossS, s.switchingLossS),
    loopNaturalHz: vary(d.loopNaturalHz, s.loopNaturalHz),
    loopDamping: clampDamping(vary(d.loopDamping, s.loopDamping)),
    outputResistanceOhm: vary(d.outputResistanceOhm, s.outputResistanceOhm),
    currentLimitA: vary(d.currentLimitA, s.currentLimitA),
    thermalResistanceCPerW: vary(d.thermalResistanceCPerW, s.thermalResistanceCPerW),
  };
  const tolFraction = d.setPointTolerancePct / 100;
  const errorFraction = (tolFraction / 4) * rng.normal() + (tolFraction / 12) * lotRng.normal();
  return {
    serial: identity.serial,
    partNumber: identity.partNumber,
    lotCode: identity.lotCode,
    ratings: {
      partNumber: product.partNumber,
      name: product.name,
      vinMinV: product.vinMinV,
      vinNomV: product.vinNomV,
      vinMaxV: product.vinMaxV,
      voutV: product.voutV,
      ioutRatedA: product.ioutRatedA,
      serialPattern: product.serialPattern,
    },
    design,
    setPointV: product.voutV * (1 + errorFraction),
    outputOpen: false,
    noProtection: false,
  };
}

/** Keep the loop damping inside the under-damped range the load-step model handles. */
export function clampDamping(damping: number): number {
  return Math.min(0.95, Math.max(0.05, damping));
}
