import { formatSerial, parseSerialPattern, sequenceOf, type SerialTemplate } from '../units/serial-numbers';

/**
 * The serials a person gives for a new lot, checked against the product's serial format (units/serial-numbers.ts):
 * either a range written as its first and last serial (same prefix, year-week and separator; the five-digit
 * sequence counts up) or an explicit list. Pure: the database checks (taken serials) come after.
 */

/** Most units one lot may register; a sanity bound on input, not a process limit. */
export const MAX_LOT_QUANTITY = 10_000;

export type SerialInput = { kind: 'range'; firstSerial: string; lastSerial: string } | { kind: 'list'; serials: string[] };

/** A problem with one field of the input, in words a person can act on. */
export interface SerialProblem {
  field: 'firstSerial' | 'lastSerial' | 'serials' | 'plannedQuantity';
  message: string;
}

export type SerialExpansion = { ok: true; serials: string[] } | { ok: false; problems: SerialProblem[] };

/** Splits a typed or pasted list: commas, semicolons, spaces and line breaks all separate serials. */
export function splitSerialList(text: string): string[] {
  return text
    .split(/[\s,;]+/)
    .map((s) => s.trim())
    .filter((s) => s.length > 0);
}

/** The year-week field (YYWW) must name an ISO 8601 week: 01..53. */
function weekProblem(t: SerialTemplate, serial: string): string | null {
  const ww = Number(serial.slice(t.prefix.length + 2, t.prefix.length + 4));
  return ww >= 1 && ww <= 53 ? null : `${serial}: its year-week ${serial.slice(t.prefix.length, t.prefix.length + 4)} has week ${String(ww).padStart(2, '0')}; ISO weeks run 01 to 53`;
}

function example(t: SerialTemplate): string {
  return formatSerial(t, '2649', 1);
}

/**
 * Expands and checks the serials of one lot.
 * @param serialPattern the product's anchored serial pattern, e.g. `^K5A-\d{4}-\d{5}$`
 * @param plannedQuantity must equal the number of serials
 */
export function expandSerials(input: SerialInput, serialPattern: string, plannedQuantity: number): SerialExpansion {
  const t = parseSerialPattern(serialPattern);
  if (!t) {
    return { ok: false, problems: [{ field: 'serials', message: `the product's serial format ${serialPattern} is not of the form PREFIX-YYWW-NNNNN; correct the product first` }] };
  }
  const pattern = new RegExp(serialPattern);
  const formatProblem = (s: string): string | null => {
    if (!pattern.test(s)) return `${s} is not a serial of this product (expected the form ${example(t)})`;
    return weekProblem(t, s);
  };
  if (input.kind === 'range') {
    const problems: SerialProblem[] = [];
    const first = input.firstSerial.trim();
    const last = input.lastSerial.trim();
    const pf = first ? formatProblem(first) : 'the first serial is missing';
    const pl = last ? formatProblem(last) : 'the last serial is missing';
    if (pf) problems.push({ field: 'firstSerial', message: pf });
    if (pl) problems.push({ field: 'lastSerial', message: pl });
    if (problems.length) return { ok: false, problems };
    const stem = (s: string) => s.slice(0, s.length - t.suffix.length - 5);
    if (stem(first) !== stem(last)) {
      return { ok: false, problems: [{ field: 'lastSerial', message: `a range keeps prefix and year-week: ${first} starts with ${stem(first)} but ${last} with ${stem(last)}; give a list instead` }] };
    }
    const a = sequenceOf(t, first)!;
    const b = sequenceOf(t, last)!;
    if (a < 1) return { ok: false, problems: [{ field: 'firstSerial', message: `sequences start at 00001; ${first} has 00000` }] };
    if (b < a) return { ok: false, problems: [{ field: 'lastSerial', message: `the last serial ${last} comes before the first ${first}` }] };
    const count = b - a + 1;
    if (count > MAX_LOT_QUANTITY) {
      return { ok: false, problems: [{ field: 'lastSerial', message: `the range holds ${count} serials; one lot takes at most ${MAX_LOT_QUANTITY}` }] };
    }
    if (count !== plannedQuantity) {
      return { ok: false, problems: [{ field: 'plannedQuantity', message: `the planned quantity is ${plannedQuantity} but ${first} to ${last} holds ${count} serials; they must agree` }] };
    }
    const yearWeek = first.slice(t.prefix.length, t.prefix.length + 4);
    // a ≥ 1 and b ≤ MAX_SEQUENCE (five digits), so formatSerial cannot refuse
    return { ok: true, serials: Array.from({ length: count }, (_, i) => formatSerial(t, yearWeek, a + i)) };
  }
  const serials = input.serials.map((s) => s.trim()).filter((s) => s.length > 0);
  if (serials.length === 0) return { ok: false, problems: [{ field: 'serials', message: 'the list of serials is empty' }] };
  if (serials.length > MAX_LOT_QUANTITY) {
    return { ok: false, problems: [{ field: 'serials', message: `the list holds ${serials.length} serials; one lot takes at most ${MAX_LOT_QUANTITY}` }] };
  }
  const problems: SerialProblem[] = [];
  const bad = serials.map((s) => formatProblem(s)).filter((p): p is string => p !== null);
  if (bad.length) {
    const shown = bad.slice(0, 5).join('; ');
    problems.push({ field: 'serials', message: bad.length > 5 ? `${bad.length} serials are not valid, e.g. ${shown}` : shown });
  }
  const seen = new Set<string>();
  const twice = new Set<string>();
  for (const s of serials) (seen.has(s) ? twice : seen).add(s);
  if (twice.size) problems.push({ field: 'serials', message: `listed more than once: ${[...twice].slice(0, 5).join(', ')}${twice.size > 5 ? ` and ${twice.size - 5} more` : ''}` });
  if (serials.length !== plannedQuantity) {
    problems.push({ field: 'plannedQuantity', message: `the planned quantity is ${plannedQuantity} but the list holds ${serials.length} serials; they must agree` });
  }
  return problems.length ? { ok: false, problems } : { ok: true, serials };
}
