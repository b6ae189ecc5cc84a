/**
 * Unit serials: a literal prefix, the ISO 8601 year and week of registration (YYWW), a literal separator
 * and a five-digit sequence, e.g. `K5A-2649-00017`. Products state their serial format as an anchored
 * regular expression; the generator accepts only the expressions it can fill in.
 */

/** The literal parts around the year-week and sequence fields of a serial pattern. */
export interface SerialTemplate {
  prefix: string;
  separator: string;
  suffix: string;
}

export const SEQUENCE_DIGITS = 5;
export const MAX_SEQUENCE = 10 ** SEQUENCE_DIGITS - 1;

// a literal piece of a pattern: letters, digits, '_', '-', '/', or an escaped '.', '-', '/'
const LITERAL = String.raw`(?:[A-Za-z0-9_\-/]|\\[.\-/])*`;
const GENERATABLE = new RegExp(String.raw`^\^(${LITERAL})\\d\{4\}(${LITERAL})\\d\{5\}(${LITERAL})\$$`);

const unescape = (s: string) => s.replace(/\\(.)/g, '$1');

/**
 * ISO 8601 week date of a calendar day (weeks start on Monday; week 1 holds the year's first Thursday),
 * taken from the local calendar date so that "this week" means the plant's week.
 */
export function isoWeek(date: Date): { isoYear: number; week: number } {
  const day = Date.UTC(date.getFullYear(), date.getMonth(), date.getDate());
  const weekday = (new Date(day).getUTCDay() + 6) % 7; // Monday = 0
  const thursday = new Date(day + (3 - weekday) * 86_400_000);
  const isoYear = thursday.getUTCFullYear();
  const week = 1 + Math.floor((thursday.getTime() - Date.UTC(isoYear, 0, 1)) / (7 * 86_400_000));
  return { isoYear, week };
}

/** `YYWW`: last two digits of the ISO week-numbering year, then the ISO week, e.g. `2649`. */
export function yearWeekCode(date: Date): string {
  const { isoYear, week } = isoWeek(date);
  return `${String(isoYear % 100).padStart(2, '0')}${String(week).padStart(2, '0')}`;
}

/** The template of a generatable pattern such as `^K5A-\d{4}-\d{5}$`, or null if it is not of that form. */
export function parseSerialPattern(pattern: string): SerialTemplate | null {
  const m = GENERATABLE.exec(pattern);
  if (!m) return null;
  return { prefix: unescape(m[1]), separator: unescape(m[2]), suffix: unescape(m[3]) };
}

/** Why a product's serial pattern cannot be used, in words; null when it is fine. */
export function serialPatternProblem(pattern: string): string | null {
  try {
    new RegExp(pattern);
  } catch (err) {
    return `serialPattern is not a valid regular expression (${(err as Error).message})`;
  }
  if (!parseSerialPattern(pattern)) {
    return String.raw`serialPattern must have the form ^PREFIX\d{4}SEP\d{5}$ (e.g. ^K5A-\d{4}-\d{5}$): a literal prefix, the four-digit year-week, a literal separator, a five-digit sequence`;
  }
  return null;
}

/** One serial. `sequence` is 1..99999. */
export function formatSerial(t: SerialTemplate, yearWeek: string, sequence: number): string {
  if (!Number.isInteger(sequence) || sequence < 1 || sequence > MAX_SEQUENCE) {
    throw new RangeError(`serial sequence ${sequence} is outside 1..${MAX_SEQUENCE}`);
  }
  return `${t.prefix}${yearWeek}${t.separator}${String(sequence).padStart(SEQUENCE_DIGITS, '0')}${t.suffix}`;
}

/** `count` consecutive serials starting at `first`. */
export function serialRange(t: SerialTemplate, yearWeek: string, first: number, count: number): string[] {
  if (first + count - 1 > MAX_SEQUENCE) {
    throw new RangeError(`sequences ${first}..${first + count - 1} run past ${MAX_SEQUENCE}`);
  }
  return Array.from({ length: count }, (_, i) => formatSerial(t, yearWeek, first + i));
}

/** The part every serial of one product and week starts with (for a prefix search). */
export function weekStem(t: SerialTemplate, yearWeek: string): string {
  return `${t.prefix}${yearWeek}${t.separator}`;
}

/** The sequence number inside a serial made from `t`, or null if the serial is not of that form. */
export function sequenceOf(t: SerialTemplate, serial: string): number | null {
  if (!serial.startsWith(t.prefix) || !serial.endsWith(t.suffix)) return null;
  const core = serial.slice(t.prefix.length, serial.length - t.suffix.length);
  const seq = core.slice(4 + t.separator.length);
  return /^\d{5}$/.test(seq) ? Number(seq) : null;
}
