import { describe, expect, it } from 'vitest';
import { columnDigits, indexText, numberOrUndefined, ppmText, problemText, pValueText } from './characterization-format';

describe('characterization formatting', () => {
  it('writes p-values, indices and ppm as people read them', () => {
    expect(pValueText(0.0004)).toBe('< 0.001');
    expect(pValueText(0.4321)).toBe('0.432');
    expect(indexText(1.3333)).toBe('1.33');
    expect(indexText(null)).toBe('—');
    expect(ppmText(0.01)).toBe('< 0.1');
    expect(ppmText(3.17)).toBe('3.2');
    expect(ppmText(22781.8)).toBe('22,782');
  });

  it('names line and column of a file problem', () => {
    expect(problemText({ line: 4, column: 'vout_V', message: '"x" is not a number' })).toBe('Line 4, column vout_V: "x" is not a number');
    expect(problemText({ line: 0, column: null, message: 'the file is empty' })).toBe('The file is empty');
  });

  it('takes digits from the shared value formatter: volts with three, more for finer limits', () => {
    expect(columnDigits({ key: 'vout_V', name: 'vout', unit: 'V', count: 1 }, [])).toBe(3);
    expect(columnDigits({ key: 'vout_V', name: 'vout', unit: 'V', count: 1 }, [4.9625])).toBe(4);
  });

  it('reads typed numbers and leaves empty fields undefined', () => {
    expect(numberOrUndefined('')).toBeUndefined();
    expect(numberOrUndefined('5.01')).toBe(5.01);
    expect(numberOrUndefined(4.9)).toBe(4.9);
    expect(numberOrUndefined('-')).toBeUndefined();
  });
});
