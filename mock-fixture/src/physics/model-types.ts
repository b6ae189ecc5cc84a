/** Data shapes shared by the physics functions. All numbers are SI unless the name says otherwise. */

/** The freewheeling path: a diode (non-synchronous) or a low-side switch (synchronous, diode emulation at light load). */
export type Rectifier = { kind: 'diode'; forwardDropV: number } | { kind: 'synchronous'; ronLowOhm: number };

/** What the catalogue says about a product (the figures in docs/architecture.md). */
export interface ProductRatings {
  partNumber: string;
  name: string;
  vinMinV: number;
  vinNomV: number;
  vinMaxV: number;
  voutV: number;
  ioutRatedA: number;
  /** Anchored JavaScript regular expression every serial of the product matches, when known. */
  serialPattern?: string;
}

/** The power-stage and control design of a product; one unit varies around it. */
export interface BuckDesign {
  switchingHz: number;
  inductanceH: number;
  inductorDcrOhm: number;
  capacitanceF: number;
  esrOhm: number;
  /** High-side switch on-resistance */
  ronHighOhm: number;
  rectifier: Rectifier;
  /** Controller and gate-drive supply current drawn from the input whenever the module runs */
  quiescentA: number;
  /** k in P_sw = k·V_in·I·f; equals ½·(t_rise + t_fall) of the switch node, in seconds */
  switchingLossS: number;
  /** Closed-loop natural frequency and damping ratio seen in the load-step response */
  loopNaturalHz: number;
  loopDamping: number;
  /** Set-point tolerance (±, % of nominal) the design is built to; units spread inside it */
  setPointTolerancePct: number;
  /** Closed-loop DC output resistance (droop) */
  outputResistanceOhm: number;
  /** Static line sensitivity of the output, % of V_out per volt of input change */
  lineRegulationPctPerV: number;
  /** How far the output rises, % of V_out, at zero load in discontinuous conduction */
  dcmRisePct: number;
  /** Output current above which the protection folds the output back */
  currentLimitA: number;
  /** Output voltage during fold-back, as a fraction of the set point (hiccup average) */
  foldbackVoutFraction: number;
  /** Output current during fold-back, as a fraction of the current limit */
  foldbackCurrentFraction: number;
  /** Largest duty cycle the controller can reach (minimum off-time) */
  maxDuty: number;
  /** Input under-voltage lock-out and over-voltage shut-down thresholds */
  uvloV: number;
  ovloV: number;
  /** Case temperature rise per watt of loss, still air */
  thermalResistanceCPerW: number;
}

/** A product of the simulator's catalogue: its ratings and its design. */
export interface ProductModel extends ProductRatings {
  family: string;
  design: BuckDesign;
}

/** One modelled unit: the product design after per-unit variation and any injected defect. */
export interface UnitModel {
  serial: string;
  partNumber: string;
  lotCode: string;
  ratings: ProductRatings;
  design: BuckDesign;
  /** The output the loop regulates to at nominal line and zero droop */
  setPointV: number;
  /** Output pins not connected: the terminals read nothing while the converter idles */
  outputOpen: boolean;
  /** Over-current protection missing: the output sags instead of folding back */
  noProtection: boolean;
}
