import Papa from 'papaparse';
import { csvRecord } from '../yield/csv';
import { expandSerials, MAX_LOT_QUANTITY, splitSerialList, type SerialInput } from './serial-input';

/**
 * The lot list as a CSV file (docs/lots-and-release.md, "Lot files"): one lot per row. Import reads it, the lots
 * list exports it, and a file exported and imported again describes the same lots. Pure: no database here; the
 * checks that need one (code or serial already taken) are added by the importer.
 */

/** Columns the importer reads. */
export const LOT_FILE_COLUMNS = ['lot_code', 'product', 'planned_quantity', 'first_serial', 'last_serial', 'serials'] as const;
/** Columns the export adds for people reading it; the importer reads past them (a new lot is always open). */
export const LOT_FILE_INFO_COLUMNS = ['state', 'registered', 'tested', 'passed', 'created_at'] as const;

export const LOT_CODE_PATTERN = /^[A-Z0-9][A-Z0-9-]{2,31}$/;
export const LOT_CODE_RULE = '3 to 32 characters: capital letters, digits and "-", e.g. LB-2649-04';

/** Largest lot file accepted, and most lots in one file (sanity bounds on input). */
export const MAX_LOT_FILE_BYTES = 1_000_000;
export const MAX_LOT_FILE_ROWS = 500;

/** One problem in a lot file: the spreadsheet row (header = row 1), the column, and why. */
export interface LotFileProblem {
  row: number;
  column: string;
  message: string;
}

/** A row that passed the checks this module can make. */
export interface LotFileRow {
  row: number;
  code: string;
  partNumber: string;
  plannedQuantity: number;
  serials: string[];
}

export interface ProductForImport {
  partNumber: string;
  serialPattern: string;
  active: boolean;
}

export interface ParsedLotFile {
  rows: LotFileRow[];
  problems: LotFileProblem[];
}

const FIELD_TO_COLUMN = { firstSerial: 'first_serial', lastSerial: 'last_serial', serials: 'serials', plannedQuantity: 'planned_quantity' } as const;

/**
 * Reads a lot file and checks every row on its own and against the others (lot codes and serials used twice in
 * the file). Comma-separated; a header that holds semicolons and no comma is read as semicolon-separated (what
 * spreadsheets write in locales with a decimal comma).
 */
export function parseLotFile(text: string, products: ReadonlyMap<string, ProductForImport>): ParsedLotFile {
  const body = text.replace(/^\uFEFF/, '');
  const firstLine = body.split(/\r?\n/, 1)[0] ?? '';
  const delimiter = firstLine.includes(';') && !firstLine.includes(',') ? ';' : ',';
  const parsed = Papa.parse<string[]>(body, { delimiter, skipEmptyLines: false });
  const problems: LotFileProblem[] = [];
  const records = parsed.data;
  // papaparse counts records from 0; the header is spreadsheet row 1
  const brokenRows = new Set<number>();
  for (const e of parsed.errors) {
    const row = (e.row ?? 0) + 1;
    brokenRows.add(row);
    problems.push({ row, column: '(row)', message: `the row cannot be read as CSV: ${e.message}` });
  }
  const header = (records[0] ?? []).map((h) => h.trim().toLowerCase());
  if (header.length === 0 || header.every((h) => h === '')) {
    return { rows: [], problems: [{ row: 1, column: '(header)', message: `the file is empty; the first row names the columns: ${LOT_FILE_COLUMNS.join(', ')}` }] };
  }
  const known = new Set<string>([...LOT_FILE_COLUMNS, ...LOT_FILE_INFO_COLUMNS]);
  header.forEach((h, i) => {
    if (!known.has(h)) problems.push({ row: 1, column: h || `column ${i + 1}`, message: `unknown column; the columns are ${LOT_FILE_COLUMNS.join(', ')}` });
    else if (header.indexOf(h) !== i) problems.push({ row: 1, column: h, message: 'this column appears twice' });
  });
  for (const required of ['lot_code', 'product', 'planned_quantity'] as const) {
    if (!header.includes(required)) problems.push({ row: 1, column: required, message: 'this column is missing' });
  }
  if (!header.includes('serials') && !(header.includes('first_serial') && header.includes('last_serial'))) {
    problems.push({ row: 1, column: 'serials', message: 'give the serials: columns first_serial and last_serial (a range), or serials (a list)' });
  }
  if (problems.some((p) => p.row === 1)) return { rows: [], problems };

  const dataRecords = records.slice(1);
  const nonEmpty = dataRecords.filter((r) => r.some((c) => c.trim() !== '')).length;
  if (nonEmpty === 0) return { rows: [], problems: [{ row: 2, column: '(row)', message: 'the file names its columns but holds no lot' }] };
  if (nonEmpty > MAX_LOT_FILE_ROWS) {
    return { rows: [], problems: [{ row: 2, column: '(row)', message: `the file holds ${nonEmpty} lots; import at most ${MAX_LOT_FILE_ROWS} at a time` }] };
  }

  const rows: LotFileRow[] = [];
  dataRecords.forEach((record, i) => {
    const row = i + 2;
    if (brokenRows.has(row) || record.every((c) => c.trim() === '')) return;
    const cell = (name: string): string => {
      const idx = header.indexOf(name);
      return idx < 0 ? '' : (record[idx] ?? '').trim();
    };
    const add = (column: string, message: string) => problems.push({ row, column, message });
    const before = problems.length;
    if (record.length > header.length && record.slice(header.length).some((c) => c.trim() !== '')) {
      add('(row)', `the row has ${record.length} fields but the header names ${header.length} columns`);
    }
    const code = cell('lot_code');
    if (!code) add('lot_code', 'the lot code is missing');
    else if (!LOT_CODE_PATTERN.test(code)) add('lot_code', `"${code}" is not a lot code: ${LOT_CODE_RULE}`);
    const partNumber = cell('product');
    const product = products.get(partNumber);
    if (!partNumber) add('product', 'the product (its part number) is missing');
    else if (!product) add('product', `there is no product ${partNumber}`);
    else if (!product.active) add('product', `product ${partNumber} is inactive; reactivate it before opening a lot`);
    const qtyText = cell('planned_quantity');
    const qty = /^\d+$/.test(qtyText) ? Number(qtyText) : NaN;
    if (!qtyText) add('planned_quantity', 'the planned quantity is missing');
    else if (!Number.isInteger(qty) || qty < 1 || qty > MAX_LOT_QUANTITY) add('planned_quantity', `"${qtyText}" is not a whole number from 1 to ${MAX_LOT_QUANTITY}`);
    const first = cell('first_serial');
    const last = cell('last_serial');
    const list = cell('serials');
    let input: SerialInput | null = null;
    if (list && (first || last)) add('serials', 'give either a range (first_serial, last_serial) or a list (serials), not both');
    else if (list) input = { kind: 'list', serials: splitSerialList(list) };
    else if (first || last) input = { kind: 'range', firstSerial: first, lastSerial: last };
    else add('serials', 'no serials: fill first_serial and last_serial, or serials');
    if (input && product && Number.isInteger(qty) && qty >= 1 && qty <= MAX_LOT_QUANTITY) {
      const expanded = expandSerials(input, product.serialPattern, qty);
      if (!expanded.ok) for (const p of expanded.problems) add(FIELD_TO_COLUMN[p.field], p.message);
      else if (problems.length === before) rows.push({ row, code, partNumber, plannedQuantity: qty, serials: expanded.serials });
    }
  });

  // across rows: the same lot code or serial twice in one file
  const codeRow = new Map<string, number>();
  const serialRow = new Map<string, number>();
  for (const r of rows) {
    const seen = codeRow.get(r.code);
    if (seen !== undefined) problems.push({ row: r.row, column: 'lot_code', message: `lot code ${r.code} is already used in row ${seen} of this file` });
    else codeRow.set(r.code, r.row);
    let overlap: { serial: string; row: number } | null = null;
    for (const s of r.serials) {
      const other = serialRow.get(s);
      if (other !== undefined && !overlap) overlap = { serial: s, row: other };
      else if (other === undefined) serialRow.set(s, r.row);
    }
    if (overlap) problems.push({ row: r.row, column: 'serials', message: `serial ${overlap.serial} is also in row ${overlap.row} of this file` });
  }
  problems.sort((a, b) => a.row - b.row);
  return { rows, problems };
}

/** One lot as the export writes it. */
export interface LotExportRow {
  code: string;
  partNumber: string;
  plannedQuantity: number;
  /** registered serials in ascending order */
  serials: string[];
  state: string;
  registered: number;
  tested: number;
  passed: number;
  createdAt: string;
}

/**
 * Whether the serials (ascending) form one range that the importer would expand to the same serials: same text
 * before the five-digit sequence, sequences consecutive.
 */
export function asRange(serials: readonly string[]): { first: string; last: string } | null {
  if (serials.length === 0) return null;
  const split = (s: string) => /^(.*?)(\d{5})([^\d]*)$/.exec(s);
  const head = split(serials[0]);
  if (!head) return null;
  for (let i = 0; i < serials.length; i++) {
    const m = split(serials[i]);
    if (!m || m[1] !== head[1] || m[3] !== head[3] || Number(m[2]) !== Number(head[2]) + i) return null;
  }
  return { first: serials[0], last: serials[serials.length - 1] };
}

/** The lots as a CSV file (RFC 4180, CRLF) the importer reads back: a range where the serials are one, else the list. */
export function formatLotFile(lots: readonly LotExportRow[]): string {
  let out = csvRecord([...LOT_FILE_COLUMNS, ...LOT_FILE_INFO_COLUMNS]);
  for (const l of lots) {
    const range = asRange(l.serials);
    out += csvRecord([
      l.code,
      l.partNumber,
      l.plannedQuantity,
      range?.first ?? '',
      range?.last ?? '',
      range ? '' : l.serials.join(' '),
      l.state,
      l.registered,
      l.tested,
      l.passed,
      l.createdAt,
    ]);
  }
  return out;
}
