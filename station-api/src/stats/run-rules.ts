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
 * - a rule is checked at every point, on the window that ends there, so a run longer than the rule needs is
 *   reported again at each further point; the UI marks every reported point;
 * - in the 2-of-3 and 4-of-5 rules the remaining point may lie anywhere, and the reported indices are the points
 *   that lie beyond the zone.
 * `index` is 0-based; the messages number points from 1, as a person reads the chart.
 */

export type RuleSet = 'western-electric' | 'nelson';
export type RuleId = 'WE1' | 'WE2' | 'WE3' | 'WE4' | 'N1' | 'N2' | 'N3' | 'N4' | 'N5' | 'N6' | 'N7' | 'N8';

export interface RuleViolation {
  rule: RuleId;
  /** point (0-based) at which the rule is met: the last point of the window */
  index: number;
  /** every point (0-based) the finding rests on */
  indices: number[];
  /** the finding in plain words, points numbered from 1 */
  message: string;
}

type Side = 1 | -1;
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
  for (let end = w - 1; end < z.length; end++) {
    for (const side of [1, -1] as Side[]) {
      const hits = range(end - w + 1, end).filter((i) => side * z[i] > k);
      // Report where the pattern completes: at a point that is itself a hit, or at the first full window.
      // A window whose last point is not a hit holds only hits that an earlier window already reported.
      if (hits.length >= m && (hits.includes(end) || end === w - 1)) {
        out.push({
          rule,
          index: end,
          indices: hits,
          message: `${hits.length} of the ${w} ${pointSpan(end - w + 1, end)} are more than ${k} σ ${sideWord(side)} the centre line`,
        });
      }
    }
  }
  return out;
}

/** `len` points in a row strictly on one side of the centre line. */
function sameSide(rule: RuleId, z: readonly number[], len: number): RuleViolation[] {
  const out: RuleViolation[] = [];
  let run = 0;
  let side = 0;
  z.forEach((v, i) => {
    const s = Math.sign(v);
    run = s !== 0 && s === side ? run + 1 : s !== 0 ? 1 : 0;
    side = s;
    if (run >= len) {
      out.push({
        rule,
        index: i,
        indices: range(i - len + 1, i),
        message: `${pointSpan(i - len + 1, i)} (${len} in a row) all lie ${sideWord(s as Side)} the centre line`,
      });
    }
  });
  return out;
}

/** N3: `len` points in a row each higher (or each lower) than the one before. */
function trend(z: readonly number[], len: number): RuleViolation[] {
  const out: RuleViolation[] = [];
  let steps = 0;
  let dir = 0;
  for (let i = 1; i < z.length; i++) {
    const d = Math.sign(z[i] - z[i - 1]);
    steps = d !== 0 && d === dir ? steps + 1 : d !== 0 ? 1 : 0;
    dir = d;
    if (steps >= len - 1) {
      out.push({
        rule: 'N3',
        index: i,
        indices: range(i - len + 1, i),
        message: `${pointSpan(i - len + 1, i)} (${len} in a row) ${d > 0 ? 'rise' : 'fall'} steadily`,
      });
    }
  }
  return out;
}

/** N4: `len` points in a row alternating up and down. */
function alternating(z: readonly number[], len: number): RuleViolation[] {
  const out: RuleViolation[] = [];
  let run = 0;
  let prev = 0;
  for (let i = 1; i < z.length; i++) {
    const d = Math.sign(z[i] - z[i - 1]);
    run = d !== 0 && d === -prev ? run + 1 : d !== 0 ? 1 : 0;
    prev = d;
    // run counts alternating steps; len points need len − 1 steps
    if (run >= len - 1) {
      out.push({
        rule: 'N4',
        index: i,
        indices: range(i - len + 1, i),
        message: `${pointSpan(i - len + 1, i)} (${len} in a row) alternate up and down`,
      });
    }
  }
  return out;
}

/** N7 (inside = true): `len` in a row within 1σ; N8 (inside = false): `len` in a row outside 1σ, both sides. */
function band(rule: 'N7' | 'N8', z: readonly number[], len: number, inside: boolean): RuleViolation[] {
  const out: RuleViolation[] = [];
  let run = 0;
  z.forEach((v, i) => {
    const ok = inside ? Math.abs(v) < 1 : Math.abs(v) > 1;
    run = ok ? run + 1 : 0;
    if (run < len) return;
    const idx = range(i - len + 1, i);
    if (inside) {
      out.push({
        rule,
        index: i,
        indices: idx,
        message: `${pointSpan(i - len + 1, i)} (${len} in a row) all lie within 1 σ of the centre line: less spread than the limits assume`,
      });
    } else if (idx.some((j) => z[j] > 0) && idx.some((j) => z[j] < 0)) {
      out.push({
        rule,
        index: i,
        indices: idx,
        message: `${pointSpan(i - len + 1, i)} (${len} in a row) all lie more than 1 σ from the centre line, on both sides of it`,
      });
    }
  });
  return out;
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
  const z = points.map((p) => (p - centre) / sigma);
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
  const order = (r: RuleId) => (ruleSet === 'western-electric' ? ['WE1', 'WE2', 'WE3', 'WE4'] : ['N1', 'N2', 'N3', 'N4', 'N5', 'N6', 'N7', 'N8']).indexOf(r);
  return found.sort((a, b) => a.index - b.index || order(a.rule) - order(b.rule));
}
