/*
 * The settings of the limits suggested from characterization data (x̄ ± k·s, guarded by U): their bounds and
 * defaults, read by the API's checks (characterization/dto) and by the Limits-from-data screen's fields, so the
 * screen refuses exactly what the server refuses. Pure TypeScript, no imports.
 */

/** Default half-width multiplier: x̄ ± 4·s puts Ppk at 4/3 ≈ 1.33 at the suggestion (common practice, no source). */
export const DEFAULT_SUGGESTION_K = 4;
/** Narrowest k accepted: below ±0.5·s the suggestion would reject most of the pilot build itself. */
export const SUGGESTION_K_MIN = 0.5;
/** Widest k accepted: beyond ±10·s the suggestion says nothing about the data. */
export const SUGGESTION_K_MAX = 10;
/** Default expanded uncertainty U (k = 2) the suggestion is guarded by: none (a data set is not tied to a fixture). */
export const DEFAULT_SUGGESTION_UNCERTAINTY = 0;

/** The problem with a chosen k, in the words the API uses, or null when it is accepted. */
export function suggestionKProblem(k: number | undefined): string | null {
  if (k === undefined || !Number.isFinite(k)) return `k must be a number from ${SUGGESTION_K_MIN} to ${SUGGESTION_K_MAX}`;
  if (k < SUGGESTION_K_MIN) return `k must be at least ${SUGGESTION_K_MIN}`;
  if (k > SUGGESTION_K_MAX) return `k must be at most ${SUGGESTION_K_MAX}`;
  return null;
}

/** The problem with a chosen U, in the words the API uses, or null when it is accepted. */
export function suggestionUncertaintyProblem(u: number | undefined): string | null {
  if (u === undefined || !Number.isFinite(u)) return 'uncertainty must be a number, 0 or more';
  if (u < 0) return 'uncertainty must be 0 or more';
  return null;
}
