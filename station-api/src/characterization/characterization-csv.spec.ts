import { describe, expect, it } from 'vitest';
import { decodeUtf8, firstInvalidUtf8, MAX_CHARACTERIZATION_FILE_BYTES, parseColumnHeader, readCharacterizationCsv } from './characterization-csv';

const bytes = (text: string) => new TextEncoder().encode(text);

function problemsOf(text: string | Uint8Array) {
  const r = readCharacterizationCsv(typeof text === 'string' ? bytes(text) : text);
  if (r.ok) throw new Error('expected the file to be refused');
  return r.problems;
}

describe('readCharacterizationCsv', () => {
  it('reads serials and one column of numbers per quantity, with the unit from the header', () => {
    const r = readCharacterizationCsv(bytes('serial,vout_1.5A_V,ripple_mV,efficiency_%\nK5A-2649-00001,5.012,18.4,91.2\nK5A-2649-00002,4.998,,90.8\n'));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.table.serials).toEqual(['K5A-2649-00001', 'K5A-2649-00002']);
    expect(r.table.columns).toEqual([
      { key: 'vout_1.5A_V', name: 'vout_1.5A', unit: 'V', count: 2 },
      { key: 'ripple_mV', name: 'ripple', unit: 'mV', count: 1 },
      { key: 'efficiency_%', name: 'efficiency', unit: '%', count: 2 },
    ]);
    expect(r.table.values['ripple_mV']).toEqual([18.4, null]);
    expect(r.table.values['vout_1.5A_V']).toEqual([5.012, 4.998]);
  });

  it('accepts semicolons, CRLF line ends, a UTF-8 byte-order mark, blank lines and "us" for µs', () => {
    const withBom = new Uint8Array([0xef, 0xbb, 0xbf, ...bytes('Serial;recovery_us\r\n\r\nA1;41.5\r\nA2;1e2\r\n')]);
    const r = readCharacterizationCsv(withBom);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.table.columns[0]).toMatchObject({ key: 'recovery_us', unit: 'µs' });
    expect(r.table.values['recovery_us']).toEqual([41.5, 100]);
  });

  it('refuses an empty file, a header without units, and blank text', () => {
    expect(problemsOf(new Uint8Array())[0].message).toBe('the file is empty');
    expect(problemsOf('\n \n')[0].message).toMatch(/no text/);
    expect(problemsOf('serial,vout_V\n')[0].message).toMatch(/header but no units/);
  });

  it('names a bad, missing or duplicate column', () => {
    expect(problemsOf('unit,vout_V\nA1,5\n')[0]).toMatchObject({ line: 1, message: expect.stringMatching(/first column must be "serial"/) });
    expect(problemsOf('serial\nA1\n')[0].message).toMatch(/no quantity column/);
    expect(problemsOf('serial,vout\nA1,5\n')[0]).toMatchObject({ column: 'vout', message: expect.stringMatching(/does not end in its unit/) });
    expect(problemsOf('serial,vout_V,Vout_V\nA1,5,5\n')[0]).toMatchObject({ column: 'Vout_V', message: expect.stringMatching(/appears twice \(columns 2 and 3\)/) });
    expect(problemsOf('serial,,vout_V\nA1,1,5\n')[0].message).toMatch(/column 2 has no header/);
    expect(problemsOf('serial,1vout_V\nA1,5\n')[0].message).toMatch(/not a usable quantity name/);
    expect(problemsOf('serial,vout_V\nA1,\nA2,\n')[0]).toMatchObject({ column: 'vout_V', message: expect.stringMatching(/has no values/) });
  });

  it('names the line and column of a bad number, with a hint for comma decimals', () => {
    const p = problemsOf('serial,vout_V,ripple_mV\nA1,5.01,18\nA2,5,012,19\nA3,5.00,high\n');
    expect(p).toEqual([
      { line: 3, column: null, message: expect.stringMatching(/4 cells but the header has 3/) },
      { line: 4, column: 'ripple_mV', message: '"high" is not a number; write a plain number such as 5.012, or leave the cell empty if the unit was not measured' },
    ]);
    const semicolon = problemsOf('serial;vout_V\nA1;5,012\n');
    expect(semicolon[0]).toMatchObject({ line: 2, column: 'vout_V', message: expect.stringMatching(/use a point as the decimal separator/) });
  });

  it('counts lines past blank lines and quoted line breaks', () => {
    const p = problemsOf('serial,vout_V\n\n"A\n1",5\nA2,x\n');
    expect(p[0]).toMatchObject({ line: 5, column: 'vout_V' });
  });

  it('refuses duplicate and empty serials', () => {
    const p = problemsOf('serial,vout_V\nA1,5\n,5\nA1,5\n');
    expect(p.map((x) => x.message)).toEqual(['the serial is empty; every unit needs its serial', 'serial A1 appears twice (lines 2 and 4); give each unit one row']);
  });

  it('refuses a file larger than the limit, saying the limit', () => {
    const big = new Uint8Array(MAX_CHARACTERIZATION_FILE_BYTES + 1).fill(0x20);
    expect(problemsOf(big)[0].message).toMatch(/at most 1048576 bytes \(1 MiB\)/);
  });

  it('refuses text that is not UTF-8, with the line of the first bad byte', () => {
    // "µ" saved as Windows-1252 is the single byte 0xB5 (Windows-1252 code page table)
    const latin = new Uint8Array([...bytes('serial,recovery_us\nA1,4'), 0xb5, ...bytes('\n')]);
    expect(problemsOf(latin)[0]).toMatchObject({ line: 2, message: expect.stringMatching(/not UTF-8 text \(byte 0xB5 at line 2/) });
    const utf16 = new Uint8Array([0xff, 0xfe, 0x73, 0x00]);
    expect(problemsOf(utf16)[0].message).toMatch(/UTF-16/);
  });
});

describe('firstInvalidUtf8 (RFC 3629 §4 syntax)', () => {
  it('agrees with the WHATWG TextDecoder in fatal mode on valid and invalid sequences', () => {
    // Node's TextDecoder (WHATWG Encoding Standard, UTF-8 decoder) as the reference
    const cases: number[][] = [
      [0x41, 0xc2, 0xb5], // µ
      [0xe2, 0x82, 0xac], // €
      [0xf0, 0x9f, 0x94, 0x8c], // U+1F50C
      [0xc0, 0xaf], // overlong "/"
      [0xed, 0xa0, 0x80], // surrogate U+D800
      [0xf4, 0x90, 0x80, 0x80], // above U+10FFFF
      [0xe2, 0x82], // cut off
      [0x80], // lone continuation byte
      [0x41, 0xff],
    ];
    for (const c of cases) {
      const b = new Uint8Array(c);
      let valid = true;
      try {
        new TextDecoder('utf-8', { fatal: true }).decode(b);
      } catch {
        valid = false;
      }
      expect(firstInvalidUtf8(b) === -1).toBe(valid);
    }
    expect(firstInvalidUtf8(new Uint8Array([0x41, 0x42, 0xff]))).toBe(2);
  });

  it('decodeUtf8 drops the byte-order mark', () => {
    expect(decodeUtf8(new Uint8Array([0xef, 0xbb, 0xbf, 0x61]))).toEqual({ text: 'a' });
  });
});

describe('parseColumnHeader', () => {
  it('splits at the last underscore', () => {
    expect(parseColumnHeader('iin_no_load_mA')).toEqual({ name: 'iin_no_load', unit: 'mA' });
    expect(parseColumnHeader('efficiency@1.5_%')).toEqual({ name: 'efficiency@1.5', unit: '%' });
    expect(parseColumnHeader('temp_degC')).toEqual({ name: 'temp', unit: 'degC' });
    expect(parseColumnHeader('vout_')).toHaveProperty('problem');
    expect(parseColumnHeader('vout_5 V')).toHaveProperty('problem');
  });
});
