import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { asRange, formatLotFile, parseLotFile, type ProductForImport } from './lot-csv';

const products = new Map<string, ProductForImport>([
  ['OB-BK0503', { partNumber: 'OB-BK0503', serialPattern: String.raw`^K5A-\d{4}-\d{5}$`, active: true }],
  ['OB-BK9999', { partNumber: 'OB-BK9999', serialPattern: String.raw`^K9Z-\d{4}-\d{5}$`, active: false }],
]);
const HEADER = 'lot_code,product,planned_quantity,first_serial,last_serial,serials\r\n';

// self-constructed example files; row numbers counted by hand (the header is spreadsheet row 1)
describe('parseLotFile', () => {
  it('reads a range row and a list row', () => {
    const text = HEADER + 'LB-2649-11,OB-BK0503,3,K5A-2649-00101,K5A-2649-00103,\r\nLB-2649-12,OB-BK0503,2,,,"K5A-2649-00201 K5A-2650-00001"\r\n';
    const r = parseLotFile(text, products);
    expect(r.problems).toEqual([]);
    expect(r.rows).toEqual([
      { row: 2, code: 'LB-2649-11', partNumber: 'OB-BK0503', plannedQuantity: 3, serials: ['K5A-2649-00101', 'K5A-2649-00102', 'K5A-2649-00103'] },
      { row: 3, code: 'LB-2649-12', partNumber: 'OB-BK0503', plannedQuantity: 2, serials: ['K5A-2649-00201', 'K5A-2650-00001'] },
    ]);
  });

  it('gives every bad row its own problem with row, column and why', () => {
    const text =
      HEADER +
      'lb 1,OB-BK0503,1,K5A-2649-00001,K5A-2649-00001,\r\n' + // row 2: code
      'LB-2649-21,OB-XX0000,1,K5A-2649-00002,K5A-2649-00002,\r\n' + // row 3: product
      'LB-2649-22,OB-BK0503,two,K5A-2649-00003,K5A-2649-00003,\r\n' + // row 4: quantity
      'LB-2649-23,OB-BK0503,5,K5A-2649-00010,K5A-2649-00011,\r\n' + // row 5: quantity vs range
      'LB-2649-24,OB-BK0503,1,,,\r\n' + // row 6: no serials
      '\r\n' + // row 7: empty, skipped
      'LB-2649-25,OB-BK9999,1,,,K9Z-2649-00001\r\n' + // row 8: inactive product
      'LB-2649-26,OB-BK0503,1,K5A-2649-00020,K5A-2649-00020,K5A-2649-00020\r\n'; // row 9: both
    const { rows, problems } = parseLotFile(text, products);
    expect(rows).toEqual([]);
    expect(problems.map((p) => [p.row, p.column])).toEqual([
      [2, 'lot_code'],
      [3, 'product'],
      [4, 'planned_quantity'],
      [5, 'planned_quantity'],
      [6, 'serials'],
      [8, 'product'],
      [9, 'serials'],
    ]);
    expect(problems[1].message).toBe('there is no product OB-XX0000');
    expect(problems[3].message).toMatch(/planned quantity is 5 but K5A-2649-00010 to K5A-2649-00011 holds 2 serials/);
  });

  it('finds a lot code or a serial used twice in the same file', () => {
    const text = HEADER + 'LB-2649-31,OB-BK0503,2,K5A-2649-00001,K5A-2649-00002,\r\nLB-2649-31,OB-BK0503,1,,,K5A-2649-00002\r\n';
    const { problems } = parseLotFile(text, products);
    expect(problems).toEqual([
      { row: 3, column: 'lot_code', message: 'lot code LB-2649-31 is already used in row 2 of this file' },
      { row: 3, column: 'serials', message: 'serial K5A-2649-00002 is also in row 2 of this file' },
    ]);
  });

  it('refuses a header with an unknown or missing column, and an empty file', () => {
    expect(parseLotFile('lot_code,product,qty\r\n', products).problems.map((p) => `${p.row}:${p.column}`)).toEqual(['1:qty', '1:planned_quantity', '1:serials']);
    expect(parseLotFile('', products).problems[0]).toMatchObject({ row: 1, column: '(header)' });
    expect(parseLotFile(HEADER, products).problems[0].message).toMatch(/holds no lot/);
  });

  it('reads a semicolon-separated file with a byte order mark (what spreadsheets write in decimal-comma locales)', () => {
    const text = '\uFEFFlot_code;product;planned_quantity;first_serial;last_serial\nLB-2649-41;OB-BK0503;2;K5A-2649-00301;K5A-2649-00302\n';
    expect(parseLotFile(text, products)).toMatchObject({ problems: [], rows: [{ code: 'LB-2649-41', serials: ['K5A-2649-00301', 'K5A-2649-00302'] }] });
  });

  it('reports a row with an unclosed quote', () => {
    const { problems } = parseLotFile(HEADER + 'LB-2649-51,OB-BK0503,1,,,"K5A-2649-00001\r\n', products);
    expect(problems.some((p) => p.row === 2 && /cannot be read as CSV/.test(p.message))).toBe(true);
  });
});

describe('formatLotFile', () => {
  it('writes a range where the serials are consecutive and a list elsewhere, and reads back to the same lots', () => {
    const lots = [
      { code: 'LB-2649-61', partNumber: 'OB-BK0503', plannedQuantity: 3, serials: ['K5A-2649-00005', 'K5A-2649-00006', 'K5A-2649-00007'], state: 'open', registered: 3, tested: 0, passed: 0, createdAt: '2026-12-02T10:00:00.000Z' },
      { code: 'LB-2649-62', partNumber: 'OB-BK0503', plannedQuantity: 2, serials: ['K5A-2649-00009', 'K5A-2649-00011'], state: 'released', registered: 2, tested: 2, passed: 2, createdAt: '2026-12-02T11:00:00.000Z' },
    ];
    const text = formatLotFile(lots);
    // papaparse as an independent reader of the RFC 4180 text
    const records = Papa.parse<string[]>(text.trimEnd()).data;
    expect(records[1].slice(0, 6)).toEqual(['LB-2649-61', 'OB-BK0503', '3', 'K5A-2649-00005', 'K5A-2649-00007', '']);
    expect(records[2].slice(0, 6)).toEqual(['LB-2649-62', 'OB-BK0503', '2', '', '', 'K5A-2649-00009 K5A-2649-00011']);
    const back = parseLotFile(text, products);
    expect(back.problems).toEqual([]);
    expect(back.rows.map((r) => ({ code: r.code, partNumber: r.partNumber, plannedQuantity: r.plannedQuantity, serials: r.serials }))).toEqual(
      lots.map((l) => ({ code: l.code, partNumber: l.partNumber, plannedQuantity: l.plannedQuantity, serials: l.serials })),
    );
  });

  it('asRange accepts only consecutive serials with the same text around the sequence', () => {
    expect(asRange(['K5A-2649-00009', 'K5A-2649-00010'])).toEqual({ first: 'K5A-2649-00009', last: 'K5A-2649-00010' });
    expect(asRange(['K5A-2649-00009', 'K5A-2650-00010'])).toBeNull();
    expect(asRange([])).toBeNull();
  });
});
