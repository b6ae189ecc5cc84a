import Papa from 'papaparse';

/*
 * Reads a characterization file: per-unit measurements of a pilot build, one row per unit, as written in
 * docs/characterization-data.md. Pure: bytes in, columns or problems out. Every problem names where it is (line
 * and column) and what to do; a file with any problem is refused whole, so nothing half-read is ever stored.
 */

/** Largest file accepted: 60 pilot units × 20 quantities is about 15 kB, so 1 MiB leaves ample room. */
export const MAX_CHARACTERIZATION_FILE_BYTES = 1024 * 1024;
/** Most units (data rows) in one file. */
export const MAX_CHARACTERIZATION_ROWS = 10_000;
/** Most quantity columns in one file (the serial column not counted). */
export const MAX_CHARACTERIZATION_COLUMNS = 50;
/** Most problems listed for one file; a file with more is almost always in the wrong format altogether. */
const MAX_PROBLEMS = 20;

/** One quantity column: its header as written, the quantity name and the unit taken from it. */
export interface CharacterizationColumn {
  /** header as written, e.g. `vout_1.5A_V`; the key the analysis and the API use */
  key: string;
  /** quantity name, the header before its last underscore, e.g. `vout_1.5A` */
  name: string;
  /** unit, the header after its last underscore, e.g. `V` (`us` is read as `µs`) */
  unit: string;
  /** how many units have a value (empty cells are units not measured for this quantity) */
  count: number;
}

export interface CharacterizationTable {
  columns: CharacterizationColumn[];
  /** serial of each unit, in file order (the build order the moving-range σ relies on) */
  serials: string[];
  /** values per column key, one per unit in file order; null where the cell was empty */
  values: Record<string, (number | null)[]>;
}

/** One problem with the file. line: 1-based line in the file (0 for the file as a whole); column: header or null. */
export interface CsvProblem {
  line: number;
  column: string | null;
  message: string;
}

export type CsvReadResult = { ok: true; table: CharacterizationTable } | { ok: false; problems: CsvProblem[] };

const SERIAL_HEADER = 'serial';
/** Quantity name: starts with a letter; letters, digits, `.`, `@`, `-` and `_` after it. */
const NAME_PATTERN = /^[A-Za-z][A-Za-z0-9.@_-]*$/;
/** Unit: letters with an optional prefix sign (µ, °, %), at most 8 characters, e.g. V, mV, mA, %, µs, degC, lb. */
const UNIT_PATTERN = /^(%|[A-Za-zµ°Ω][A-Za-z0-9µ°Ω%/]{0,7})$/;
/** A decimal number with a point: 5, -0.25, 4.98e-3. No thousands separators, no comma decimals. */
const NUMBER_PATTERN = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * The first invalid UTF-8 sequence in the bytes (RFC 3629 §4: no overlong forms, no surrogates, at most U+10FFFF).
 * @returns its byte offset, or -1 when the bytes are valid UTF-8
 */
export function firstInvalidUtf8(bytes: Uint8Array): number {
  let i = 0;
  while (i < bytes.length) {
    const b = bytes[i];
    let need: number;
    let min: number;
    if (b < 0x80) {
      i++;
      continue;
    } else if (b >= 0xc2 && b <= 0xdf) [need, min] = [1, 0x80];
    else if (b >= 0xe0 && b <= 0xef) [need, min] = [2, 0x800];
    else if (b >= 0xf0 && b <= 0xf4) [need, min] = [3, 0x10000];
    else return i;
    if (i + need >= bytes.length) return i; // the sequence is cut off by the end of the file
    let cp = b & (0x3f >> need);
    for (let k = 1; k <= need; k++) {
      const c = bytes[i + k];
      if (c === undefined || (c & 0xc0) !== 0x80) return i;
      cp = (cp << 6) | (c & 0x3f);
    }
    if (cp < min || cp > 0x10ffff || (cp >= 0xd800 && cp <= 0xdfff)) return i;
    i += need + 1;
  }
  return -1;
}

/**
 * Decodes the file as UTF-8 text; a UTF-8 byte-order mark is dropped. UTF-16 (recognised by its byte-order mark)
 * and bytes that are not UTF-8 (e.g. a file saved as Windows-1252 with a µ or °) are refused with the line.
 */
export function decodeUtf8(bytes: Uint8Array): { text: string } | { problem: CsvProblem } {
  if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
    return { problem: { line: 0, column: null, message: 'the file is UTF-16 text; save it as "CSV UTF-8" and upload it again' } };
  }
  const bad = firstInvalidUtf8(bytes);
  if (bad >= 0) {
    let line = 1;
    for (let i = 0; i < bad; i++) if (bytes[i] === 0x0a) line++;
    const hex = bytes[bad].toString(16).toUpperCase().padStart(2, '0');
    return {
      problem: {
        line,
        column: null,
        message: `the file is not UTF-8 text (byte 0x${hex} at line ${line}, probably saved as Windows-1252 or Latin-1); save it as "CSV UTF-8" and upload it again`,
      },
    };
  }
  // TextDecoder drops a leading UTF-8 byte-order mark (EF BB BF), which spreadsheet programs often write
  return { text: new TextDecoder('utf-8').decode(bytes) };
}

/** Splits a header such as `vout_1.5A_V` into name and unit; a problem message when it does not fit. */
export function parseColumnHeader(header: string): { name: string; unit: string } | { problem: string } {
  const at = header.lastIndexOf('_');
  if (at <= 0 || at === header.length - 1) {
    return { problem: `"${header}" does not end in its unit; write the quantity, an underscore and the unit, e.g. vout_V, ripple_mV, efficiency_%` };
  }
  const name = header.slice(0, at);
  const written = header.slice(at + 1);
  if (!NAME_PATTERN.test(name)) {
    return { problem: `"${name}" is not a usable quantity name; start with a letter and use letters, digits, ".", "@", "-" or "_" only` };
  }
  if (!UNIT_PATTERN.test(written)) return { problem: `"${written}" is not a unit; write it as V, mV, A, mA, %, µs (or us), °C …` };
  return { name, unit: written === 'us' ? 'µs' : written };
}

/**
 * Reads the file's bytes into columns of numbers.
 * Delimiter: comma, semicolon or tab (detected); the first row is the header; blank lines are skipped.
 */
export function readCharacterizationCsv(bytes: Uint8Array): CsvReadResult {
  const fail = (problems: CsvProblem[]): CsvReadResult => ({ ok: false, problems: problems.slice(0, MAX_PROBLEMS) });
  if (bytes.length === 0) return fail([{ line: 0, column: null, message: 'the file is empty' }]);
  if (bytes.length > MAX_CHARACTERIZATION_FILE_BYTES) {
    return fail([{ line: 0, column: null, message: `the file is ${bytes.length} bytes; at most ${MAX_CHARACTERIZATION_FILE_BYTES} bytes (1 MiB) are accepted` }]);
  }
  const decoded = decodeUtf8(bytes);
  if ('problem' in decoded) return fail([decoded.problem]);
  const text = decoded.text;
  if (text.trim() === '') return fail([{ line: 0, column: null, message: 'the file holds no text (only blank lines or spaces)' }]);

  const parsed = Papa.parse<string[]>(text, { header: false, skipEmptyLines: 'greedy', delimitersToGuess: [',', ';', '\t'] });
  // line of each parsed row: papaparse gives no line numbers, so they are found from the raw text (quoted line breaks
  // inside a cell are counted through the cursor papaparse reports on each error; plain rows map one to one)
  const lines = rowLines(text, parsed.data.length);
  const problems: CsvProblem[] = [];
  for (const e of parsed.errors) {
    if (e.code === 'UndetectableDelimiter') continue; // a file with one column; the header check explains it
    problems.push({ line: e.row !== undefined && e.row !== null ? (lines[e.row] ?? 0) : 0, column: null, message: `the file cannot be read as CSV: ${e.message}` });
  }
  if (problems.length > 0) return fail(problems);

  const rows = parsed.data;
  const header = (rows[0] ?? []).map((h) => h.trim());
  const dataRows = rows.slice(1);
  if (header.length === 0 || (header.length === 1 && header[0] === '')) return fail([{ line: 1, column: null, message: 'the header row is empty' }]);
  if (header[0].toLowerCase() !== SERIAL_HEADER) {
    problems.push({ line: 1, column: header[0] || null, message: `the first column must be "serial" (the unit's serial number), found "${header[0]}"` });
  }
  const quantityHeaders = header.slice(1);
  if (quantityHeaders.length === 0) {
    problems.push({ line: 1, column: null, message: 'there is no quantity column after "serial"; add one column per quantity, e.g. vout_V' });
  }
  if (quantityHeaders.length > MAX_CHARACTERIZATION_COLUMNS) {
    problems.push({ line: 1, column: null, message: `the file has ${quantityHeaders.length} quantity columns; at most ${MAX_CHARACTERIZATION_COLUMNS} are accepted` });
  }
  const seen = new Map<string, number>();
  const columns: Omit<CharacterizationColumn, 'count'>[] = [];
  quantityHeaders.forEach((h, i) => {
    const position = i + 2;
    if (h === '') {
      problems.push({ line: 1, column: null, message: `column ${position} has no header; name it like vout_V or delete the column` });
      return;
    }
    const lower = h.toLowerCase();
    if (seen.has(lower)) {
      problems.push({ line: 1, column: h, message: `column "${h}" appears twice (columns ${seen.get(lower)} and ${position}); each quantity gets one column` });
      return;
    }
    seen.set(lower, position);
    const p = parseColumnHeader(h);
    if ('problem' in p) problems.push({ line: 1, column: h, message: p.problem });
    else columns.push({ key: h, ...p });
  });
  if (problems.length > 0) return fail(problems);

  if (dataRows.length === 0) return fail([{ line: 0, column: null, message: 'the file has a header but no units; add one row per unit below it' }]);
  if (dataRows.length > MAX_CHARACTERIZATION_ROWS) {
    return fail([{ line: 0, column: null, message: `the file has ${dataRows.length} units; at most ${MAX_CHARACTERIZATION_ROWS} are accepted in one data set` }]);
  }

  const serials: string[] = [];
  const serialLine = new Map<string, number>();
  const values: Record<string, (number | null)[]> = Object.fromEntries(columns.map((c) => [c.key, []]));
  dataRows.forEach((row, r) => {
    const line = lines[r + 1] ?? r + 2;
    if (row.length !== header.length) {
      problems.push({ line, column: null, message: `the row has ${row.length} cells but the header has ${header.length}; check for a missing or extra delimiter` });
      return;
    }
    const serial = row[0].trim();
    if (serial === '') problems.push({ line, column: SERIAL_HEADER, message: 'the serial is empty; every unit needs its serial' });
    else if (serialLine.has(serial)) problems.push({ line, column: SERIAL_HEADER, message: `serial ${serial} appears twice (lines ${serialLine.get(serial)} and ${line}); give each unit one row` });
    else serialLine.set(serial, line);
    serials.push(serial);
    columns.forEach((c, i) => {
      const cell = row[i + 1].trim();
      if (cell === '') {
        values[c.key].push(null);
        return;
      }
      if (!NUMBER_PATTERN.test(cell)) {
        const hint = /^[+-]?\d*,\d+$/.test(cell) ? '; use a point as the decimal separator (5.012, not 5,012)' : '; write a plain number such as 5.012, or leave the cell empty if the unit was not measured';
        problems.push({ line, column: c.key, message: `"${cell.slice(0, 40)}" is not a number${hint}` });
        values[c.key].push(null);
        return;
      }
      values[c.key].push(Number(cell));
    });
  });
  if (problems.length > 0) return fail(problems);

  const withCounts = columns.map((c) => ({ ...c, count: values[c.key].filter((v) => v !== null).length }));
  const empty = withCounts.filter((c) => c.count === 0);
  if (empty.length > 0) {
    return fail(empty.map((c) => ({ line: 0, column: c.key, message: `column "${c.key}" has no values; fill it in or delete the column` })));
  }
  return { ok: true, table: { columns: withCounts, serials, values } };
}

/**
 * 1-based line where each parsed row starts. Blank lines are skipped the way papaparse skips them; a quoted cell
 * that spans lines moves the following rows down.
 */
function rowLines(text: string, rowCount: number): number[] {
  const out: number[] = [];
  let line = 1;
  let i = 0;
  while (i < text.length && out.length < rowCount) {
    // find the end of this record, honouring quotes
    let j = i;
    let inQuotes = false;
    let breaks = 0;
    for (; j < text.length; j++) {
      const ch = text[j];
      if (ch === '"') inQuotes = !inQuotes;
      else if (ch === '\n') {
        if (!inQuotes) break;
        breaks++;
      }
    }
    const record = text.slice(i, j);
    if (record.replace(/[\s,;\t]/g, '') !== '') out.push(line);
    line += breaks + 1;
    i = j + 1;
  }
  return out;
}
