import { describe, expect, it } from 'vitest';
import { csvField, csvRecord } from './csv';

describe('CSV fields (RFC 4180 §2)', () => {
  it('leaves plain text and numbers as they are', () => {
    expect(csvField('vout_nom')).toBe('vout_nom');
    expect(csvField(5.0123456789)).toBe('5.0123456789');
    expect(csvField(null)).toBe('');
  });

  // RFC 4180 §2 rules 6 and 7: fields with commas, quotes or line breaks are quoted; an inner quote is doubled
  it('quotes a field with a comma, a double quote or a line break and doubles inner quotes', () => {
    expect(csvField('Load step, 0.5 A')).toBe('"Load step, 0.5 A"');
    expect(csvField('say "hi"')).toBe('"say ""hi"""');
    expect(csvField('two\r\nlines')).toBe('"two\r\nlines"');
  });

  // RFC 4180 §2 rule 1: each record ends in CRLF
  it('ends each record in CRLF', () => {
    expect(csvRecord(['a', 1, null, 'b,c'])).toBe('a,1,,"b,c"\r\n');
  });
});
