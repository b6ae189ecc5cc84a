import { guardedLimits } from '../measure/acceptance';
import { requireFinite, requireFiniteArray } from '../measure/guards';
import { mean, ppmOutside, sampleStdDev, type PpmOutside } from './capability';

/**
 * Limits proposed from characterization data (a pilot build), for the engineer to accept into a draft plan.
 *
 * - Tolerance (test) limits: x̄ ± k·s, with s the sample standard deviation (n − 1); the engineer picks k
 *   (k = 3 puts each limit 3 s from the mean; wider k leaves room for drift between builds). One side may be
 *   dropped for a one-sided quantity.
 * - Acceptance limits: the tolerance limits guarded by the fixture's expanded uncertainty U (k = 2), per
 *   ILAC-G8:09/2019 (guarded acceptance, w = U): lower AL = TL + U, upper AL = TL − U. The guard band is the one
 *   rule in `measure/acceptance.ts` (guardedLimits), so the plan editor, the engine and this proposal agree.
 * - Expected fraction outside, in ppm, from the normal model N(x̄, s) of the pilot data: outside the tolerance
 *   limits (truly out of specification, if the model holds) and outside the acceptance limits (what the station
 *   will reject, before measurement error; the difference is the yield the guard band costs).
 * The expected fractions lean on normality and on the pilot being representative; show the normality test next
 * to them.
 */

export interface LimitProposalInput {
  /** mean of the characterization data, unit of the quantity */
  mean: number;
  /** sample standard deviation, same unit, > 0 */
  sigma: number;
  /** half-width multiplier: limits at mean ± k·sigma, > 0 */
  k: number;
  /** expanded measurement uncertainty U (k = 2), same unit, ≥ 0 */
  uncertainty: number;
  /** which limits to propose; default both */
  sides?: 'both' | 'lower' | 'upper';
}

export interface LimitProposal {
  tolerance: { low?: number; high?: number };
  acceptance: { low?: number; high?: number };
  ppmOutsideTolerance: PpmOutside;
  ppmOutsideAcceptance: PpmOutside;
}

/**
 * Proposes tolerance and guarded acceptance limits with their expected ppm outside.
 * @throws RangeError on bad input, or when U closes the acceptance zone (U ≥ k·sigma on a two-sided proposal)
 */
export function proposeLimits(input: LimitProposalInput): LimitProposal {
  const { mean: mu, sigma, k, uncertainty } = input;
  requireFinite('mean', mu);
  requireFinite('sigma', sigma);
  if (!(sigma > 0)) throw new RangeError(`sigma must be greater than 0, got ${sigma}; the data do not vary`);
  requireFinite('k', k);
  if (!(k > 0)) throw new RangeError(`k must be greater than 0, got ${k}`);
  requireFinite('uncertainty', uncertainty);
  if (uncertainty < 0) throw new RangeError(`uncertainty must be 0 or more, got ${uncertainty}`);
  const sides = input.sides ?? 'both';
  if (sides !== 'both' && sides !== 'lower' && sides !== 'upper') {
    throw new RangeError(`sides must be "both", "lower" or "upper", got "${String(sides)}"`);
  }
  const tolerance = {
    ...(sides !== 'upper' ? { low: mu - k * sigma } : {}),
    ...(sides !== 'lower' ? { high: mu + k * sigma } : {}),
  };
  const acceptance = guardedLimits({ ...tolerance, uncertainty, rule: 'guarded' });
  return {
    tolerance,
    acceptance,
    ppmOutsideTolerance: ppmOutside(mu, sigma, { lsl: tolerance.low, usl: tolerance.high }),
    ppmOutsideAcceptance: ppmOutside(mu, sigma, { lsl: acceptance.low, usl: acceptance.high }),
  };
}

/**
 * The same from raw characterization values (mean and sample standard deviation computed here).
 * @param values at least 2 values
 */
export function proposeLimitsFromValues(
  values: readonly number[],
  options: { k: number; uncertainty: number; sides?: 'both' | 'lower' | 'upper' },
): LimitProposal & { n: number; mean: number; sigma: number } {
  requireFiniteArray('values', values, 2);
  const mu = mean(values);
  const sigma = sampleStdDev(values);
  return { n: values.length, mean: mu, sigma, ...proposeLimits({ mean: mu, sigma, ...options }) };
}
