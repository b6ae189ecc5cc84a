/**
 * Control-chart constants for subgroups of n = 2..10 normal observations, to the three decimals of the printed
 * tables: Montgomery, Introduction to Statistical Quality Control, Appendix VI "Factors for Constructing Variables
 * Control Charts", and the same values in Table A.22 "Factors for Constructing Control Charts" of a common
 * engineering-statistics textbook. (ASTM E2587 is the usual standard citation for such a table; its text was not
 * consulted here.)
 *
 * - d2: expected range of n standard normal observations, E(R) = d2·σ (so σ̂ = R̄/d2);
 * - d3: standard deviation of that range;
 * - A2 = 3/(d2·√n): X̄ chart limits X̿ ± A2·R̄;
 * - D3 = max(0, 1 − 3·d3/d2), D4 = 1 + 3·d3/d2: R chart limits D3·R̄ and D4·R̄;
 * - E2 = 3/d2 (n = 2 for the moving range of two): individuals chart limits x̄ ± E2·MR̄.
 *
 * The printed tables disagree in the last digit for a few entries (D4 at n = 3 is printed 2.574 or 2.575; the
 * exact value is 2.5746); these are the Appendix VI values. The tests recompute every constant by numerical
 * integration of the range distribution and hold the table to ±0.001.
 */
export interface ChartConstants {
  n: number;
  d2: number;
  d3: number;
  A2: number;
  D3: number;
  D4: number;
  /** 3/d2 */
  E2: number;
}

const TABLE: ReadonlyArray<[n: number, d2: number, d3: number, A2: number, D3: number, D4: number]> = [
  [2, 1.128, 0.853, 1.88, 0, 3.267],
  [3, 1.693, 0.888, 1.023, 0, 2.574],
  [4, 2.059, 0.88, 0.729, 0, 2.282],
  [5, 2.326, 0.864, 0.577, 0, 2.114],
  [6, 2.534, 0.848, 0.483, 0, 2.004],
  [7, 2.704, 0.833, 0.419, 0.076, 1.924],
  [8, 2.847, 0.82, 0.373, 0.136, 1.864],
  [9, 2.97, 0.808, 0.337, 0.184, 1.816],
  [10, 3.078, 0.797, 0.308, 0.223, 1.777],
];

/** Smallest and largest subgroup size the table covers. */
export const MIN_SUBGROUP_SIZE = 2;
export const MAX_SUBGROUP_SIZE = 10;

/**
 * Constants for subgroup size n.
 * @throws RangeError when n is not a whole number from 2 to 10
 */
export function chartConstants(n: number): ChartConstants {
  const row = TABLE.find((r) => r[0] === n);
  if (!row) {
    throw new RangeError(
      `subgroup size must be a whole number from ${MIN_SUBGROUP_SIZE} to ${MAX_SUBGROUP_SIZE}, got ${String(n)}`,
    );
  }
  const [, d2, d3, A2, D3, D4] = row;
  // E2 is printed as 2.660 for n = 2; 3/1.128 = 2.6596 agrees to that precision, and computing it keeps one
  // source for d2.
  return { n, d2, d3, A2, D3, D4, E2: 3 / d2 };
}
