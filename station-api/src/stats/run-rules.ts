import { requireFinite, requireFiniteArray } from '../measure/guards';

/**
 * Run rules ("tests for special causes") on a Shewhart chart of one plotted statistic.
 *
 * Western Electric Company, Statistical Quality Control Handbook (1956), zone rules:
 *   WE1 one point beyond 3σ; WE2 2 of 3 consecutive points beyond 2σ on the same side; WE3 4 of 5 consecutive
 *   points beyond 1σ on the same side; WE4 8 consecutive points on the same side of the centre line.
 * L. S. Nelson, "The Shewhart control chart — tests for special causes", Journal of Quality Technology 16(4),
 * 1984, eight tests:
 *   N1 one point beyond 3σ; N2 9 points in a row on the same side; N3 6 points in a row steadily increasing or
 *   decreasing; N4 14 points in a row alternating up and down; N5 2 of 3 beyond 2σ on the same side; N6 4 of 5
 *   beyond 1σ on the same side; N7 15 points in a row within 1σ (either side); N8 8 points in a row with none
 *   within 1σ, on both sides.
 * (Both lists also in Montgomery, Introduction to Statistical Quality Control, ch. 5, and the NIST/SEMATECH
 * e-Handbook §6.3.2.)
 *
 * Conventions this implementation fixes, because the sources leave them open:
 * - "beyond kσ" is strict: a point exactly on a zone boundary is not beyond it; "within 1σ" (N7) is strict too;
 * - a point exactly on the centre line belongs to neither side and breaks a same-side run;
 * - N3 counts points (6 points = 5 successive rises); an equal neighbour breaks the trend, and in N4 a repeat
 *   breaks the alternation;
 * - a rule is checked at every point, on the window that ends there; for the run rules (WE4, N2, N3, N4, N7,
 *   N8) consecutive points that meet the rule form one finding whose indices cover the whole run, so a run of
 *   40 points is one finding "points 3–42 (40 in a row) …" rather than 33; the 2-of-3 and 4-of-5 rules report
 *   at each point that completes the pattern;
 * - in the 2-of-3 and 4-of-5 rules the remaining point may lie anywhere, and the reported indices are the points
 *   that lie beyond the zone.
 * `index` is 0-based; the messages number points from 1, as a person reads the chart.
 */

export type RuleSet = 'western-electric' | 'nelson';
export type RuleId = 'WE1' | 'WE2' | 'WE3' | 'WE4' | 'N1' | 'N2' | 'N3' | 'N4' | 'N5' | 'N6' | 'N7' | 'N8';

export interface RuleViolation {
  rule: RuleId;
  /** point (0-based) at which the rule is first met (the last point of the first window that meets it) */
  index: number;
  /** every point (0-based) the finding rests on: the beyond-zone points, or the whole run */
  indices: number[];
  /** the finding in plain words, points numbered from 1 */
  message: string;
}

type Side = 1 | -1;
const RULE_ORDER: Record<RuleId, number> = { WE1: 1, WE2: 2, WE3: 3, WE4: 4, N1: 1, N2: 2, N3: 3, N4: 4, N5: 5, N6: 6, N7: 7, N8: 8 };
const sideWord = (s: Side) => (s > 0 ? 'above' : 'below');
const pointSpan = (from: number, to: number) => `points ${from + 1}–${to + 1}`;
const range = (from: number, to: number) => Array.from({ length: to - from + 1 }, (_, i) => from + i);

function beyond(rule: RuleId, z: readonly number[], k: number): RuleViolation[] {
  const out: RuleViolation[] = [];
  z.forEach((v, i) => {
    if (Math.abs(v) > k) {
      out.push({
        rule,
        index: i,
        indices: [i],
        message: `point ${i + 1} is more than ${k} σ ${sideWord(v > 0 ? 1 : -1)} the centre line`,
      });
    }
  });
  return out;
}

/** m of the last w points beyond kσ on one side. */
function mOfW(rule: RuleId, z: readonly number[], m: number, w: number, k: number): RuleViolation[] {
  const out: RuleViolation[] = [];
  for (const side of [1, -1] as Side[]) {
    const hit = new Uint8Array(z.length);
    for (let i = 0; i < z.length; i++) hit[i] = side * z[i] > k ? 1 : 0;
    let count = 0;
    for (let end = 0; end < z.length; end++) {
      if (hit[end]) count++;
      if (end >= w && hit[end - w]) count--;
      if (end < w - 1 || count < m) continue;
      // Report where the pattern completes: at a point that is itself a hit, or at the first full window.
      // A window whose last point is not a hit holds only hits that an earlier window already reported.
      if (!hit[end] && end !== w - 1) continue;
      const hits = range(end - w + 1, end).filter((i) => hit[i]);
      out.push({
        rule,
        index: end,
        indices: hits,
        message: `${hits.length} of the ${w} ${pointSpan(end - w + 1, end)} are more than ${k} σ ${sideWord(side)} the centre line`,
      });
    }
  }
  return out;
}

/**
 * Turns "the window of `len` points ending at i meets the rule" flags into findings: consecutive window ends
 * form one finding covering the whole run, so a long run is one marked stretch rather than one finding per point.
 */
function runs(
  rule: RuleId,
  met: ArrayLike<number | boolean>,
  len: number,
  words: (from: number, to: number) => string,
): RuleViolation[] {
  const out: RuleViolation[] = [];
  let i = 0;
  while (i < met.length) {
    if (!met[i]) {
      i++;
      continue;
    }
    let last = i;
    while (last + 1 < met.length && met[last + 1]) last++;
    const from = i - len + 1;
    out.push({ rule, index: i, indices: range(from, last), message: `${pointSpan(from, last)} (${last - from + 1} in a row) ${words(from, last)}` });
    i = last + 1;
  }
  return out;
}

/** `len` points in a row strictly on one side of the centre line. */
function sameSide(rule: RuleId, z: readonly number[], len: number): RuleViolation[] {
  const met = new Uint8Array(z.length);
  let run = 0;
  let side = 0;
  for (let i = 0; i < z.length; i++) {
    const s = Math.sign(z[i]);
    run = s !== 0 && s === side ? run + 1 : s !== 0 ? 1 : 0;
    side = s;
    met[i] = run >= len ? 1 : 0;
  }
  return runs(rule, met, len, (_f, to) => `all lie ${sideWord(z[to] > 0 ? 1 : -1)} the centre line`);
}

/** N3: `len` points in a row each higher (or each lower) than the one before. */
function trend(z: readonly number[], len: number): RuleViolation[] {
  const met = new Uint8Array(z.length);
  let steps = 0;
  let dir = 0;
  for (let i = 1; i < z.length; i++) {
    const d = Math.sign(z[i] - z[i - 1]);
    steps = d !== 0 && d === dir ? steps + 1 : d !== 0 ? 1 : 0;
    dir = d;
    met[i] = steps >= len - 1 ? 1 : 0;
  }
  return runs('N3', met, len, (_f, to) => (z[to] > z[to - 1] ? 'rise steadily' : 'fall steadily'));
}

/** N4: `len` points in a row alternating up and down. */
function alternating(z: readonly number[], len: number): RuleViolation[] {
  const met = new Uint8Array(z.length);
  let run = 0;
  let prev = 0;
  for (let i = 1; i < z.length; i++) {
    const d = Math.sign(z[i] - z[i - 1]);
    run = d !== 0 && d === -prev ? run + 1 : d !== 0 ? 1 : 0;
    prev = d;
    // run counts alternating steps; len points need len − 1 steps
    met[i] = run >= len - 1 ? 1 : 0;
  }
  return runs('N4', met, len, () => 'alternate up and down');
}

/** N7 (inside = true): `len` in a row within 1σ; N8 (inside = false): `len` in a row outside 1σ, both sides. */
function band(rule: 'N7' | 'N8', z: readonly number[], len: number, inside: boolean): RuleViolation[] {
  const met = new Uint8Array(z.length);
  let run = 0;
  let lastAbove = -1;
  let lastBelow = -1;
  for (let i = 0; i < z.length; i++) {
    const v = z[i];
    run = (inside ? Math.abs(v) < 1 : Math.abs(v) > 1) ? run + 1 : 0;
    if (v > 0) lastAbove = i;
    if (v < 0) lastBelow = i;
    const start = i - len + 1;
    met[i] = run >= len && (inside || (lastAbove >= start && lastBelow >= start)) ? 1 : 0;
  }
  return inside
    ? runs(rule, met, len, () => 'all lie within 1 σ of the centre line: less spread than the limits assume')
    : runs(rule, met, len, () => 'all lie more than 1 σ from the centre line, on both sides of it');
}

/**
 * Evaluates one rule set on a series of plotted points.
 * @param points plotted values in time order (unit of the chart)
 * @param centre centre line, same unit
 * @param sigma σ of one plotted point, same unit (the limits are centre ± 3·sigma); with sigma = 0 the zones do
 *   not exist and no rule is evaluated
 * @param ruleSet 'western-electric' (WE1–WE4) or 'nelson' (N1–N8)
 * @returns violations ordered by point, then by rule
 */
export function evaluateRunRules(points: readonly number[], centre: number, sigma: number, ruleSet: RuleSet): RuleViolation[] {
  requireFiniteArray('points', points, 0);
  requireFinite('centre', centre);
  requireFinite('sigma', sigma);
  if (sigma < 0) throw new RangeError(`sigma must be 0 or more, got ${sigma}`);
  if (ruleSet !== 'western-electric' && ruleSet !== 'nelson') {
    throw new RangeError(`unknown rule set "${String(ruleSet)}"; use "western-electric" or "nelson"`);
  }
  if (sigma === 0) return [];
  const z = new Array<number>(points.length);
  for (let i = 0; i < points.length; i++) z[i] = (points[i] - centre) / sigma;
  const found =
    ruleSet === 'western-electric'
      ? [...beyond('WE1', z, 3), ...mOfW('WE2', z, 2, 3, 2), ...mOfW('WE3', z, 4, 5, 1), ...sameSide('WE4', z, 8)]
      : [
          ...beyond('N1', z, 3),
          ...sameSide('N2', z, 9),
          ...trend(z, 6),
          ...alternating(z, 14),
          ...mOfW('N5', z, 2, 3, 2),
          ...mOfW('N6', z, 4, 5, 1),
          ...band('N7', z, 15, true),
          ...band('N8', z, 8, false),
        ];
  return found.sort((a, b) => a.index - b.index || RULE_ORDER[a.rule] - RULE_ORDER[b.rule]);
}
