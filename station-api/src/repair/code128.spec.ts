import bwipjs from 'bwip-js';
import { describe, expect, it } from 'vitest';
import {
  CODE128_PATTERNS,
  CODE128_START,
  CODE128_STOP,
  code128Checksum,
  Code128DecodeError,
  decodeCode128,
  isCode128TagText,
} from './code128';

/** Set A/B value of a printable ASCII character: code − 32 (Wikipedia "Code 128" value table). */
const ab = (text: string) => [...text].map((c) => c.charCodeAt(0) - 32);
const widths = (values: number[]) => values.flatMap((v) => [...CODE128_PATTERNS[v]].map(Number));

describe('code128Checksum', () => {
  it('matches the Wikipedia "Code 128" worked example: Start A + PJJ123C → sum 878, check value 54', () => {
    // Wikipedia "Code 128", section "Check digit calculation" (read from a fetched copy of the article text)
    expect(103 + ab('PJJ123C').reduce((s, v, i) => s + (i + 1) * v, 0)).toBe(878);
    expect(code128Checksum(CODE128_START.A, ab('PJJ123C'))).toBe(54);
  });

  it('matches the barcoderesource.com examples for sets A, B and C', () => {
    // barcoderesource.com "Calculation of Code128 Check Character": ABCDEF (A) → 42, abcdef (B) → 97, 345678 (C) → 73
    expect(code128Checksum(CODE128_START.A, ab('ABCDEF'))).toBe(42);
    expect(code128Checksum(CODE128_START.B, ab('abcdef'))).toBe(97);
    expect(code128Checksum(CODE128_START.C, [34, 56, 78])).toBe(73);
  });

  it('weights a code switch like any symbol (barcodeisland.com: Start A, H, I, Code C, 34, 56, 78 → 67)', () => {
    expect(code128Checksum(CODE128_START.A, [...ab('HI'), 99, 34, 56, 78])).toBe(67);
  });

  it('refuses values that are not data symbols', () => {
    expect(() => code128Checksum(102, [1])).toThrow(RangeError);
    expect(() => code128Checksum(104, [103])).toThrow(/position 1/);
  });
});

describe('CODE128_PATTERNS', () => {
  it('has the start and stop patterns barcodeisland.com prints as modules', () => {
    // barcodeisland.com Code 128: Start-A 11010000100, Start-B 11010010000, Start-C 11010011100, Stop 11000111010 + 11
    const toWidths = (bits: string) => (bits.match(/1+|0+/g) ?? []).map((r) => r.length).join('');
    expect(CODE128_PATTERNS[CODE128_START.A]).toBe(toWidths('11010000100'));
    expect(CODE128_PATTERNS[CODE128_START.B]).toBe(toWidths('11010010000'));
    expect(CODE128_PATTERNS[CODE128_START.C]).toBe(toWidths('11010011100'));
    expect(CODE128_PATTERNS[CODE128_STOP]).toBe(toWidths('1100011101011'));
  });

  it('has 107 distinct symbols of 11 modules (13 for the stop), 3 bars and 3 spaces each', () => {
    expect(CODE128_PATTERNS).toHaveLength(107);
    expect(new Set(CODE128_PATTERNS).size).toBe(107);
    CODE128_PATTERNS.forEach((p, v) => {
      const w = [...p].map(Number);
      expect(w.reduce((a, b) => a + b, 0)).toBe(v === CODE128_STOP ? 13 : 11);
      expect(w.every((x) => x >= 1 && x <= 4)).toBe(true);
    });
  });
});

describe('decodeCode128', () => {
  it('reads the Wikipedia example symbol back, check symbol included', () => {
    const data = ab('PJJ123C');
    const d = decodeCode128(widths([CODE128_START.A, ...data, 54, CODE128_STOP]));
    expect(d).toEqual({ text: 'PJJ123C', startSet: 'A', dataValues: data, checkValue: 54 });
  });

  it('follows switches into set C and back', () => {
    const values = [CODE128_START.B, ...ab('K5A-'), 99, 26, 48, 100, ...ab('-')];
    const d = decodeCode128(widths([...values, code128Checksum(CODE128_START.B, values.slice(1)), CODE128_STOP]));
    expect(d.text).toBe('K5A-2648-');
  });

  it('refuses a wrong check symbol, a missing stop and a broken pattern', () => {
    const data = ab('PJJ123C');
    expect(() => decodeCode128(widths([CODE128_START.A, ...data, 55, CODE128_STOP]))).toThrow(/check symbol is 55, but the data give 54/);
    expect(() => decodeCode128(widths([CODE128_START.A, ...data, 54, 0]).concat([1]))).toThrow(Code128DecodeError);
    const broken = widths([CODE128_START.A, ...data, 54, CODE128_STOP]);
    broken[7] = 4;
    expect(() => decodeCode128(broken)).toThrow(Code128DecodeError);
    expect(() => decodeCode128([1, 2, 3])).toThrow(/cannot be a Code 128 symbol/);
  });

  it('reads what bwip-js encodes for every demo serial form (an outside encoder as the round trip)', () => {
    for (const serial of ['K5A-2648-00017', 'K3E-2644-00220', 'KC2-2646-00001', 'PJJ123C', 'lower case ~ {}']) {
      const [symbol] = bwipjs.raw({ bcid: 'code128', text: serial });
      const d = decodeCode128((symbol as { sbs: number[] }).sbs);
      expect(d.text).toBe(serial);
    }
  });
});

describe('isCode128TagText', () => {
  it('accepts printable ASCII up to 40 characters only', () => {
    expect(isCode128TagText('K5A-2648-00017')).toBe(true);
    expect(isCode128TagText('')).toBe(false);
    expect(isCode128TagText('x'.repeat(41))).toBe(false);
    expect(isCode128TagText('K5A\n2648')).toBe(false);
    expect(isCode128TagText('K5Å-2648')).toBe(false);
  });
});
