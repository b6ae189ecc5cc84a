import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { csvCell, csvText } from './audit-csv';

describe('audit CSV', () => {
  it('quotes fields with commas, quotes and line breaks and doubles inner quotes', () => {
    // RFC 4180 §2 rules 6 and 7
    expect(csvCell('plain')).toBe('plain');
    expect(csvCell('a,b')).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell('two\nlines')).toBe('"two\nlines"');
    expect(csvCell(null)).toBe('');
  });

  it('neutralises cells a spreadsheet would run as a formula with a leading single quote', () => {
    // OWASP "CSV Injection": prefix cells beginning with = + - @ (and tab, carriage return) with '
    expect(csvCell('=1+1')).toBe("'=1+1");
    expect(csvCell('+41 79')).toBe("'+41 79");
    expect(csvCell('-2')).toBe("'-2");
    expect(csvCell('@SUM(A1)')).toBe("'@SUM(A1)");
    expect(csvCell('\t=cmd')).toBe("'\t=cmd");
    expect(csvCell('=HYPERLINK("x")')).toBe(`"'=HYPERLINK(""x"")"`);
    // numbers the export writes itself stay numbers
    expect(csvCell(-3)).toBe('-3');
  });

  it('round-trips through papaparse (an RFC 4180 parser used as reference)', () => {
    const rows = [
      ['2026-12-02T08:00:00.000Z', 'engineer', 'Changed the high limit, from 5.1 V to 5.08 V', 'tight "vout"\nafter pilot', 7],
      ['2026-12-02T09:00:00.000Z', 'quality', 'x', '', 8],
    ];
    const text = csvText(['When', 'Who', 'What', 'Why', 'Id'], rows);
    expect(text.endsWith('\r\n')).toBe(true);
    const parsed = Papa.parse<string[]>(text.trimEnd(), { newline: '\r\n' });
    expect(parsed.errors).toEqual([]);
    expect(parsed.data).toEqual([['When', 'Who', 'What', 'Why', 'Id'], ...rows.map((r) => r.map(String))]);
  });
});
