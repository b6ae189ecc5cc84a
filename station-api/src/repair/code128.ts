/**
 * Code 128 (ISO/IEC 15417) symbol arithmetic. The repair tag's barcode itself is drawn by bwip-js; this
 * file holds what we need to check that a printed barcode says what it should: which texts the tag can
 * encode, the modulo-103 check symbol, and a reader that turns bar/space widths back into text.
 */

/**
 * Bar/space widths (in modules, bar first) of symbol values 0–106; 106 is the stop pattern with its
 * final 2-module bar. The patterns are those of ISO/IEC 15417, transcribed from BWIPP's `code128.encs`
 * table (bwip-js 4.11, barcode.ps). Start A/B/C and stop are cross-checked in the spec against
 * barcodeisland.com's Code 128 page.
 */
export const CODE128_PATTERNS: readonly string[] = Object.freeze([
  '212222', '222122', '222221', '121223', '121322', '131222', '122213', '122312', '132212', '221213',
  '221312', '231212', '112232', '122132', '122231', '113222', '123122', '123221', '223211', '221132',
  '221231', '213212', '223112', '312131', '311222', '321122', '321221', '312212', '322112', '322211',
  '212123', '212321', '232121', '111323', '131123', '131321', '112313', '132113', '132311', '211313',
  '231113', '231311', '112133', '112331', '132131', '113123', '113321', '133121', '313121', '211331',
  '231131', '213113', '213311', '213131', '311123', '311321', '331121', '312113', '312311', '332111',
  '314111', '221411', '431111', '111224', '111422', '121124', '121421', '141122', '141221', '112214',
  '112412', '122114', '122411', '142112', '142211', '241211', '221114', '413111', '241112', '134111',
  '111242', '121142', '121241', '114212', '124112', '124211', '411212', '421112', '421211', '212141',
  '214121', '412121', '111143', '111341', '131141', '114113', '114311', '411113', '411311', '113141',
  '114131', '311141', '411131', '211412', '211214', '211232', '2331112',
]);

export const CODE128_START = Object.freeze({ A: 103, B: 104, C: 105 });
export const CODE128_STOP = 106;
export type Code128Set = keyof typeof CODE128_START;

/** Longest text the repair tag puts in a barcode; longer ones would not fit a 100 mm label readably. */
export const CODE128_MAX_TAG_LENGTH = 40;

/**
 * Whether the repair tag can barcode this text: printable ASCII only (space to `~`), which code sets B
 * and C cover without function characters, 1 to {@link CODE128_MAX_TAG_LENGTH} characters.
 */
export function isCode128TagText(text: string): boolean {
  return text.length >= 1 && text.length <= CODE128_MAX_TAG_LENGTH && /^[\x20-\x7e]+$/.test(text);
}

/**
 * The check symbol value: (start value + Σ position × value) mod 103, positions counted from 1 at the
 * first symbol after the start; code-switch and shift symbols are weighted like any other symbol.
 * (Wikipedia "Code 128", check digit calculation; barcoderesource.com and barcodeisland.com worked examples.)
 * @param startValue 103, 104 or 105
 * @param dataValues every symbol value between the start and the check symbol
 */
export function code128Checksum(startValue: number, dataValues: readonly number[]): number {
  if (startValue !== 103 && startValue !== 104 && startValue !== 105) throw new RangeError(`start value must be 103, 104 or 105, got ${startValue}`);
  let sum = startValue;
  dataValues.forEach((v, i) => {
    if (!Number.isInteger(v) || v < 0 || v > 102) throw new RangeError(`symbol value ${v} at position ${i + 1} is not a data value 0–102`);
    sum += (i + 1) * v;
  });
  return sum % 103;
}

/** What a Code 128 symbol decodes to. */
export interface DecodedCode128 {
  text: string;
  startSet: Code128Set;
  /** Symbol values between start and check symbol (including code switches) */
  dataValues: number[];
  checkValue: number;
}

export class Code128DecodeError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'Code128DecodeError';
  }
}

const VALUE_OF_PATTERN = new Map(CODE128_PATTERNS.map((p, v) => [p, v]));

/**
 * Reads a Code 128 symbol from its bar/space widths in modules, bar first, quiet zones removed: start,
 * data, check symbol, stop. Verifies the check symbol. Function characters (FNC1–4) are refused, since
 * the repair tag never uses them.
 * Value meanings (ISO/IEC 15417 as summarised on Wikipedia "Code 128"; the switch codes partly from
 * memory, confirmed by barcodeisland's "HI345678" example, where 99 switches set A to set C):
 * set A 0–63 → ASCII 32–95, 64–95 → ASCII 0–31; set B 0–95 → ASCII 32–127; set C 0–99 → two digits;
 * 98 shift A↔B for one symbol; 99 → C (from A, B); 100 → B (from A, C); 101 → A (from B, C).
 * @throws Code128DecodeError when the widths are not a valid symbol or the check symbol is wrong
 */
export function decodeCode128(moduleWidths: readonly number[]): DecodedCode128 {
  if (moduleWidths.length < 6 + 6 + 7 || (moduleWidths.length - 7) % 6 !== 0) {
    throw new Code128DecodeError(`${moduleWidths.length} bars and spaces cannot be a Code 128 symbol (6 per symbol, 7 for the stop)`);
  }
  const values: number[] = [];
  const symbolCount = (moduleWidths.length - 7) / 6;
  for (let i = 0; i < symbolCount * 6; i += 6) {
    const pattern = moduleWidths.slice(i, i + 6).join('');
    const v = VALUE_OF_PATTERN.get(pattern);
    if (v === undefined || v === CODE128_STOP) throw new Code128DecodeError(`bars ${pattern} at element ${i} are not a Code 128 symbol`);
    values.push(v);
  }
  const stop = moduleWidths.slice(moduleWidths.length - 7).join('');
  if (stop !== CODE128_PATTERNS[CODE128_STOP]) throw new Code128DecodeError(`the symbol does not end with the stop pattern (got ${stop})`);

  const [start, ...rest] = values;
  const startSet = (Object.keys(CODE128_START) as Code128Set[]).find((k) => CODE128_START[k] === start);
  if (!startSet) throw new Code128DecodeError(`the symbol does not begin with a start code (got value ${start})`);
  if (rest.length < 1) throw new Code128DecodeError('the symbol has no check symbol');
  const checkValue = rest[rest.length - 1];
  const dataValues = rest.slice(0, -1);
  const expected = code128Checksum(start, dataValues);
  if (expected !== checkValue) throw new Code128DecodeError(`check symbol is ${checkValue}, but the data give ${expected}`);

  let set: Code128Set = startSet;
  let shifted = false;
  let text = '';
  for (const v of dataValues) {
    const current: Code128Set = shifted ? (set === 'A' ? 'B' : 'A') : set;
    shifted = false;
    if (current === 'C') {
      if (v < 100) text += String(v).padStart(2, '0');
      else if (v === 100) set = 'B';
      else if (v === 101) set = 'A';
      else throw new Code128DecodeError('FNC1 is not used on repair tags');
      continue;
    }
    if (v < 96) {
      text += String.fromCharCode(current === 'A' ? (v < 64 ? v + 32 : v - 64) : v + 32);
    } else if (v === 98) shifted = true;
    else if (v === 99) set = 'C';
    else if (current === 'A' && v === 100) set = 'B';
    else if (current === 'B' && v === 101) set = 'A';
    else throw new Code128DecodeError(`function character (value ${v}) is not used on repair tags`);
  }
  return { text, startSet, dataValues, checkValue };
}
