/**
 * Load-step response of the regulated output, modelled as an under-damped second-order loop.
 * An engineering approximation, not a circuit simulation: see docs/fixture-protocol.md.
 */

/** Angular decay rate σ = ζ·ω_n and damped angular frequency ω_d = ω_n·√(1 − ζ²), in rad/s. */
export function dampedFrequencies(naturalHz: number, damping: number): { sigma: number; omegaD: number } {
  const omegaN = 2 * Math.PI * naturalHz;
  return { sigma: damping * omegaN, omegaD: omegaN * Math.sqrt(1 - damping * damping) };
}

/**
 * Unit step response of ω_n² / (s² + 2ζω_n·s + ω_n²) for 0 < ζ < 1:
 * y(t) = 1 − e^(−σt)·(cos ω_d t + (σ/ω_d)·sin ω_d t). Returns 0 for t < 0.
 * @param tS time after the step (s)
 */
export function secondOrderStepResponse(tS: number, naturalHz: number, damping: number): number {
  if (tS < 0) return 0;
  const { sigma, omegaD } = dampedFrequencies(naturalHz, damping);
  return 1 - Math.exp(-sigma * tS) * (Math.cos(omegaD * tS) + (sigma / omegaD) * Math.sin(omegaD * tS));
}

/** Fractional overshoot of that step response, M_p = exp(−πζ / √(1 − ζ²)). */
export function secondOrderOvershoot(damping: number): number {
  return Math.exp((-Math.PI * damping) / Math.sqrt(1 - damping * damping));
}

/** Time of the first peak of the step response, t_p = π / ω_d, in seconds. */
export function secondOrderPeakTimeS(naturalHz: number, damping: number): number {
  return Math.PI / dampedFrequencies(naturalHz, damping).omegaD;
}

/** Time of the first extremum of e^(−σt)·sin(ω_d t): tan(ω_d t) = ω_d/σ. */
function pulsePeakTimeS(sigma: number, omegaD: number): number {
  return Math.atan2(omegaD, sigma) / omegaD;
}

/**
 * The loop's deviation pulse e^(−σt)·sin(ω_d t), scaled so its first extremum is exactly 1. Its later
 * extrema alternate in sign and shrink by exp(−πζ/√(1 − ζ²)) each half period. Returns 0 for t < 0.
 */
export function normalisedDeviationPulse(tS: number, naturalHz: number, damping: number): number {
  if (tS < 0) return 0;
  const { sigma, omegaD } = dampedFrequencies(naturalHz, damping);
  const tPeak = pulsePeakTimeS(sigma, omegaD);
  const peak = Math.exp(-sigma * tPeak) * Math.sin(omegaD * tPeak);
  return (Math.exp(-sigma * tS) * Math.sin(omegaD * tS)) / peak;
}

/**
 * Peak capacitive deviation for a load step ΔI: the output capacitor alone supplies the difference until
 * the loop catches up, roughly one loop time constant, giving ΔV ≈ ΔI / (2π·f_n·C). Returns volts.
 * @param deltaA load change (A)
 * @param naturalHz loop natural frequency (Hz)
 * @param capacitanceF output capacitance (F)
 */
export function capacitiveStepDeviationV(deltaA: number, naturalHz: number, capacitanceF: number): number {
  return deltaA / (2 * Math.PI * naturalHz * capacitanceF);
}

/** Everything the load-step waveform needs. */
export interface LoadStepParams {
  /** Steady output before and after the step (droop and mode included), V */
  vBeforeV: number;
  vAfterV: number;
  /** Load change to − from; positive when load is applied (output dips) */
  deltaA: number;
  naturalHz: number;
  damping: number;
  capacitanceF: number;
  esrOhm: number;
  /** Time the inductor current needs to slew to the new load, L·|ΔI| / V_L, in seconds */
  slewS: number;
}

/**
 * Output voltage at time tS after a load step (t ≤ 0 is before the step; the load changes at 0+):
 *   v(t) = V_after + (V_before − V_after)·(1 − y(t)) − ΔI·Z·p(t) − ΔI·ESR·max(0, 1 − t/t_slew)
 * where y is the second-order step response (the DC droop change settles with the loop's overshoot),
 * p the normalised deviation pulse, Z = 1/(2π f_n C) and the last term the ESR step while the
 * inductor current slews.
 * @returns volts
 */
export function loadStepVoltageV(tS: number, p: LoadStepParams): number {
  if (tS <= 0) return p.vBeforeV;
  const settle = secondOrderStepResponse(tS, p.naturalHz, p.damping);
  const pulse = normalisedDeviationPulse(tS, p.naturalHz, p.damping);
  const esrPart = p.slewS > 0 ? Math.max(0, 1 - tS / p.slewS) : 0;
  return (
    p.vAfterV +
    (p.vBeforeV - p.vAfterV) * (1 - settle) -
    capacitiveStepDeviationV(p.deltaA, p.naturalHz, p.capacitanceF) * pulse -
    p.deltaA * p.esrOhm * esrPart
  );
}
