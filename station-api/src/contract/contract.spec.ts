import { describe, expect, it } from 'vitest';
import { isRefusalCode, REFUSAL_CODES } from './refusal-codes';
import { DECISIONS, decisionWords, END_REASONS, endReasonWords, RUN_VERDICT_WORDS, STOPPED_WORD } from './run-outcome';


describe('shared contract lists', () => {
  it('lists each refusal code once and recognises only those', () => {
    expect(new Set(REFUSAL_CODES).size).toBe(REFUSAL_CODES.length);
    expect(isRefusalCode('not_a_serial')).toBe(true);
    expect(isRefusalCode('unit_not_testable')).toBe(true);
    expect(isRefusalCode('hello world')).toBe(false);
    expect(isRefusalCode(undefined)).toBe(false);
  });

  it('words the four decision statements of ILAC-G8:09/2019 §4.2.3 (non-binary statement)', () => {
    // ILAC-G8:09/2019 §4.2.3: pass, conditional pass, conditional fail, fail
    expect(DECISIONS).toEqual(['pass', 'conditional_pass', 'conditional_fail', 'fail']);
    expect(decisionWords('conditional_pass')).toBe('pass, within uncertainty');
    expect(decisionWords('conditional_fail')).toBe('fail, within uncertainty');
    expect(decisionWords(null)).toBeNull();
    expect(decisionWords('maybe')).toBeNull();
  });

  it('words every end reason, and a stopped run is "Stopped" everywhere (issue 12)', () => {
    for (const r of END_REASONS) expect(endReasonWords(r)).toMatch(/\w/);
    expect(endReasonWords(null)).toBeNull();
    expect(STOPPED_WORD).toBe('Stopped');
    expect(RUN_VERDICT_WORDS.aborted).toBe('Stopped');
    expect(endReasonWords('operator_stop')).toBe('stopped by the operator');
  });
});
